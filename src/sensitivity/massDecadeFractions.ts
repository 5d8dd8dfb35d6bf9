import type { MassDecadeFraction } from '../records/sensitivitySummary.js';

/**
 * For every whole decade 10^k within [10^lower, 10^upper], the fraction of the grid points whose
 * minimum detectable log10 mass is at most k (a cumulative count; +Infinity, "not detectable in
 * the prior range", never counts).
 */
export function massDecadeFractions(log10MinimumMasses: readonly number[], lower: number, upper: number): MassDecadeFraction[] {
  const out: MassDecadeFraction[] = [];
  const total = log10MinimumMasses.length;
  for (let k = Math.ceil(lower); k <= Math.floor(upper); k++) {
    const points = log10MinimumMasses.filter((m) => m <= k).length;
    out.push({ log10Mass: k, fraction: total === 0 ? 0 : points / total, points });
  }
  return out;
}
