import type { ProportionRecord } from '../records/calibrationSummary.js';
import { proportionRecord } from './proportionRecord.js';

/** Nominal levels of the coverage curve: 5%, 10%, ..., 95%. */
export const COVERAGE_LEVELS: readonly number[] = Array.from({ length: 19 }, (_, k) => (k + 1) / 20);

/**
 * The coverage curve: for each nominal level a, the share of draws whose truth lies in the
 * posterior's central interval of mass a, i.e. whose posterior CDF at the truth lies in
 * ((1 - a)/2, (1 + a)/2). A calibrated posterior covers a of them (Cook, Gelman & Rubin 2006).
 */
export function coverageCurve(cdfValues: readonly number[], levels: readonly number[] = COVERAGE_LEVELS): ({ level: number } & ProportionRecord)[] {
  return levels.map((level) => {
    const inside = cdfValues.filter((u) => Math.abs(u - 0.5) < level / 2).length;
    return { level, ...proportionRecord(inside, cdfValues.length) };
  });
}

/** Share of draws whose truth lies inside [lower, upper] of their reported interval. */
export function intervalCoverage(inside: readonly boolean[]): ProportionRecord {
  return proportionRecord(inside.filter((b) => b).length, inside.length);
}
