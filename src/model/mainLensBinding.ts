import type { ComponentConfig } from '../config/arcsiftConfig.js';
import type { LensingContext } from '../cosmology/index.js';
import { mainLensProfiles, type MassProfilePair, sersicMassShapeTotal } from '../lens/index.js';
import {
  duffy2008Concentration, writeGeneralisedNfwLensingParameters, writeNfwLensingParameters,
} from '../perturber/index.js';
import type { ParameterCollector } from './componentBinding.js';
import { checkParameterRange, type ParameterRange } from './parameterRange.js';

/** Config kinds of main-lens components given in physical units (solar masses, concentration). */
export const physicalMainLensKinds = ['stellarSersic', 'nfwHalo', 'generalisedNfwHalo'] as const;
export type PhysicalMainLensKind = (typeof physicalMainLensKinds)[number];

/** A physical main-lens component bound to model indices. */
export interface MainLensBinding {
  readonly pair: MassProfilePair;
  /** Model index of a config parameter by name, -1 when the component has none (for links such as multipoles'). */
  readonly indexOf: (name: string) => number;
  /** Fills the component's lensing parameters in the profile vector (allocates nothing). */
  readonly write: (model: Float64Array, profile: Float64Array) => void;
}

const geometry = ['axisRatio', 'positionAngleDeg', 'centerXArcsec', 'centerYArcsec'];
const configNames: Readonly<Record<PhysicalMainLensKind, readonly string[]>> = {
  stellarSersic: ['log10StellarMassSolar', 'effectiveRadiusArcsec', 'sersicIndex', ...geometry, 'massToLightGradient'],
  nfwHalo: ['log10M200Solar', 'concentration', ...geometry],
  generalisedNfwHalo: ['log10M200Solar', 'concentration', ...geometry, 'innerSlope'],
};

/** Ranges the profiles are built and tested for (see their files). */
const ranges: Readonly<Record<string, ParameterRange>> = {
  axisRatio: { lower: 0, upper: 1, lowerOpen: true, meaning: 'an axis ratio, 0 < q <= 1' },
  effectiveRadiusArcsec: { lower: 0, upper: Infinity, lowerOpen: true, meaning: 'a radius > 0' },
  sersicIndex: { lower: 0.5, upper: 10, meaning: 'a Sersic index from 0.5 to 10' },
  massToLightGradient: { lower: -0.9, upper: 0.9, meaning: 'a mass-to-light gradient from -0.9 to 0.9' },
  concentration: { lower: 0, upper: Infinity, lowerOpen: true, meaning: 'a concentration > 0' },
  innerSlope: { lower: 0, upper: 2, upperOpen: true, meaning: 'an inner slope, 0 <= gamma < 2' },
};

/**
 * Binds a main-lens component given in physical units and writes its lensing parameters:
 * - stellarSersic: log10StellarMassSolar, the total of the Sersic
 *   stellar mass, gives kappa_e = M* / (Sigma_crit R_e^2 T(n, eta)) (sersicMassShape.ts);
 *   massToLightGradient defaults to 0 (mass follows light).
 * - nfwHalo and generalisedNfwHalo (with innerSlope):
 *   log10M200Solar and concentration c = r200 / r_s (Duffy et al. 2008 at the lens redshift when
 *   the config gives none) give kappa_s and theta_s (perturber/subhaloLensing.ts).
 */
export function bindPhysicalMainLens(
  component: ComponentConfig, collector: ParameterCollector, lensing: LensingContext, offset: number, file: string,
): MainLensBinding {
  const kind = component.kind as PhysicalMainLensKind;
  const pair = mainLensProfiles[kind];
  for (const [name, range] of Object.entries(ranges)) checkParameterRange(component, name, range, file);
  const hasConcentration = component.entries.concentration !== undefined;
  const names = configNames[kind].filter((name) => name !== 'concentration' || hasConcentration);
  const indices = collector.bind(component, names, { massToLightGradient: 0 });
  const indexOf = (name: string): number => {
    const k = names.indexOf(name);
    return k < 0 ? -1 : indices[k];
  };
  // The geometry sits at the same places in the config and profile lists of each kind, after the first two or three.
  const geometryFrom = kind === 'stellarSersic' ? 3 : 2;
  const geometryIndices = Int32Array.from(geometry, indexOf);
  const copyGeometry = (model: Float64Array, p: Float64Array): void => {
    for (let k = 0; k < 4; k++) p[offset + geometryFrom + k] = model[geometryIndices[k]];
  };
  if (kind === 'stellarSersic') {
    const [mass, radius, index, , , , , gradient] = indices;
    const sigmaCrit = lensing.criticalSurfaceDensitySolarPerArcsec2;
    const write = (model: Float64Array, p: Float64Array): void => {
      const re = model[radius], n = model[index], eta = model[gradient];
      p[offset] = Math.pow(10, model[mass]) / (sigmaCrit * re * re * sersicMassShapeTotal(n, eta));
      p[offset + 1] = re;
      p[offset + 2] = n;
      copyGeometry(model, p);
      p[offset + 7] = eta;
    };
    return { pair, indexOf, write };
  }
  const massIndex = indexOf('log10M200Solar'), concentrationIndex = indexOf('concentration'), slopeIndex = indexOf('innerSlope');
  const write = (model: Float64Array, p: Float64Array): void => {
    const m200 = Math.pow(10, model[massIndex]);
    const c = concentrationIndex >= 0 ? model[concentrationIndex] : duffy2008Concentration(m200, lensing.lensRedshift, lensing.littleH);
    if (slopeIndex >= 0) {
      writeGeneralisedNfwLensingParameters(m200, c, model[slopeIndex], lensing, p, offset);
      p[offset + 6] = model[slopeIndex];
    } else {
      writeNfwLensingParameters(m200, c, lensing, p, offset);
    }
    copyGeometry(model, p);
  };
  return { pair, indexOf, write };
}
