// The named cosmologies (src/cosmology/cosmologySets.ts) against astropy's copies of the same
// published tables, and the distances they give against astropy's
// (test/fixtures/cosmology/make_sets.py, Debian's python3-astropy).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseConfig } from '../../src/config/arcsiftConfig.js';
import { COSMOLOGY_SETS, configuredCosmology } from '../../src/cosmology/index.js';
import { buildLensingContext } from '../../src/model/buildLensingContext.js';
import { inputErrorOf } from '../support/inputErrorOf.js';
import { relativeDifference } from './distanceFixture.js';

interface Distances {
  lensRedshift: number; sourceRedshift: number; angularDiameterDistanceLensMpc: number; angularDiameterDistanceSourceMpc: number;
  angularDiameterDistanceBetweenMpc: number; criticalDensityLensSolarPerMpc3: number;
}
interface SetFixture {
  key: 'planck2018' | 'wmap9'; reference: string; hubbleConstantKmPerSecPerMpc: number; matterDensityWithMassiveNeutrinos: number;
  matterDensityQuoted: number; sameModel: Distances[]; fullModel: Distances[];
}
const fixture = JSON.parse(readFileSync(new URL('../fixtures/cosmology/sets.json', import.meta.url), 'utf8')) as { sets: SetFixture[] };

/** The table and column each set must come from, as astropy's meta names them. */
const TABLES: Record<SetFixture['key'], string[]> = {
  planck2018: ['A&A, 641, A6', 'Table 2 (TT, TE, EE + lowE + lensing + BAO)'],
  wmap9: ['Hinshaw et al. 2013, ApJS, 208, 19', 'Table 4 (WMAP9 + eCMB + BAO + H0, last column)'],
};

function expectDistances(key: string, rows: readonly Distances[], tolerance: number): void {
  for (const row of rows) {
    const cosmology = configuredCosmology({ cosmology: { set: key }, file: 'x.yaml' }).model;
    const zd = row.lensRedshift;
    const zs = row.sourceRedshift;
    const label = `${key} z = ${zd} -> ${zs}`;
    expect(relativeDifference(cosmology.angularDiameterDistanceMpc(zd), row.angularDiameterDistanceLensMpc), label).toBeLessThan(tolerance);
    expect(relativeDifference(cosmology.angularDiameterDistanceMpc(zs), row.angularDiameterDistanceSourceMpc), label).toBeLessThan(tolerance);
    expect(relativeDifference(cosmology.angularDiameterDistanceBetweenMpc(zd, zs), row.angularDiameterDistanceBetweenMpc), label).toBeLessThan(tolerance);
    expect(relativeDifference(cosmology.criticalDensitySolarPerMpc3(zd), row.criticalDensityLensSolarPerMpc3), label).toBeLessThan(tolerance);
  }
}

describe('named cosmologies against astropy', () => {
  for (const entry of fixture.sets) {
    const set = COSMOLOGY_SETS[entry.key];
    it(`${entry.key}: the table astropy names, its H0, and Omega_m to the four decimals quoted`, () => {
      for (const part of TABLES[entry.key]) expect(entry.reference).toContain(part);
      expect(set.hubbleConstantKmPerSecPerMpc).toBe(entry.hubbleConstantKmPerSecPerMpc);
      // Both papers quote Omega_m to four decimals: half a unit of the fourth is the tolerance.
      expect(Math.abs(set.matterDensity - entry.matterDensityWithMassiveNeutrinos)).toBeLessThanOrEqual(5e-5);
      expect(set.matterDensity).toBe(entry.matterDensityQuoted);
    });

    it(`${entry.key}: distances and rho_crit of astropy's flat LambdaCDM without radiation within 1e-6`, () => {
      // The same model on both sides: what is left is quadrature error (ours 1e-10, astropy's
      // <~1e-8), as in flatLambdaCdm.test.ts.
      expectDistances(entry.key, entry.sameModel, 1e-6);
    });

    it(`${entry.key}: distances and rho_crit of astropy's full realisation within 5e-4`, () => {
      // arcsift neglects radiation (photons and massless neutrinos, Omega_r ~ 9e-5 today), which
      // raises E(z) by about Omega_r (1 + z)^4 / (2 E(z)^2): 4e-4 in rho_crit and less in the
      // distances up to z = 6; make_sets.py measured at most 3.4e-4 (Planck) and 4.4e-4 (WMAP9).
      expectDistances(entry.key, entry.fullModel, 5e-4);
    });
  }
});

describe('choosing the cosmology in a config', () => {
  const base = (cosmology?: unknown): unknown => ({
    ...(cosmology === undefined ? {} : { cosmology }),
    observation: { columns: 10, rows: 10, pixelScaleArcsec: 0.1, psf: { shape: 'gaussian', fwhmArcsec: 0.2, sizePixels: 5 } },
    redshifts: { lens: 0.5, source: 2 },
    lens: { mass: [{ kind: 'isothermalEllipsoid', einsteinRadiusArcsec: 1, axisRatio: 0.8, positionAngleDeg: 0, centerXArcsec: 0, centerYArcsec: 0 }] },
    source: { light: [{ kind: 'ellipticalGaussian', amplitude: 1, sigmaArcsec: 0.1, axisRatio: 1, positionAngleDeg: 0, centerXArcsec: 0, centerYArcsec: 0 }] },
  });

  it('takes a set by name, explicit values, or Planck 2018 by default, and records which', () => {
    const wmap = configuredCosmology(parseConfig(base('wmap9'), 'lens.yaml'));
    expect(wmap.record).toEqual({
      set: 'wmap9', name: 'WMAP nine-year WMAP+eCMB+BAO+H0', reference: 'Hinshaw et al. 2013, ApJS 208, 19, Table 4, last column',
      hubbleConstantKmPerSecPerMpc: 69.32, matterDensity: 0.2865, darkEnergyDensity: 1 - 0.2865,
    });
    expect(configuredCosmology(parseConfig(base(), 'lens.yaml')).record.set).toBe('planck2018');
    const explicit = configuredCosmology(parseConfig(base({ hubbleConstant: 70, matterDensity: 0.3 }), 'lens.yaml')).record;
    expect(explicit).toMatchObject({ set: null, reference: null, hubbleConstantKmPerSecPerMpc: 70, matterDensity: 0.3 });
    // The lens model uses it: D_d of the lensing context is the set's.
    const context = buildLensingContext(parseConfig(base('wmap9'), 'lens.yaml'));
    expect(context.lensDistanceMpc).toBe(wmap.model.angularDiameterDistanceMpc(0.5));
  });

  it('refuses an unknown name, naming the key and the sets it knows', () => {
    const config = parseConfig(base('planck2015'), 'lens.yaml');
    expect(inputErrorOf(() => buildLensingContext(config)).message).toBe(
      'lens.yaml, key cosmology: no such cosmology: expected one of planck2018, wmap9, or { hubbleConstant, matterDensity }, found "planck2015"',
    );
    expect(inputErrorOf(() => parseConfig(base(3), 'lens.yaml')).message).toMatch(/key cosmology: expected the name of a parameter set/);
  });
});
