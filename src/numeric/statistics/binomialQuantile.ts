import { gammaln } from '../special/stdlibSpecial.js';

// The smallest k with P(X <= k) >= q for X ~ Binomial(n, p), summing the probability mass
// function C(n, k) p^k (1 - p)^(n - k) (Abramowitz & Stegun 26.1.20) with log-gamma binomial
// coefficients, so that large n neither overflows nor underflows.
export function binomialQuantile(q: number, trials: number, p: number): number {
  if (p <= 0) return 0;
  if (p >= 1) return trials;
  const lnP = Math.log(p);
  const lnQ = Math.log1p(-p);
  const lnFactorialN = gammaln(trials + 1);
  let cumulative = 0;
  for (let k = 0; k < trials; k++) {
    cumulative += Math.exp(lnFactorialN - gammaln(k + 1) - gammaln(trials - k + 1) + k * lnP + (trials - k) * lnQ);
    if (cumulative >= q) return k;
  }
  return trials;
}
