/**
 * Shape k of a generalised Pareto distribution fitted to exceedances x (ascending, all > 0) by
 * the empirical-Bayes estimate of Zhang & Stephens 2009 (Technometrics 51, 316, Section 3: a
 * quadrature over m = 30 + floor(sqrt(n)) values of theta, weighted by the profile likelihood),
 * returned as xi = -k_ZS (positive for heavy tails), with the weakly informative prior of Vehtari,
 * Simpson, Gelman, Yao & Gabry 2024 (JMLR 25, 72, Appendix C: 10 pseudo-observations at 0.5).
 */
export function generalizedParetoShape(x: Float64Array): number {
  const n = x.length;
  const prior = 3;
  const m = 30 + Math.floor(Math.sqrt(n));
  const quartile = x[Math.max(0, Math.floor(n / 4 + 0.5) - 1)];
  const theta = new Float64Array(m);
  const profile = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    theta[j] = 1 / x[n - 1] + (1 - Math.sqrt(m / (j + 0.5))) / (prior * quartile);
    const k = meanLog1p(theta[j], x);
    profile[j] = n * (Math.log(-theta[j] / k) - k - 1);
  }
  let thetaMean = 0;
  let weightSum = 0;
  const weights = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    let sum = 0;
    for (let l = 0; l < m; l++) sum += Math.exp(profile[l] - profile[j]);
    weights[j] = 1 / sum;
  }
  for (let j = 0; j < m; j++) {
    if (weights[j] < 10 * Number.EPSILON) continue;
    thetaMean += theta[j] * weights[j];
    weightSum += weights[j];
  }
  thetaMean /= weightSum;
  const xi = meanLog1p(thetaMean, x);
  const pseudo = 10;
  return (xi * n + pseudo * 0.5) / (n + pseudo);
}

/** mean of ln(1 - theta x_i). */
function meanLog1p(theta: number, x: Float64Array): number {
  let sum = 0;
  for (let i = 0; i < x.length; i++) sum += Math.log1p(-theta * x[i]);
  return sum / x.length;
}

/**
 * Pareto k-hat of importance weights given as ln w (Vehtari et al. 2024, Section 3): the
 * generalised Pareto shape fitted to the M = ceil(min(S/5, 3 sqrt(S))) largest weights' excess over
 * the next largest, S the number of weights. Above paretoShapeLimit(S) the weights' tail is too
 * heavy for the estimate's error to be trusted (k >= 0.5: the weights have no finite variance).
 * NaN when fewer than 5 tail weights are positive.
 */
export function paretoTailShape(lnWeights: ArrayLike<number>, count: number = lnWeights.length): number {
  const tail = Math.ceil(Math.min(count / 5, 3 * Math.sqrt(count)));
  if (tail < 5) return Number.NaN;
  const sorted = Float64Array.from({ length: count }, (_, i) => lnWeights[i]).sort();
  const largest = sorted[count - 1];
  const cutoff = sorted[count - tail - 1];
  if (!(cutoff > -Infinity)) return Number.NaN;
  const exceedances = new Float64Array(tail);
  for (let i = 0; i < tail; i++) exceedances[i] = Math.exp(sorted[count - tail + i] - largest) - Math.exp(cutoff - largest);
  if (!(exceedances[0] > 0)) return Number.NaN;
  return generalizedParetoShape(exceedances);
}

/** The k-hat above which S importance weights give an unreliable estimate: min(1 - 1/log10 S, 0.7) (Vehtari et al. 2024, Section 3.2.4). */
export function paretoShapeLimit(count: number): number {
  return Math.min(1 - 1 / Math.log10(count), 0.7);
}
