import { describe, expect, it } from 'vitest';
import { parseConfig } from '../../src/config/arcsiftConfig.js';
import { InputError } from '../../src/errors.js';
import { buildLensSystem } from '../../src/model/lensSystem.js';
import { generalisedNfwEnclosedMassFactor, sersicMassShapeTotal } from '../../src/lens/index.js';
import { fastGeneralisedNfwHalo } from '../../src/lens/darkHalo/fastGeneralisedNfwHalo.js';
import { fastStellarSersic } from '../../src/lens/stellarMass/fastStellarSersic.js';
import { profileFixtures } from '../lens/profileFixtures.js';

/** A decomposed lens: Sersic stars, a generalised NFW halo, shear and an m = 4 multipole. */
function decomposedConfig(changes: (lens: Record<string, unknown>) => void = () => {}): Record<string, unknown> {
  const lens: Record<string, unknown> = {
    mass: [
      {
        kind: 'stellarSersic', log10StellarMassSolar: { value: 11.3, prior: { uniform: [10.5, 12] } },
        effectiveRadiusArcsec: 1.1, sersicIndex: 4, axisRatio: { value: 0.8, prior: { uniform: [0.5, 1] } },
        positionAngleDeg: 30, centerXArcsec: 0.02, centerYArcsec: -0.01,
      },
      {
        kind: 'generalisedNfwHalo', log10M200Solar: { value: 13, prior: { uniform: [12, 14] } }, concentration: 6,
        axisRatio: 0.7, positionAngleDeg: 40, centerXArcsec: 0, centerYArcsec: 0, innerSlope: { value: 1.2, prior: { uniform: [0.5, 1.9] } },
      },
    ],
    shear: { shearStrength: 0.03, shearAngleDeg: 10 },
    multipoles: [{ order: 4, multipoleStrength: 0.01, multipoleAngleDeg: 30, einsteinRadiusArcsec: 1.2 }],
  };
  changes(lens);
  return {
    observation: {
      columns: 20, rows: 20, pixelScaleArcsec: 0.1, psf: { shape: 'gaussian', fwhmArcsec: 0.1, sizePixels: 5 },
      noise: { skySigma: 0.01, integrationSeconds: 1000 }, mask: { shape: 'all' },
    },
    redshifts: { lens: 0.5, source: 2 },
    lens,
    source: { light: [{ kind: 'sersic', amplitude: 1, effectiveRadiusArcsec: 0.2, sersicIndex: 1, axisRatio: 1, positionAngleDeg: 0, centerXArcsec: 0, centerYArcsec: 0 }] },
  };
}

describe('a decomposed main lens in a config', () => {
  const system = buildLensSystem(parseConfig(decomposedConfig(), 'decomposed.yaml'));
  const model = system.configuredValues();
  const p = new Float64Array(system.profileVectorLength);
  system.writeProfileVector(model, p);
  const stars = system.massTerms[0], halo = system.massTerms[1];

  it('names its parameters with their units and runs the fast twins', () => {
    const byName = Object.fromEntries(system.parameters.map((q) => [q.name, q.unit]));
    expect(byName['lens.mass[0].log10StellarMassSolar']).toBe('log10(M/Msun)');
    expect(byName['lens.mass[1].log10M200Solar']).toBe('log10(M/Msun)');
    expect(byName['lens.mass[0].massToLightGradient']).toBe('');
    expect(stars.fast).toBe(fastStellarSersic);
    expect(halo.fast).toBe(fastGeneralisedNfwHalo);
  });

  it('turns the stellar mass into the convergence at R_e', () => {
    // M* = kappa_e Sigma_crit R_e^2 T(n, 0), T by scipy quad (fixtures/make_profiles.py, n = 4).
    const total = profileFixtures.sersicTotal.find(([n, eta]) => n === 4 && eta === 0)![2];
    const mass = p[stars.offset] * system.lensing.criticalSurfaceDensitySolarPerArcsec2 * 1.1 * 1.1 * total;
    expect(Math.abs(mass / 10 ** 11.3 - 1)).toBeLessThan(1e-12);
    expect(Math.abs(sersicMassShapeTotal(4, 0) / total - 1)).toBeLessThan(1e-12);
  });

  it('gives the halo the M200 it was asked for', () => {
    // M(< c r_s) = 4 pi kappa_s Sigma_crit theta_s^2 m_gamma(c) must be M200, and c r_s = r200 must
    // hold 200 times the critical density (Navarro, Frenk & White 1996 with Delta = 200).
    const kappaS = p[halo.offset], thetaS = p[halo.offset + 1];
    const sigmaCrit = system.lensing.criticalSurfaceDensitySolarPerArcsec2;
    const m200 = 4 * Math.PI * kappaS * sigmaCrit * thetaS * thetaS * generalisedNfwEnclosedMassFactor(6, 1.2);
    expect(Math.abs(m200 / 1e13 - 1)).toBeLessThan(1e-12);
    const r200Mpc = 6 * thetaS * system.lensing.mpcPerArcsec;
    const meanDensity = 1e13 / ((4 / 3) * Math.PI * r200Mpc ** 3);
    expect(Math.abs(meanDensity / (200 * system.lensing.criticalDensitySolarPerMpc3) - 1)).toBeLessThan(1e-12);
    expect(p[halo.offset + 6]).toBe(1.2);
  });

  it('puts the multipole on the first component with its own Einstein radius and slope 2', () => {
    const m = system.massTerms[3];
    expect(m.profile.kind).toBe('multipole4');
    expect(Array.from(p.subarray(m.offset, m.offset + 6))).toEqual([0.01, 30, 0.02, -0.01, 1.2, 2]);
  });

  it('refuses parameters outside the profiles\' ranges, naming the key', () => {
    const bad = (change: (lens: Record<string, unknown>) => void): (() => unknown) =>
      () => buildLensSystem(parseConfig(decomposedConfig(change), 'bad.yaml'));
    const stars = (lens: Record<string, unknown>): Record<string, unknown> => (lens.mass as Array<Record<string, unknown>>)[0];
    const halo = (lens: Record<string, unknown>): Record<string, unknown> => (lens.mass as Array<Record<string, unknown>>)[1];
    expect(bad((lens) => { stars(lens).axisRatio = { value: 0.8, prior: { uniform: [0.5, 1.2] } }; })).toThrow(InputError);
    expect(bad((lens) => { stars(lens).axisRatio = { value: 0.8, prior: { uniform: [0.5, 1.2] } }; })).toThrow('key lens.mass[0].axisRatio');
    expect(bad((lens) => { halo(lens).innerSlope = 2.1; })).toThrow('lens.mass[1].innerSlope');
    expect(bad((lens) => { stars(lens).sersicIndex = { value: 4, prior: { normal: [4, 1] } }; })).toThrow(/truncatedNormal/);
    expect(bad((lens) => { delete (lens.multipoles as Array<Record<string, unknown>>)[0].einsteinRadiusArcsec; })).toThrow(/einsteinRadiusArcsec/);
  });
});
