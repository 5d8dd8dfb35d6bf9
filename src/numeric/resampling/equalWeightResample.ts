import { InputError, expectedFound } from '../../errors.js';
import { SeededStream } from '../random/seededStream.js';
import { kishEffectiveSampleSize } from '../statistics/kishEffectiveSampleSize.js';
import { checkRows } from '../statistics/sampleChecks.js';

/** Equal-weight samples drawn from weighted ones. */
export interface EqualWeightSamples {
  /** `count` rows of `dim` values, copies of the chosen rows, in ascending order of source row. */
  readonly points: Float64Array;
  /** Source row of each output row. */
  readonly sourceRows: Uint32Array;
  readonly count: number;
}

/**
 * Systematic resampling (Kitagawa 1996; Carpenter, Clifford & Fearnhead 1999): one uniform U from
 * the seeded stream (SeededStream), then output k takes the row whose
 * cumulative-weight step contains (k + U) / count of the total, so row i is copied floor(count w_i)
 * or ceil(count w_i) times and count w_i times on average. `points` are weights.length rows of
 * `dim`; weights non-negative, any normalisation. `count` defaults to the Kish effective sample
 * size rounded down (at least 1). Deterministic for a seed.
 */
export function equalWeightResample(
  points: ArrayLike<number>,
  dim: number,
  weights: ArrayLike<number>,
  seed: number,
  count?: number,
): EqualWeightSamples {
  const rows = weights.length;
  checkRows(points, rows, dim, 'resampling: points');
  if (!Number.isInteger(seed) || seed < 1 || seed > 0xffffffff) {
    throw new InputError(`resampling seed: ${expectedFound('an integer from 1 to 4294967295', seed)}`);
  }
  const cumulative = new Float64Array(rows);
  let total = 0;
  for (let i = 0; i < rows; i++) {
    const weight = weights[i];
    if (!(weight >= 0) || weight === Infinity) {
      throw new InputError(`resampling: weight ${i}: ${expectedFound('a finite number >= 0', weight)}`);
    }
    total += weight;
    cumulative[i] = total;
  }
  if (!(total > 0) || total === Infinity) {
    throw new InputError(`resampling: ${expectedFound('weights with a positive finite sum', total)}`);
  }
  const samples = count ?? Math.max(1, Math.floor(kishEffectiveSampleSize(weights)));
  if (!Number.isInteger(samples) || samples < 1) {
    throw new InputError(`resampling: sample count: ${expectedFound('an integer >= 1', samples)}`);
  }
  const offset = SeededStream.fromSeed(seed).uniform();
  const sourceRows = new Uint32Array(samples);
  const out = new Float64Array(samples * dim);
  let source = 0;
  for (let k = 0; k < samples; k++) {
    const target = ((k + offset) / samples) * total;
    while (source < rows - 1 && cumulative[source] <= target) source++;
    sourceRows[k] = source;
    for (let j = 0, from = source * dim, to = k * dim; j < dim; j++) out[to + j] = points[from + j];
  }
  return { points: out, sourceRows, count: samples };
}
