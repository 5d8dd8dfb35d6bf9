import type { Comparison } from './compareModels.js';
import { weightsFromLogWeights } from '../numeric/statistics/weightsFromLogWeights.js';
import { parameterColumn } from '../results/index.js';

/** Where a planted (true) value falls in a weighted posterior. */
export interface TruthPlacement {
  readonly name: string;
  readonly truth: number;
  readonly median: number;
  readonly lower95: number;
  readonly upper95: number;
  /** Posterior mass below the truth (0.5 = at the median). */
  readonly quantileOfTruth: number;
  readonly inside95: boolean;
}

/**
 * For each free parameter of the perturbed model with a known true value, the posterior mass
 * below it (its quantile) and whether it lies in the central 95% interval.
 */
export function placeTruth(comparison: Comparison, truthVector: Float64Array, names: readonly string[]): TruthPlacement[] {
  const { result, space } = comparison.perturbed;
  const weights = weightsFromLogWeights(result.lnWeight);
  const width = space.physicalDim;
  return names.map((name) => {
    const index = space.names.indexOf(name);
    const values = parameterColumn(result.points, width, index);
    const truth = truthVector[index];
    let below = 0;
    for (let r = 0; r < values.length; r++) if (values[r] < truth) below += weights[r];
    const summary = comparison.perturbers.find((p) => name.startsWith(p.key));
    const s = name.endsWith('log10MassSolar') ? summary?.log10Mass
      : name.endsWith('centerXArcsec') ? summary?.centerXArcsec : summary?.centerYArcsec;
    return {
      name, truth,
      median: s?.median ?? Number.NaN,
      lower95: s?.interval95.lower ?? Number.NaN,
      upper95: s?.interval95.upper ?? Number.NaN,
      quantileOfTruth: below,
      inside95: below >= 0.025 && below <= 0.975,
    };
  });
}
