import type { MisfitRecord } from '../../records/misfitRecord.js';
import { escapeMarkup } from '../text/escapeMarkup.js';
import { formatCount, formatNumber } from '../text/formatNumber.js';
import { htmlTable, numberCell, type TableCell } from './htmlTable.js';

/** One fit's column in a misfit table (`tone` names its swatch class). */
export interface MisfitColumn {
  readonly tone: string;
  readonly label: string;
  /** Absent in records written before arcsift recorded the misfit alarm. */
  readonly misfit: MisfitRecord | undefined;
}

/** The misfit badge of one fit: `misfit` when the alarm sounds, `fits` otherwise. */
export function misfitBadge(misfit: MisfitRecord | undefined): string {
  if (misfit === undefined) return '<span class="absent">not recorded</span>';
  return misfit.alarm ? '<span class="tag misfit">misfit</span>' : '<span class="tag fits">passes</span>';
}

/** A p-value for a table: three decimals, or exponent notation below 0.001. */
export function pValueText(p: number): string {
  return p < 1e-3 ? p.toExponential(1) : formatNumber(p, 3);
}

/**
 * The misfit alarm of one or more best fits, a column each: chi-square inside the mask, its
 * degrees of freedom and its value per degree of freedom, and Moran's I of the normalised
 * residuals with its permutation p-value and the alarm.
 */
export function misfitTable(fits: readonly MisfitColumn[]): string {
  const row = (label: string, cell: (m: MisfitRecord) => string | TableCell): (string | TableCell)[] =>
    [label, ...fits.map((f) => (f.misfit === undefined ? '<span class="absent">not recorded</span>' : cell(f.misfit)))];
  return htmlTable({
    id: 'misfit-table',
    head: [['', ...fits.map((f) => `<span class="swatch ${escapeMarkup(f.tone)}"></span>${escapeMarkup(f.label)}`)]],
    rows: [
      ['misfit test', ...fits.map((f) => misfitBadge(f.misfit))],
      row('used pixels', (m) => numberCell(formatCount(m.pixels))),
      row('&chi;<sup>2</sup> at the best fit', (m) => numberCell(formatNumber(m.chiSquare, 1))),
      row('degrees of freedom (pixels &minus; sampled &minus; linear)', (m) => numberCell(`${formatCount(m.degreesOfFreedom)} <small>(${m.freeParameters} + ${formatCount(m.linearAmplitudes)})</small>`)),
      row('&chi;<sup>2</sup> per degree of freedom', (m) => numberCell(formatNumber(m.chiSquarePerDegreeOfFreedom, 3))),
      row('(&chi;<sup>2</sup> &minus; &nu;) / &radic;(2&nu;)', (m) => numberCell(m.chiSquareExcessSigma === null ? 'n/a' : `${m.chiSquareExcessSigma.toFixed(1)} &sigma;`)),
      row(`Moran's I (${fits.find((f) => f.misfit !== undefined)?.misfit?.neighbours ?? 'rook'} neighbours)`, (m) => numberCell(formatNumber(m.moransI, 4))),
      row('expectation under no structure', (m) => numberCell(formatNumber(m.moransIExpectation, 5))),
      row('z-score (randomisation variance)', (m) => numberCell(formatNumber(m.moransIZScore, 2))),
      row('permutation p-value (one-sided)', (m) => ({ html: `${pValueText(m.pValue)} <small>(${formatCount(m.permutations)} shuffles; alarm at &le; ${m.falseAlarmRate})</small>`, className: m.alarm ? 'num warn' : 'num' })),
    ],
  });
}

/** What the misfit table shows, in a sentence for the page (the first recorded fit's counting). */
export function misfitTableNote(fits: readonly MisfitColumn[]): string {
  const m = fits.find((f) => f.misfit !== undefined)?.misfit;
  if (m === undefined) return '<p class="note">These runs did not record the misfit alarm.</p>';
  return `<p class="note">The misfit test asks whether the normalised residuals (data &minus; model) / noise at the best fit resemble their neighbours, as a lens or source structure the model missed makes them do: Moran's I (Moran 1950) against its permutation distribution (Cliff &amp; Ord 1981), one-sided. Its null assumes independent pixel noise: resampled (drizzled) images raise it on noise alone. Only this test decides; &chi;<sup>2</sup> is shown beside it with degrees of freedom counted ${escapeMarkup(m.degreesOfFreedomCounting)}.</p>`;
}
