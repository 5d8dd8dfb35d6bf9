import { InputError } from '../errors.js';
import type { ComponentConfig } from '../config/arcsiftConfig.js';
import type { LensingContext } from '../cosmology/index.js';
import {
  duffy2008Concentration, hostSphericalMassSolar, perturberProfiles, subhaloFromMass, tidalTruncationRadius,
  writeNfwLensingParameters, type HostComponent,
} from '../perturber/index.js';
import type { ParameterCollector } from './componentBinding.js';
import type { PerturberBinding, PerturberDerived } from './perturberContract.js';

/** The main lens as a tidal perturber sees it. */
export interface HostLens {
  /** The main-lens mass components (reference profiles) and their places in the profile vector. */
  readonly components: readonly HostComponent[];
  /** Profile-vector indices of the host centre (the first main-lens component's centre). */
  readonly centerXOffset: number;
  readonly centerYOffset: number;
  /** Fills the main lens's part of a profile vector (for derived quantities outside the likelihood). */
  readonly writeMainLens: (model: Float64Array, profile: Float64Array) => void;
  /** Length of the profile vector that holds the main lens. */
  readonly profileLength: number;
}

/** Truncation ratios are kept at or above this (a subhalo on the host centre would get r_t = 0). */
const SMALLEST_TRUNCATION_RATIO = 0.01;
/** Distances (arcsec) are kept at or above this, so the host mass inside is positive. */
const SMALLEST_DISTANCE_ARCSEC = 1e-6;

/**
 * Binds a `tidallyTruncatedNfw` perturber: the truncated NFW of Baltz, Marshall & Oguri 2009 whose
 * truncation radius is set by the host, r_t = r (m / (2 M_host(<r)))^(1/3)
 * (tidalTruncationRadius.ts), with m the subhalo's M200 (sampled as log10MassSolar; concentration
 * from the config or Duffy et al. 2008) and M_host(<r) the main lens's mass in a sphere of radius r
 * (hostSphericalMass.ts). The line-of-sight distance is unknown: r is the projected distance from
 * the host centre, the smallest distance the subhalo can have, so r_t is the strongest truncation
 * the position allows and the total mass a lower bound among positions along the line of sight.
 */
export function bindTidalPerturber(
  component: ComponentConfig, collector: ParameterCollector, lensing: LensingContext, offset: number, file: string,
  host: HostLens,
): PerturberBinding {
  const unusable = host.components.find(({ profile }) => profile.sphericalMassWithin === undefined);
  if (unusable !== undefined) {
    throw new InputError(
      `a tidallyTruncatedNfw needs a main lens whose mass in a sphere is known; ${unusable.profile.kind} has none`,
      { file, key: `${component.key}.kind` },
    );
  }
  const hasConcentration = component.entries.concentration !== undefined;
  const names = ['log10MassSolar', 'centerXArcsec', 'centerYArcsec', ...(hasConcentration ? ['concentration'] : [])];
  const [massIndex, centerXIndex, centerYIndex, concentrationIndex = -1] = collector.bind(component, names);
  const pair = perturberProfiles.truncatedNfw;
  const concentrationOf = (model: Float64Array, mass: number): number =>
    concentrationIndex >= 0 ? model[concentrationIndex] : duffy2008Concentration(mass, lensing.lensRedshift, lensing.littleH);
  const distanceOf = (model: Float64Array, p: Float64Array): number => Math.max(
    Math.hypot(model[centerXIndex] - p[host.centerXOffset], model[centerYIndex] - p[host.centerYOffset]), SMALLEST_DISTANCE_ARCSEC,
  );

  // kappa_s, theta_s from M200 and c; then tau = r_t / theta_s from the host read in p (its writers ran first).
  const write = (model: Float64Array, p: Float64Array): void => {
    const mass = Math.pow(10, model[massIndex]);
    writeNfwLensingParameters(mass, concentrationOf(model, mass), lensing, p, offset);
    const distance = distanceOf(model, p);
    const truncation = tidalTruncationRadius(distance, mass, hostSphericalMassSolar(host.components, p, distance, lensing));
    p[offset + 2] = Math.max(truncation / p[offset + 1], SMALLEST_TRUNCATION_RATIO);
    p[offset + 3] = model[centerXIndex];
    p[offset + 4] = model[centerYIndex];
  };

  const scratch = new Float64Array(host.profileLength);
  const derived = (model: Float64Array): PerturberDerived => {
    host.writeMainLens(model, scratch);
    const mass = Math.pow(10, model[massIndex]);
    const distance = distanceOf(model, scratch);
    const hostMassWithinSolar = hostSphericalMassSolar(host.components, scratch, distance, lensing);
    const concentration = concentrationOf(model, mass);
    const lensingParameters = Float64Array.of(0, 0);
    writeNfwLensingParameters(mass, concentration, lensing, lensingParameters, 0);
    const truncationRatio = Math.max(tidalTruncationRadius(distance, mass, hostMassWithinSolar) / lensingParameters[1], SMALLEST_TRUNCATION_RATIO);
    const h = subhaloFromMass({ massM200Solar: mass, concentration, truncationRatio }, lensing);
    return {
      kind: component.kind, massM200Solar: mass, totalMassSolar: h.totalMassSolar, concentration,
      r200Kpc: h.r200Kpc, scaleRadiusKpc: h.scaleRadiusKpc, scaleRadiusArcsec: h.scaleRadiusArcsec,
      convergenceScale: h.convergenceScale, truncationRatio, truncationRadiusKpc: h.truncationRadiusKpc,
      truncationRadiusArcsec: h.truncationRadiusArcsec, hostDistanceArcsec: distance, hostMassWithinSolar,
    };
  };
  return {
    kind: component.kind, key: component.key, profile: pair.reference, fast: pair.fast,
    massIndex, centerXIndex, centerYIndex, write, derived, positionPrior: component.positionPrior,
  };
}
