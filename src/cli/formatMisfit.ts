import type { MisfitRecord } from '../records/misfitRecord.js';

const signed = (v: number): string => `${v >= 0 ? '+' : ''}${v.toFixed(1)}`;

/**
 * One line of a fit's misfit alarm: chi^2 per degree of freedom (and how far it lies from 1 in its
 * standard deviations), Moran's I of the normalised residuals with its permutation p-value, and
 * whether the alarm sounds. `label` names the fit (e.g. `smooth model`).
 */
export function formatMisfit(label: string, m: MisfitRecord | undefined): string {
  if (m === undefined) return `${label}: misfit test not recorded (a run written before arcsift recorded it)`;
  const chi = m.chiSquarePerDegreeOfFreedom === null
    ? `chi^2 = ${m.chiSquare.toFixed(1)} (no degrees of freedom left)`
    : `chi^2/dof = ${m.chiSquarePerDegreeOfFreedom.toFixed(3)} (${m.degreesOfFreedom} dof, ${signed(m.chiSquareExcessSigma!)} sigma)`;
  const p = m.pValue < 0.001 ? m.pValue.toExponential(1) : m.pValue.toFixed(3);
  const verdict = m.alarm ? `MISFIT: p <= ${m.falseAlarmRate}, the residuals hold structure the model missed` : 'passes (no spatial structure found)';
  return `${label}: ${chi}; Moran's I = ${m.moransI.toFixed(4)} (z = ${m.moransIZScore.toFixed(1)}), p = ${p}: ${verdict}`;
}

/** The note said once under the misfit lines: what the test is and how degrees of freedom are counted. */
export function misfitNote(m: MisfitRecord | undefined): string {
  if (m === undefined) return '';
  return `misfit test: Moran's I of (data - model) / noise over ${m.neighbours}-neighbouring pixels inside the mask, ` +
    `one-sided permutation test (${m.permutations} shuffles; it assumes independent pixel noise); degrees of freedom ${m.degreesOfFreedomCounting}`;
}
