/**
 * Kolmogorov-Smirnov statistic D_n = sup |F_n(u) - u| of a sample against the uniform law on
 * [0, 1] (Kolmogorov 1933). Sorts `values` in place.
 */
export function kolmogorovSmirnovUniform(values: Float64Array): number {
  values.sort();
  const n = values.length;
  let largest = 0;
  for (let i = 0; i < n; i++) {
    const above = (i + 1) / n - values[i];
    const below = values[i] - i / n;
    if (above > largest) largest = above;
    if (below > largest) largest = below;
  }
  return largest;
}

/**
 * P(D_n >= d) for the one-sample Kolmogorov-Smirnov statistic: the asymptotic Kolmogorov
 * distribution Q(lambda) = 2 sum_{j>=1} (-1)^{j-1} exp(-2 j^2 lambda^2) (Kolmogorov 1933) at
 * lambda = (sqrt(n) + 0.12 + 0.11/sqrt(n)) d, the finite-n correction of Stephens 1970. For
 * lambda < 1.18 the equivalent theta-function form 1 - sqrt(2 pi)/lambda sum_{j>=1}
 * exp(-(2j - 1)^2 pi^2 / (8 lambda^2)) converges faster and is used instead.
 */
export function kolmogorovSmirnovPValue(statistic: number, sampleSize: number): number {
  if (!(statistic > 0)) return 1;
  const root = Math.sqrt(sampleSize);
  const lambda = (root + 0.12 + 0.11 / root) * statistic;
  if (lambda < 1.18) {
    if (lambda < 0.2) return 1;
    const factor = -(Math.PI * Math.PI) / (8 * lambda * lambda);
    let sum = 0;
    for (let j = 1; j <= 8; j++) sum += Math.exp(factor * (2 * j - 1) ** 2);
    return Math.min(1, Math.max(0, 1 - (Math.sqrt(2 * Math.PI) / lambda) * sum));
  }
  let sum = 0;
  for (let j = 1; j <= 100; j++) {
    const term = Math.exp(-2 * j * j * lambda * lambda);
    sum += j % 2 === 1 ? term : -term;
    if (term < 1e-300) break;
  }
  return Math.min(1, Math.max(0, 2 * sum));
}
