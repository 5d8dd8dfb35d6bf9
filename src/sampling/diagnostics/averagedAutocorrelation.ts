import { AutocovariancePlan } from './autocovariance.js';
import type { ChainLayout } from './chainLayout.js';

// Averaged autocorrelation function of an ensemble: each walker's normalised autocorrelation
// rho_w(t) = c_w(t) / c_w(0), averaged over walkers (the ensemble practice following
// Goodman & Weare 2010, sec. 3: one estimate of rho from all walkers of one parameter).
// Uses steps [fromStep, steps); writes rho(0..n-1) into out. Constant walkers are skipped.
export function averagedAutocorrelation(
  chain: Float64Array, layout: ChainLayout, parameter: number, fromStep = 0,
  out = new Float64Array(layout.steps - fromStep),
  plan = new AutocovariancePlan(layout.steps - fromStep),
): Float64Array {
  const { steps, walkers, dim } = layout;
  const n = steps - fromStep;
  const single = new Float64Array(n);
  out.fill(0, 0, n);
  let used = 0;
  for (let w = 0; w < walkers; w++) {
    plan.compute(chain, (fromStep * walkers + w) * dim + parameter, walkers * dim, single);
    const c0 = single[0];
    if (!(c0 > 0)) continue;
    for (let t = 0; t < n; t++) out[t] += single[t] / c0;
    used++;
  }
  if (used === 0) {
    out.fill(Number.NaN, 0, n);
    return out;
  }
  for (let t = 0; t < n; t++) out[t] /= used;
  return out;
}
