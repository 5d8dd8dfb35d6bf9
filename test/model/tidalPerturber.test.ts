import { describe, expect, it } from 'vitest';
import { parseConfig } from '../../src/config/arcsiftConfig.js';
import { buildLensSystem } from '../../src/model/lensSystem.js';
import { nfwFromMass, subhaloFromMass } from '../../src/perturber/index.js';
import { profileFixtures } from '../lens/profileFixtures.js';

/** A config with the given main lens and one tidally truncated subhalo of M200 = 1e9 at (x, y). */
function tidalConfig(mass: unknown[], x: number, y: number, extra: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    observation: {
      columns: 20, rows: 20, pixelScaleArcsec: 0.1, psf: { shape: 'gaussian', fwhmArcsec: 0.1, sizePixels: 5 },
      noise: { skySigma: 0.01, integrationSeconds: 1000 }, mask: { shape: 'all' },
    },
    redshifts: { lens: 0.5, source: 2 },
    lens: { mass },
    source: { light: [{ kind: 'sersic', amplitude: 1, effectiveRadiusArcsec: 0.2, sersicIndex: 1, axisRatio: 1, positionAngleDeg: 0, centerXArcsec: 0, centerYArcsec: 0 }] },
    perturbers: [{ kind: 'tidallyTruncatedNfw', log10MassSolar: { value: 9, prior: { uniform: [7, 11] } }, centerXArcsec: x, centerYArcsec: y, concentration: 15, ...extra }],
  };
}

const sie = { kind: 'isothermalEllipsoid', einsteinRadiusArcsec: 1.2, axisRatio: 0.7, positionAngleDeg: 20, centerXArcsec: 0.02, centerYArcsec: -0.01 };

describe('tidally truncated NFW perturber', () => {
  it('takes r_t = r (m / (2 M_SIS(<r)))^(1/3) at its projected distance from an isothermal host', () => {
    // By hand: r = |(0.7, 0.9) - (0.02, -0.01)|; the singular isothermal sphere holds
    // M(<r) = 2 thetaE r Sigma_crit (2/pi of the projected pi thetaE r; Binney & Tremaine 2008,
    // sec. 4.3.3(b)); theta_s from nfwFromMass (tested in test/perturber/subhaloLensing.test.ts).
    const system = buildLensSystem(parseConfig(tidalConfig([sie], 0.7, 0.9), 'tidal.yaml'));
    const model = system.configuredValues(), p = new Float64Array(system.profileVectorLength);
    system.writeProfileVector(model, p);
    const r = Math.hypot(0.68, 0.91), hostMass = 2 * 1.2 * r * system.lensing.criticalSurfaceDensitySolarPerArcsec2;
    const truncation = r * Math.cbrt(1e9 / (2 * hostMass));
    const halo = nfwFromMass({ massM200Solar: 1e9, concentration: 15 }, system.lensing);
    const term = system.massTerms[1];
    expect(term.profile.kind).toBe('truncatedNfw');
    expect(p[term.offset + 2]).toBeCloseTo(truncation / halo.scaleRadiusArcsec, 12);
    expect(Array.from(p.subarray(term.offset + 3, term.offset + 5))).toEqual([0.7, 0.9]);

    const derived = system.perturbers[0].derived(model);
    const truncated = subhaloFromMass({ massM200Solar: 1e9, concentration: 15, truncationRatio: truncation / halo.scaleRadiusArcsec }, system.lensing);
    expect(derived.massM200Solar).toBeCloseTo(1e9, 3);
    expect(derived.truncationRadiusArcsec).toBeCloseTo(truncation, 12);
    expect(Math.abs(derived.totalMassSolar / truncated.totalMassSolar - 1)).toBeLessThan(1e-12);
    expect(derived.totalMassSolar).toBeLessThan(1e9);
    expect(derived.hostDistanceArcsec).toBeCloseTo(r, 14);
    expect(Math.abs(derived.hostMassWithinSolar! / hostMass - 1)).toBeLessThan(1e-14);
  });

  it('sums the stars and the halo of a decomposed host', () => {
    // Subhalo 1.1" from the host centre, one effective radius of the stars: their mass within is
    // M* times the Abel deprojection at r = R_e over the total, both from scipy (fixtures/make_profiles.py);
    // the NFW halo's is 4 pi rho_s r_s^3 (ln(1 + x) - x / (1 + x)) (Navarro, Frenk & White 1996).
    const stars = { kind: 'stellarSersic', log10StellarMassSolar: 11.3, effectiveRadiusArcsec: 1.1, sersicIndex: 4, axisRatio: 0.8, positionAngleDeg: 30, centerXArcsec: 0.02, centerYArcsec: -0.01 };
    const halo = { kind: 'nfwHalo', log10M200Solar: 13, concentration: 6, axisRatio: 0.7, positionAngleDeg: 40, centerXArcsec: 0.02, centerYArcsec: -0.01 };
    const system = buildLensSystem(parseConfig(tidalConfig([stars, halo], 0.02, 1.09), 'tidal.yaml'));
    const derived = system.perturbers[0].derived(system.configuredValues());
    const total = profileFixtures.sersicTotal.find(([n, eta]) => n === 4 && eta === 0)![2];
    const within = profileFixtures.sersicSphericalMass.find(([n, eta, r]) => n === 4 && eta === 0 && r === 1)![3];
    const host = nfwFromMass({ massM200Solar: 1e13, concentration: 6 }, system.lensing);
    const x = 1.1 / host.scaleRadiusArcsec, rs = host.scaleRadiusKpc / 1000;
    const haloMass = 4 * Math.PI * host.densityScaleSolarPerMpc3 * rs ** 3 * (Math.log1p(x) - x / (1 + x));
    const expected = (10 ** 11.3 * within) / total + haloMass;
    expect(derived.hostDistanceArcsec).toBeCloseTo(1.1, 14);
    expect(Math.abs(derived.hostMassWithinSolar! / expected - 1)).toBeLessThan(1e-11);
    expect(derived.truncationRadiusArcsec).toBeCloseTo(1.1 * Math.cbrt(1e9 / (2 * expected)), 10);
  });

  it('the fixed-ratio truncated NFW reports its truncation radius too', () => {
    const config = tidalConfig([sie], 0.7, 0.9);
    (config.perturbers as Array<Record<string, unknown>>)[0] = { kind: 'truncatedNfw', log10MassSolar: 9, centerXArcsec: 0.7, centerYArcsec: 0.9, truncationRatio: 4, concentration: 15 };
    const system = buildLensSystem(parseConfig(config, 'fixed.yaml'));
    const derived = system.perturbers[0].derived(system.configuredValues());
    const halo = nfwFromMass({ massM200Solar: 1e9, concentration: 15 }, system.lensing);
    expect(derived.truncationRatio).toBe(4);
    expect(derived.truncationRadiusArcsec).toBeCloseTo(4 * halo.scaleRadiusArcsec, 14);
  });
});
