import type { ObservedData } from '../data/observedData.js';
import { residualAutocorrelation } from '../results/residualAutocorrelation.js';
import type { MisfitRecord } from '../records/misfitRecord.js';
import { runDefaults, type RunSettings } from '../settings/runDefaults.js';

/** How the misfit record counts degrees of freedom (written into every record). */
export const DEGREES_OF_FREEDOM_COUNTING =
  'nominal: used pixels minus sampled parameters minus linear amplitudes (a pixelated source counts each cell as one ' +
  'amplitude; its regularisation leaves fewer effective ones, so its chi^2 per degree of freedom reads high)';

/** What a model spends of the data's degrees of freedom. */
export interface ModelFreedom {
  readonly freeParameters: number;
  readonly linearAmplitudes: number;
}

/**
 * The misfit alarm of one best fit: chi^2 = sum of r^2 over the used pixels of the normalised
 * residual image r = (data - model) / noise (row-major, as writeFitImages makes it), its value per
 * degree of freedom counted nominally (DEGREES_OF_FREEDOM_COUNTING) and its distance from the
 * expectation, (chi^2 - nu) / sqrt(2 nu), by the normal approximation to the chi-square
 * distribution (common practice for nu in the thousands); and Moran's I of r with its
 * permutation test (results/residualAutocorrelation.ts), which sounds the alarm. Only the
 * Moran test decides: it asks whether the residuals resemble their neighbours, which a missed
 * lens or source structure makes them do, and it does not depend on the noise map's scale or on
 * how the degrees of freedom are counted; the chi-square is reported beside it.
 */
export function fitMisfit(
  data: ObservedData, normalisedResidual: ArrayLike<number>, freedom: ModelFreedom,
  alarm: RunSettings['misfitAlarm'] = runDefaults.misfitAlarm,
): MisfitRecord {
  const used = data.usedPixels;
  let chiSquare = 0;
  for (let k = 0; k < used.length; k++) chiSquare += normalisedResidual[used[k]] ** 2;
  const degreesOfFreedom = used.length - freedom.freeParameters - freedom.linearAmplitudes;
  const test = residualAutocorrelation(normalisedResidual, data.columns, data.rows, data.mask, alarm);
  return {
    pixels: used.length,
    chiSquare,
    freeParameters: freedom.freeParameters,
    linearAmplitudes: freedom.linearAmplitudes,
    degreesOfFreedom,
    degreesOfFreedomCounting: DEGREES_OF_FREEDOM_COUNTING,
    chiSquarePerDegreeOfFreedom: degreesOfFreedom >= 1 ? chiSquare / degreesOfFreedom : null,
    chiSquareExcessSigma: degreesOfFreedom >= 1 ? (chiSquare - degreesOfFreedom) / Math.sqrt(2 * degreesOfFreedom) : null,
    moransI: test.statistic,
    moransIExpectation: test.expectation,
    moransIZScore: test.zScore,
    pValue: test.pValue,
    permutations: test.permutations,
    neighbours: test.neighbours,
    falseAlarmRate: test.falseAlarmRate,
    alarm: test.alarm,
  };
}
