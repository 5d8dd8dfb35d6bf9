import { wilsonInterval } from '../numeric/statistics/wilsonInterval.js';
import type { ProportionRecord } from '../records/calibrationSummary.js';

/** successes of trials with the Wilson 68.27% interval, as calibration.json holds it (null fraction without trials). */
export function proportionRecord(successes: number, trials: number): ProportionRecord {
  const p = wilsonInterval(successes, trials);
  return {
    successes, trials,
    fraction: trials === 0 ? null : p.fraction,
    standardError: trials === 0 ? null : p.standardError,
    lower: p.lower, upper: p.upper,
  };
}
