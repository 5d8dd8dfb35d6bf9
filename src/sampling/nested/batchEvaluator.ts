import { InputError, expectedFound } from '../../errors.js';
import type { NestedProblem } from './nestedProblem.js';

/**
 * Transforms unit rows, calls the likelihood once per batch and sanitises the answers (NaN and
 * +-Infinity become -Infinity and are counted). Used by the sampler, and by a worker thread that
 * runs slice chains next to its likelihood (NestedProblem.runSliceChain).
 */
export class BatchEvaluator {
  private readonly problem: Pick<NestedProblem, 'dim' | 'physicalDim' | 'transform' | 'logLikelihood'>;
  private readonly unitRow: Float64Array;
  private readonly physicalRow: Float64Array;
  nonFinite = 0;
  evaluations = 0;

  constructor(problem: Pick<NestedProblem, 'dim' | 'physicalDim' | 'transform' | 'logLikelihood'>) {
    this.problem = problem;
    this.unitRow = new Float64Array(problem.dim);
    this.physicalRow = new Float64Array(problem.physicalDim);
  }

  /** Writes the physical rows of `unit[0..count)` into physicalOut and returns their ln L. */
  readonly evaluate = async (unit: Float64Array, count: number, physicalOut: Float64Array): Promise<Float64Array> => {
    const { dim, physicalDim } = this.problem;
    for (let row = 0; row < count; row++) {
      for (let i = 0; i < dim; i++) this.unitRow[i] = unit[row * dim + i];
      this.problem.transform(this.unitRow, this.physicalRow);
      for (let i = 0; i < physicalDim; i++) physicalOut[row * physicalDim + i] = this.physicalRow[i];
    }
    const answer = await this.problem.logLikelihood(physicalOut.subarray(0, count * physicalDim), count);
    if (answer.length < count) {
      throw new InputError(`nested sampling logLikelihood: ${expectedFound(`${count} values`, answer.length)}`);
    }
    const lnL = new Float64Array(count);
    for (let row = 0; row < count; row++) {
      const value = answer[row];
      if (Number.isFinite(value)) lnL[row] = value;
      else {
        lnL[row] = -Infinity;
        this.nonFinite++;
      }
    }
    this.evaluations += count;
    return lnL;
  };
}
