import type { ParameterSpace } from '../../priors/parameterSpace.js';
import type { EnsembleProblem, PeriodicRange } from './ensembleProblem.js';

/**
 * Batch log likelihood of physical vectors (every parameter, fixed ones included, in
 * `space.names` order), `count` rows of `space.physicalDim` values.
 */
export type BatchLogLikelihood = (
  physical: Float64Array, count: number,
) => Promise<Float64Array> | Float64Array;

/**
 * The posterior over a parameter space's free parameters as an ensemble problem: log prior plus
 * log likelihood, the likelihood asked only for points inside the prior support (in one batch).
 * Periodic priors give periodic dimensions.
 */
export function posteriorOnSpace(space: ParameterSpace, logLikelihood: BatchLogLikelihood): EnsembleProblem {
  const periodic: (PeriodicRange | null)[] = Array.from(space.freeIndices, (index) => {
    const prior = space.priors[index];
    return prior.periodic ? { lower: prior.lower, upper: prior.upper } : null;
  });
  let physical = new Float64Array(0);
  let slots = new Int32Array(0);
  return {
    dim: space.dim,
    periodic,
    logPosterior: async (points: Float64Array, count: number): Promise<Float64Array> => {
      const out = new Float64Array(count);
      if (physical.length < count * space.physicalDim) {
        physical = new Float64Array(count * space.physicalDim);
        slots = new Int32Array(count);
      }
      let inside = 0;
      for (let i = 0; i < count; i++) {
        space.toPhysical(points, physical, i * space.dim, inside * space.physicalDim);
        const logPrior = space.logPrior(physical, inside * space.physicalDim);
        out[i] = logPrior;
        if (logPrior > -Infinity) slots[inside++] = i;
      }
      if (inside === 0) return out;
      const likelihood = await logLikelihood(physical, inside);
      for (let j = 0; j < inside; j++) out[slots[j]] += likelihood[j];
      return out;
    },
  };
}
