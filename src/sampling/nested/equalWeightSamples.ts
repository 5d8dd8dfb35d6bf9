import { SeededStream } from './seededStream.js';

/** Kish's effective sample size (sum w)^2 / sum w^2 of normalised log weights (Kish 1965). */
export function effectiveSampleSize(lnWeight: ArrayLike<number>, count: number): number {
  let sum = 0;
  let sumSquares = 0;
  for (let i = 0; i < count; i++) {
    const weight = Math.exp(lnWeight[i]);
    sum += weight;
    sumSquares += weight * weight;
  }
  return sumSquares > 0 ? (sum * sum) / sumSquares : 0;
}

/**
 * Equal-weight posterior samples from weighted points by systematic resampling (Kitagawa 1996:
 * one uniform offset, then the comb (i + U)/n through the cumulative weights), returned in a
 * random order (Fisher-Yates shuffle, Durstenfeld 1964). `points` are rows of width `width`,
 * `lnWeight` normalised or not. `count` defaults to the Kish effective sample size.
 */
export function equalWeightSamples(
  points: Float64Array,
  width: number,
  lnWeight: ArrayLike<number>,
  weightCount: number,
  count?: number,
  seed = 1,
): Float64Array {
  let largest = -Infinity;
  for (let i = 0; i < weightCount; i++) if (lnWeight[i] > largest) largest = lnWeight[i];
  const cumulative = new Float64Array(weightCount);
  let running = 0;
  for (let i = 0; i < weightCount; i++) {
    running += Math.exp(lnWeight[i] - largest);
    cumulative[i] = running;
  }
  const samples = count ?? Math.max(1, Math.floor(effectiveSampleSize(lnWeight, weightCount)));
  const stream = SeededStream.fromSeed(seed);
  const offset = stream.uniform();
  const chosen = new Int32Array(samples);
  let source = 0;
  for (let s = 0; s < samples; s++) {
    const target = ((s + offset) / samples) * running;
    while (source < weightCount - 1 && cumulative[source] <= target) source++;
    chosen[s] = source;
  }
  for (let s = samples - 1; s > 0; s--) {
    const other = stream.integer(s + 1);
    const kept = chosen[s];
    chosen[s] = chosen[other];
    chosen[other] = kept;
  }
  const out = new Float64Array(samples * width);
  for (let s = 0; s < samples; s++) out.set(points.subarray(chosen[s] * width, chosen[s] * width + width), s * width);
  return out;
}
