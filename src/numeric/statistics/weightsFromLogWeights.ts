/**
 * Linear posterior weights exp(lnWeight - max lnWeight) / sum, from log weights normalised or
 * not; the largest weight is formed without overflow and tiny ones underflow to 0 harmlessly.
 */
export function weightsFromLogWeights(lnWeight: ArrayLike<number>): Float64Array {
  const count = lnWeight.length;
  let largest = -Infinity;
  for (let i = 0; i < count; i++) if (lnWeight[i] > largest) largest = lnWeight[i];
  const weights = new Float64Array(count);
  let sum = 0;
  for (let i = 0; i < count; i++) {
    const weight = Math.exp(lnWeight[i] - largest);
    weights[i] = weight;
    sum += weight;
  }
  const scale = 1 / sum;
  for (let i = 0; i < count; i++) weights[i] *= scale;
  return weights;
}
