import { describe, expect, it } from 'vitest';
import { isothermalEllipsoid } from '../../src/lens/isothermalEllipsoid/isothermalEllipsoid.js';
import { fastIsothermalEllipsoid } from '../../src/lens/isothermalEllipsoid/fastIsothermalEllipsoid.js';
import { powerLawEllipsoid } from '../../src/lens/powerLawEllipsoid.js';
import { profileFixtures } from './profileFixtures.js';

// The closed forms against scipy's Abel deprojection of the same convergences (fixtures/make_profiles.py,
// nested quad asked 1e-10 and 1e-12; they agree with the closed forms to 2.6e-14): 1e-12 relative.
// The axis ratio and angle must not matter (the mass is read on the circularised radius).
describe('mass in a sphere of the isothermal and power-law ellipsoids', () => {
  it('cored isothermal: 2 thetaE (r - s atan(r / s))', () => {
    for (const [thetaE, core, r, mass] of profileFixtures.isothermalSphericalMass) {
      for (const profile of [isothermalEllipsoid, fastIsothermalEllipsoid]) {
        const found = profile.sphericalMassWithin!(Float64Array.of(thetaE, 0.6, 35, 0.1, -0.2, core), 0, r);
        expect(Math.abs(found / mass - 1)).toBeLessThan(1e-12);
      }
    }
  });
  it('power law: pi thetaE^(gamma-1) r^(3-gamma) 2 Gamma(gamma/2) / (sqrt(pi) Gamma((gamma-1)/2))', () => {
    for (const [thetaE, gamma, r, mass] of profileFixtures.powerLawSphericalMass) {
      const found = powerLawEllipsoid.sphericalMassWithin!(Float64Array.of(thetaE, gamma, 0.7, -20, 0.1, -0.2), 0, r);
      expect(Math.abs(found / mass - 1)).toBeLessThan(1e-12);
    }
  });
});
