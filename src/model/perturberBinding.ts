import { InputError } from '../errors.js';
import type { ComponentConfig } from '../config/arcsiftConfig.js';
import type { LensingContext } from '../cosmology/index.js';
import type { MassProfilePair } from '../lens/massProfile.js';
import type { PerturberBinding, PerturberDerived } from './perturberContract.js';
import {
  duffy2008Concentration, perturberProfiles, pointMassEinsteinRadiusArcsec, pseudoJaffeStrengthArcsec,
  subhaloFromMass, nfwFromMass, writeNfwLensingParameters,
} from '../perturber/index.js';
import type { ParameterCollector } from './componentBinding.js';
import { bindTidalPerturber, type HostLens } from './tidalPerturberBinding.js';

export type { PerturberBinding, PerturberDerived } from './perturberContract.js';

const massNames = ['log10MassSolar', 'centerXArcsec', 'centerYArcsec'];

/**
 * Binds a perturber: its sampled mass is log10 of M200 in solar masses for NFW and truncated
 * NFW (concentration from Duffy et al. 2008 unless the config gives `concentration`), and log10
 * of the total mass for the point mass and the pseudo-Jaffe. A `tidallyTruncatedNfw` takes its
 * truncation radius from the host (tidalPerturberBinding.ts); the truncated NFW's fixed
 * `truncationRatio` defaults to 10. The mass-to-lensing conversion is
 * subhaloLensing.ts's allocation-free writeNfwLensingParameters.
 */
export function bindPerturber(
  component: ComponentConfig, collector: ParameterCollector, lensing: LensingContext, offset: number, file: string,
  host?: HostLens,
): PerturberBinding {
  const kind = component.kind;
  if (kind === 'tidallyTruncatedNfw' && host !== undefined) return bindTidalPerturber(component, collector, lensing, offset, file, host);
  const pair = (perturberProfiles as Record<string, MassProfilePair>)[kind];
  if (pair === undefined) {
    throw new InputError(
      `unknown perturber kind ${JSON.stringify(kind)} (known: ${[...Object.keys(perturberProfiles), 'tidallyTruncatedNfw'].join(', ')})`,
      { file, key: `${component.key}.kind` },
    );
  }
  const hasConcentration = component.entries.concentration !== undefined;
  const names = kind === 'truncatedNfw'
    ? [...massNames, 'truncationRatio', ...(hasConcentration ? ['concentration'] : [])]
    : kind === 'nfw'
      ? [...massNames, ...(hasConcentration ? ['concentration'] : [])]
      : kind === 'pseudoJaffe'
        ? [...massNames, 'coreRadiusArcsec', 'truncationRadiusArcsec']
        : massNames;
  const indices = collector.bind(component, names, { truncationRatio: 10 });
  const [massIndex, centerXIndex, centerYIndex] = indices;
  const base = { kind, key: component.key, profile: pair.reference, fast: pair.fast, massIndex, centerXIndex, centerYIndex, positionPrior: component.positionPrior };
  const z = lensing.lensRedshift;
  const littleH = lensing.littleH;
  const concentrationIndex = hasConcentration ? indices[names.indexOf('concentration')] : -1;

  if (kind === 'truncatedNfw' || kind === 'nfw') {
    const tauIndex = kind === 'truncatedNfw' ? indices[3] : -1;
    const write = (model: Float64Array, p: Float64Array): void => {
      const mass = Math.pow(10, model[massIndex]);
      const c = concentrationIndex >= 0 ? model[concentrationIndex] : duffy2008Concentration(mass, z, littleH);
      writeNfwLensingParameters(mass, c, lensing, p, offset);
      if (tauIndex >= 0) {
        p[offset + 2] = model[tauIndex];
        p[offset + 3] = model[centerXIndex];
        p[offset + 4] = model[centerYIndex];
      } else {
        p[offset + 2] = model[centerXIndex];
        p[offset + 3] = model[centerYIndex];
      }
    };
    const derived = (model: Float64Array): PerturberDerived => {
      const input = {
        massM200Solar: Math.pow(10, model[massIndex]),
        concentration: concentrationIndex >= 0 ? model[concentrationIndex] : undefined,
      };
      if (tauIndex < 0) {
        const h = nfwFromMass(input, lensing);
        return { kind, massM200Solar: input.massM200Solar, totalMassSolar: Number.POSITIVE_INFINITY, ...pick(h) };
      }
      const h = subhaloFromMass({ ...input, truncationRatio: model[tauIndex] }, lensing);
      return {
        kind, massM200Solar: input.massM200Solar, totalMassSolar: h.totalMassSolar, ...pick(h),
        truncationRatio: model[tauIndex], truncationRadiusKpc: h.truncationRadiusKpc, truncationRadiusArcsec: h.truncationRadiusArcsec,
      };
    };
    return { ...base, write, derived };
  }
  if (kind === 'pointMass') {
    const write = (model: Float64Array, p: Float64Array): void => {
      p[offset] = pointMassEinsteinRadiusArcsec(Math.pow(10, model[massIndex]), lensing);
      p[offset + 1] = model[centerXIndex];
      p[offset + 2] = model[centerYIndex];
    };
    const derived = (model: Float64Array): PerturberDerived => {
      const totalMassSolar = Math.pow(10, model[massIndex]);
      return { kind, totalMassSolar, einsteinRadiusArcsec: pointMassEinsteinRadiusArcsec(totalMassSolar, lensing) };
    };
    return { ...base, write, derived };
  }
  const [, , , coreIndex, truncationIndex] = indices;
  const write = (model: Float64Array, p: Float64Array): void => {
    p[offset] = pseudoJaffeStrengthArcsec(Math.pow(10, model[massIndex]), model[coreIndex], model[truncationIndex], lensing);
    p[offset + 1] = model[coreIndex];
    p[offset + 2] = model[truncationIndex];
    p[offset + 3] = model[centerXIndex];
    p[offset + 4] = model[centerYIndex];
  };
  const derived = (model: Float64Array): PerturberDerived => ({
    kind, totalMassSolar: Math.pow(10, model[massIndex]),
    einsteinRadiusArcsec: pseudoJaffeStrengthArcsec(Math.pow(10, model[massIndex]), model[coreIndex], model[truncationIndex], lensing),
  });
  return { ...base, write, derived };
}

function pick(h: ReturnType<typeof nfwFromMass>): Partial<PerturberDerived> {
  return {
    concentration: h.concentration, r200Kpc: h.r200Kpc, scaleRadiusKpc: h.scaleRadiusKpc,
    scaleRadiusArcsec: h.scaleRadiusArcsec, convergenceScale: h.convergenceScale,
  };
}
