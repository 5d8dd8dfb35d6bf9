import type { CalibrationSummary, ProportionRecord } from '../records/calibrationSummary.js';

const percent = (p: ProportionRecord): string => (p.fraction === null ? '-' : `${(100 * p.fraction).toFixed(0)}% +- ${(100 * (p.standardError ?? 0)).toFixed(0)}`);
const pValue = (p: number): string => (p < 1e-3 ? p.toExponential(1) : p.toFixed(3));

/** The plain-text result of a calibration: per parameter the rank tests and coverage, then the detection rates. */
export function formatCalibration(s: CalibrationSummary): string {
  const d = s.draws;
  const lines = [
    `Calibration of ${s.config} (${s.job}): ${d.finished} of ${d.planned} draws finished (${d.withPerturber} with a perturber, ${d.withoutPerturber} without)` +
      `${d.stoppedEarly > 0 ? `, ${d.stoppedEarly} cut short` : ''}${d.failed > 0 ? `, ${d.failed} failed` : ''}`,
    `Ranks of the truth among L = ${s.rankDraws} posterior draws (Talts et al. 2018); uniform ranks and nominal coverage mean a calibrated posterior.`,
    '',
  ];
  const table = [
    ['parameter', 'draws', 'rank chi2 p', 'KS p', '68% coverage', '95% coverage'],
    ...s.parameters.map((p) => [p.name, String(p.draws), p.rankHistogram.length > 1 ? pValue(p.chiSquarePValue) : '-', pValue(p.ksPValue), percent(p.coverage68), percent(p.coverage95)]),
  ];
  const widths = table[0].map((_, c) => Math.max(...table.map((line) => line[c].length)));
  lines.push(...table.map((line) => `  ${line.map((cell, c) => (c === 0 ? cell.padEnd(widths[c]) : cell.padStart(widths[c]))).join('  ')}`));
  const det = s.detection;
  if (det !== null) {
    lines.push('', `Detections (ln B > ${det.thresholdLnB}):`,
      `  false detections on draws without a perturber: ${det.falseDetection.successes} of ${det.falseDetection.trials} (${percent(det.falseDetection)}); ` +
        `bound for a calibrated Bayes factor: <= ${(100 * det.falseDetectionBound).toFixed(1)}%`);
    for (const b of det.byMass) {
      if (b.trials > 0) lines.push(`  true log10 mass ${b.log10MassLower.toFixed(1)}-${b.log10MassUpper.toFixed(1)}: detected ${b.successes} of ${b.trials} (${percent(b)})`);
    }
    const c = det.claims;
    if (c !== undefined && c.falseClaims.trials + c.trueClaims.trials > 0) {
      lines.push(`Detections claimed by the comparisons' own rule (ln B > ${c.thresholdsLnB.join(' or ')} and the smooth model passing the misfit alarm):`,
        `  on draws without a perturber: ${c.falseClaims.successes} of ${c.falseClaims.trials} (${percent(c.falseClaims)}); no evidence (smooth model misfit): ${c.notEvidenceWithout}`,
        `  on draws with a perturber: ${c.trueClaims.successes} of ${c.trueClaims.trials} (${percent(c.trueClaims)}); no evidence (smooth model misfit): ${c.notEvidenceWith}`);
    }
  }
  if (s.meanRowSeconds !== null) lines.push('', `Run time: ${(s.rowSeconds / 3600).toFixed(2)} h over all rows, ${s.meanRowSeconds.toFixed(0)} s per finished row on average.`);
  return lines.join('\n');
}
