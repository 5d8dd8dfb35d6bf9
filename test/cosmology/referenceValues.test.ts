// Tests of the published values in src/cosmology/physicalConstants.ts and defaultCosmology.ts
// against astropy's copies of them (test/fixtures/cosmology/make_references.py).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { defaultCosmologyParameters } from '../../src/cosmology/defaultCosmology.js';
import {
  astronomicalUnitMetres, gravitationalConstantSi, parsecMetres, solarMassKilograms, solarMassParameterSi,
  speedOfLightMetresPerSecond,
} from '../../src/cosmology/physicalConstants.js';

interface ReferenceConstant { value: number; reference: string }
const fixture = JSON.parse(
  readFileSync(new URL('../fixtures/cosmology/references.json', import.meta.url), 'utf8'),
) as {
  planck18: { reference: string; hubbleConstantKmPerSecPerMpc: number; matterDensityWithMassiveNeutrinos: number };
  constants: Record<string, ReferenceConstant>;
};
const constants = fixture.constants;

describe('physical constants against astropy.constants', () => {
  it('exact and recommended values are the same numbers (CODATA 2018, IAU 2012 B2, IAU 2015 B3)', () => {
    // These are defined or recommended values quoted to all their digits: equality, not a tolerance.
    expect(constants.speedOfLightMetresPerSecond.reference).toBe('CODATA 2018');
    expect(speedOfLightMetresPerSecond).toBe(constants.speedOfLightMetresPerSecond.value);
    expect(constants.gravitationalConstantSi.reference).toBe('CODATA 2018');
    expect(gravitationalConstantSi).toBe(constants.gravitationalConstantSi.value);
    expect(constants.solarMassParameterSi.reference).toBe('IAU 2015 Resolution B 3');
    expect(solarMassParameterSi).toBe(constants.solarMassParameterSi.value);
    expect(constants.astronomicalUnitMetres.reference).toBe('IAU 2012 Resolution B2');
    expect(astronomicalUnitMetres).toBe(constants.astronomicalUnitMetres.value);
  });

  it('derived values (parsec, solar mass in kg) agree to rounding', () => {
    // Both sides compute them from the exact values above in double precision: a few ulps apart at most.
    expect(Math.abs(parsecMetres / constants.parsecMetres.value - 1)).toBeLessThan(1e-15);
    expect(Math.abs(solarMassKilograms / constants.solarMassKilograms.value - 1)).toBeLessThan(1e-15);
  });
});

describe('default cosmology against astropy.cosmology.Planck18', () => {
  it('is the Table 2 TT,TE,EE+lowE+lensing+BAO column that astropy names', () => {
    expect(fixture.planck18.reference).toContain('A&A, 641, A6');
    expect(fixture.planck18.reference).toContain('Table 2 (TT, TE, EE + lowE + lensing + BAO)');
  });

  it('has the same H0 and, to the four decimals Planck quotes, the same Omega_m', () => {
    expect(defaultCosmologyParameters.hubbleConstantKmPerSecPerMpc).toBe(fixture.planck18.hubbleConstantKmPerSecPerMpc);
    // astropy's baryons + CDM (0.30966) plus its massive neutrino (0.0014) give 0.311062; Planck
    // quotes Omega_m to four decimals, so half a unit of the fourth decimal is the tolerance.
    expect(Math.abs(defaultCosmologyParameters.matterDensity - fixture.planck18.matterDensityWithMassiveNeutrinos))
      .toBeLessThanOrEqual(5e-5);
  });
});
