import { AutocovariancePlan } from './autocovariance.js';
import { chainMoments } from './chainMoments.js';
import { rankNormalize } from './rankNormalize.js';
import { quantileOfSorted } from '../../numeric/statistics/quantileOfSorted.js';
import { splitChains, type Draws } from './splitChains.js';

// Effective sample size of several chains (Vehtari, Gelman, Simpson, Carpenter & Buerkner 2021,
// Bayesian Analysis 16, 667, sec. 3.2, eq. 10-13): combined autocorrelation rho_t = 1 - (W -
// mean_j c_j(t)) / var+, summed with Geyer's initial monotone sequence (Geyer 1992, sec. 3.3):
// pair sums P_k = rho_2k + rho_2k+1 are kept while positive and made non-increasing; tau = -1 +
// 2 sum_k P_k, ESS = m n / tau. tau is floored at 1 / log10(m n), capping ESS at m n log10(m n)
// for antithetic chains. Sec. 3.2 is the authors' own pointer to their multi-chain ESS; the
// equation numbers and the floor were not checked against the paper (not reachable here).
export function chainEffectiveSampleSize(draws: Draws): number {
  const { values, chains, drawsPerChain: n } = draws;
  const total = chains * n;
  if (n < 4) return Number.NaN;
  const { within, pooled } = chainMoments(draws);
  if (!(pooled > 0)) return Number.NaN;
  const plan = new AutocovariancePlan(n);
  const single = new Float64Array(n);
  const meanAutocovariance = new Float64Array(n);
  for (let j = 0; j < chains; j++) {
    plan.compute(values, j * n, 1, single);
    for (let t = 0; t < n; t++) meanAutocovariance[t] += single[t] / chains;
  }
  const rho = (t: number): number => (t === 0 ? 1 : 1 - (within - meanAutocovariance[t]) / pooled);
  let sum = 0;
  let previous = Infinity;
  for (let k = 0; 2 * k + 1 < n; k++) {
    let pair = rho(2 * k) + rho(2 * k + 1);
    if (!(pair > 0)) break;
    if (pair > previous) pair = previous;
    sum += pair;
    previous = pair;
  }
  const tau = Math.max(-1 + 2 * sum, 1 / Math.log10(total));
  return total / tau;
}

// Bulk ESS: ESS of the rank-normalised split chains (Vehtari et al. 2021, sec. 4.1).
export function bulkEffectiveSampleSize(draws: Draws): number {
  return chainEffectiveSampleSize(rankNormalize(splitChains(draws)));
}

// Tail ESS: the smaller ESS of the split-chain indicators I(theta <= q05) and I(theta <= q95)
// (Vehtari et al. 2021, sec. 4.3).
export function tailEffectiveSampleSize(draws: Draws): number {
  const split = splitChains(draws);
  const sorted = split.values.slice().sort();
  let smallest = Infinity;
  for (const probability of [0.05, 0.95]) {
    const q = quantileOfSorted(sorted, probability);
    const indicator = new Float64Array(split.values.length);
    for (let i = 0; i < indicator.length; i++) indicator[i] = split.values[i] <= q ? 1 : 0;
    smallest = Math.min(smallest, chainEffectiveSampleSize({ ...split, values: indicator }));
  }
  return smallest;
}
