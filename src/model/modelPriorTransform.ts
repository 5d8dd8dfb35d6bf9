import type { ObservedData } from '../data/observedData.js';
import type { LensSystem } from './lensSystem.js';
import type { ParameterSpace } from '../priors/parameterSpace.js';
import { perturberRelabelling } from './perturberRelabelling.js';
import { positionRegionTransform } from './positionRegion.js';

/** A lens model's map from the unit cube to its physical parameter vector. */
export interface ModelPriorTransform {
  readonly transform: (unit: Float64Array, out: Float64Array) => void;
  /** True when identical perturbers are ordered by x to remove label switching. */
  readonly relabelled: boolean;
}

/**
 * The prior transform of a lens model: each parameter's prior (ParameterSpace.fromUnitCube), then
 * the perturbers' position regions (disc, box or mask), the ordering of identical perturbers and
 * `additional` (e.g. a map prior on a position). The sampler's thread and every worker thread
 * that runs slice chains build it the same way, so both map a unit point to the same model.
 */
export function modelPriorTransform(
  system: LensSystem, space: ParameterSpace, data: ObservedData,
  additional?: (unit: Float64Array, out: Float64Array) => void,
): ModelPriorTransform {
  const relabel = perturberRelabelling(system, space);
  const region = positionRegionTransform(system, space, data);
  return {
    transform: (unit, out) => {
      space.fromUnitCube(unit, out);
      if (region !== undefined) region(unit, out);
      if (relabel !== undefined) relabel(out);
      if (additional !== undefined) additional(unit, out);
    },
    relabelled: relabel !== undefined,
  };
}
