import { standardNormalQuantile } from '../../numeric/special/standardNormal.js';
import type { Draws } from './splitChains.js';

// Rank normalisation (Vehtari, Gelman, Simpson, Carpenter & Buerkner 2021, eq. 14): pooled ranks r
// (ties share their average rank) mapped to z = Phi^{-1}((r - 3/8) / (S + 1/4)), Blom's offset.
// `sorted` (the same values in ascending order) may be passed when the caller has it.
export function rankNormalize(draws: Draws, sorted: Float64Array = draws.values.slice().sort()): Draws {
  const values = draws.values;
  const total = values.length;
  const z = new Float64Array(total);
  for (let i = 0; i < total; i++) {
    const x = values[i];
    // Equal values occupy sorted[lo .. hi - 1], i.e. 1-based ranks lo + 1 .. hi.
    const lo = firstAtLeast(sorted, x);
    const hi = firstAbove(sorted, x, lo);
    z[i] = standardNormalQuantile(((lo + 1 + hi) / 2 - 0.375) / (total + 0.25));
  }
  return { values: z, chains: draws.chains, drawsPerChain: draws.drawsPerChain };
}

export function firstAtLeast(sorted: Float64Array, x: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

function firstAbove(sorted: Float64Array, x: number, from: number): number {
  let lo = from;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] <= x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
