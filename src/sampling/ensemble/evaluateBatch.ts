import type { BatchLogDensity } from './ensembleProblem.js';

/** Calls the batch log density and checks it answered for every point. */
export async function evaluateBatch(
  logDensity: BatchLogDensity, points: Float64Array, count: number,
): Promise<Float64Array> {
  const values = await logDensity(points, count);
  if (!(values instanceof Float64Array) || values.length < count) {
    throw new Error(
      `the batch log density returned ${values instanceof Float64Array ? `${values.length} values` : typeof values} for ${count} points`,
    );
  }
  return values;
}
