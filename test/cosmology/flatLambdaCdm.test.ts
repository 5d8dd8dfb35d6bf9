import { describe, expect, it } from 'vitest';
import { flatLambdaCdm } from '../../src/cosmology/flatLambdaCdm.js';
import { speedOfLightMetresPerSecond } from '../../src/cosmology/physicalConstants.js';
import { InputError } from '../../src/errors.js';
import { distanceCases, relativeDifference } from './distanceFixture.js';

describe('flatLambdaCdm: Einstein-de Sitter closed forms', () => {
  // Omega_m = 1: D_C = 2 (c/H0) (1 - 1/sqrt(1+z)) (e.g. Hogg 1999, sec. 5; Weinberg 1972).
  // The quadrature is asked for 1e-10 relative, so 1e-9 leaves a factor 10 for rounding.
  const hubble = 70;
  const eds = flatLambdaCdm({ hubbleConstantKmPerSecPerMpc: hubble, matterDensity: 1 });
  const hubbleDistance = speedOfLightMetresPerSecond / 1000 / hubble;
  for (const z of [0.01, 0.3, 1, 2.5, 8, 30]) {
    it(`comoving and angular-diameter distances at z = ${z}`, () => {
      const exact = 2 * hubbleDistance * (1 - 1 / Math.sqrt(1 + z));
      expect(relativeDifference(eds.comovingDistanceMpc(z), exact)).toBeLessThan(1e-9);
      expect(relativeDifference(eds.angularDiameterDistanceMpc(z), exact / (1 + z))).toBeLessThan(1e-9);
    });
  }
  it('distance between two redshifts and rho_crit(z) = rho_crit,0 (1+z)^3', () => {
    const z1 = 0.5;
    const z2 = 3;
    const exact = (2 * hubbleDistance * (1 / Math.sqrt(1 + z1) - 1 / Math.sqrt(1 + z2))) / (1 + z2);
    expect(relativeDifference(eds.angularDiameterDistanceBetweenMpc(z1, z2), exact)).toBeLessThan(1e-9);
    // E(z)^2 = (1+z)^3 exactly for Omega_m = 1; only rounding separates the two.
    expect(relativeDifference(eds.criticalDensitySolarPerMpc3(2), 27 * eds.criticalDensitySolarPerMpc3(0)))
      .toBeLessThan(1e-14);
  });
  it('critical density today is 2.77536627e11 h^2 M_sun/Mpc^3', () => {
    // Particle Data Group, Astrophysical constants table, given to 9 digits (the table was not
    // reachable here; astropy's 3 H0^2 / (8 pi G) in M_sun/Mpc^3 at h = 1 gives 2.775366272e11).
    // 1e-8 covers the last digit and the G that PDG divides by (we use GM_sun directly).
    const cosmology = flatLambdaCdm({ hubbleConstantKmPerSecPerMpc: 100, matterDensity: 0.3 });
    expect(relativeDifference(cosmology.criticalDensitySolarPerMpc3(0), 2.77536627e11)).toBeLessThan(1e-8);
  });
});

describe('flatLambdaCdm against astropy (test/fixtures/cosmology/distances.json)', () => {
  // Tolerance 1e-6 relative: both sides use the same exact c and the same nominal GM_sun, so what
  // is left is quadrature error (ours 1e-10, astropy's elliptic-integral or quad route <~1e-8);
  // 1e-6 sits well above both yet far below any astronomically meaningful difference.
  const tolerance = 1e-6;
  for (const entry of distanceCases) {
    const label = `H0 = ${entry.hubbleConstantKmPerSecPerMpc}, Om = ${entry.matterDensity}, ` +
      `z = ${entry.lensRedshift} -> ${entry.sourceRedshift}`;
    it(label, () => {
      const cosmology = flatLambdaCdm(entry);
      const zd = entry.lensRedshift;
      const zs = entry.sourceRedshift;
      expect(relativeDifference(cosmology.comovingDistanceMpc(zd), entry.comovingDistanceLensMpc)).toBeLessThan(tolerance);
      expect(relativeDifference(cosmology.comovingDistanceMpc(zs), entry.comovingDistanceSourceMpc)).toBeLessThan(tolerance);
      expect(relativeDifference(cosmology.angularDiameterDistanceMpc(zd), entry.angularDiameterDistanceLensMpc))
        .toBeLessThan(tolerance);
      expect(relativeDifference(cosmology.angularDiameterDistanceMpc(zs), entry.angularDiameterDistanceSourceMpc))
        .toBeLessThan(tolerance);
      expect(relativeDifference(cosmology.angularDiameterDistanceBetweenMpc(zd, zs), entry.angularDiameterDistanceBetweenMpc))
        .toBeLessThan(tolerance);
      expect(relativeDifference(cosmology.criticalDensitySolarPerMpc3(zd), entry.criticalDensityLensSolarPerMpc3))
        .toBeLessThan(tolerance);
      expect(relativeDifference(cosmology.kpcPerArcsec(zd), entry.kpcPerArcsecLens)).toBeLessThan(tolerance);
    });
  }
});

describe('flatLambdaCdm input checks', () => {
  it('rejects a non-positive Hubble constant and Omega_m outside [0, 1], naming the key', () => {
    expect(() => flatLambdaCdm({ hubbleConstantKmPerSecPerMpc: 0, matterDensity: 0.3 }))
      .toThrow(/hubbleConstantKmPerSecPerMpc.*found 0/);
    expect(() => flatLambdaCdm({ hubbleConstantKmPerSecPerMpc: 70, matterDensity: 1.2 }))
      .toThrow(InputError);
    const cosmology = flatLambdaCdm({ hubbleConstantKmPerSecPerMpc: 70, matterDensity: 0.3 });
    expect(() => cosmology.comovingDistanceMpc(-1)).toThrow(InputError);
    expect(() => cosmology.angularDiameterDistanceBetweenMpc(2, 1)).toThrow(InputError);
  });
});
