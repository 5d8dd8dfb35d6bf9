import type { DetectionClaim } from '../../results/detectionClaim.js';
import type { ParameterSummary } from '../../results/parameterSummary.js';
import { escapeMarkup } from '../text/escapeMarkup.js';
import { digitsForSpread, formatNumber } from '../text/formatNumber.js';
import { htmlTable, numberCell, type TableCell } from './htmlTable.js';
import type { TruthRecord } from '../runFolder/readRunFolder.js';
import type { ComparisonSummary } from '../../records/comparisonSummary.js';

/** Median, 68% and 95% intervals as table cells, with digits suited to the 68% width. */
export function summaryCells(s: ParameterSummary, digits = digitsForSpread(0.5 * (s.interval68.upper - s.interval68.lower))): TableCell[] {
  const interval = (lo: number, hi: number): string => `[${formatNumber(lo, digits)}, ${formatNumber(hi, digits)}]`;
  return [
    numberCell(formatNumber(s.median, digits)),
    numberCell(interval(s.interval68.lower, s.interval68.upper)),
    numberCell(interval(s.interval95.lower, s.interval95.upper)),
  ];
}

const MASS_DIGITS = 2;

/** What the perturber table reads: the perturbers, and the Bayes factor when the run has one (a comparison). */
export interface PerturberTableInput {
  readonly perturbers: ComparisonSummary['perturbers'];
  readonly bayesFactor?: { readonly perturberFavoured: boolean; readonly favouredAbove: number };
  /** The comparison's detection claim, when it has one. */
  readonly detection?: Pick<DetectionClaim, 'claim' | 'thresholdLnB'>;
}

/** HTML name of a perturber's sampled mass: M200 for NFW-type profiles, the total mass otherwise. */
export function perturberMassName(kind: string): string {
  return kind === 'nfw' || kind === 'truncatedNfw' ? 'log<sub>10</sub> M<sub>200</sub> / M<sub>&#9737;</sub>' : 'log<sub>10</sub> M / M<sub>&#9737;</sub>';
}
const POSITION_DIGITS = 3;

/**
 * Each perturber's mass (the sampled log10 mass, M200 for NFW-type profiles, and the total
 * truncated mass where defined) and position, with median, 68% and 95% intervals and the 95%
 * upper limit on the mass; when the evidence does not favour a perturber the upper limit is the
 * quoted result and the intervals are shown for reference only.
 */
export function perturberTable(summary: PerturberTableInput, truth: TruthRecord | null): string {
  const favoured = summary.bayesFactor?.perturberFavoured ?? true;
  const truthOf = (name: string): number | undefined => truth?.parameters.find((p) => p.name === name)?.value;
  const truthCell = (value: number | undefined, digits: number): TableCell => numberCell(value === undefined ? '' : formatNumber(value, digits));
  const blocks = summary.perturbers.map((p) => {
    const massName = perturberMassName(p.kind);
    const derived = truth?.perturbers.find((t) => t.key === p.key);
    const rows: (string | TableCell)[][] = [];
    rows.push([massName, ...summaryCells(p.log10Mass, MASS_DIGITS), truthCell(truthOf(`${p.key}.log10MassSolar`), MASS_DIGITS)]);
    if (p.log10TotalMass !== null && p.kind === 'truncatedNfw') {
      const t = derived?.totalMassSolar;
      rows.push(['log<sub>10</sub> total (truncated) mass / M<sub>&#9737;</sub>', ...summaryCells(p.log10TotalMass, MASS_DIGITS), truthCell(t === undefined ? undefined : Math.log10(t), MASS_DIGITS)]);
    }
    rows.push([
      '95% upper limit on the mass',
      { html: `${massName} &lt; ${formatNumber(p.log10MassUpperLimit95, MASS_DIGITS)}`, className: favoured ? 'num' : 'num quoted', columns: 3 },
      '',
    ]);
    rows.push(['x [arcsec]', ...summaryCells(p.centerXArcsec, POSITION_DIGITS), truthCell(truthOf(`${p.key}.centerXArcsec`), POSITION_DIGITS)]);
    rows.push(['y [arcsec]', ...summaryCells(p.centerYArcsec, POSITION_DIGITS), truthCell(truthOf(`${p.key}.centerYArcsec`), POSITION_DIGITS)]);
    const prior = p.massPriorRange === null ? 'held fixed' : `uniform in log<sub>10</sub> mass on [${p.massPriorRange[0]}, ${p.massPriorRange[1]}]`;
    const note = summary.bayesFactor === undefined
      ? 'A single fit weighs no evidence for the perturber: only a comparison with the smooth model (arcsift compare) can call it a detection. The intervals are this model\'s posterior.'
      : favoured && summary.detection !== undefined && summary.detection.claim !== 'detected'
      ? `The evidence favours a perturber (ln B &gt; ${formatNumber(summary.bayesFactor.favouredAbove, 0)}) but makes no detection (threshold ln B &gt; ${formatNumber(summary.detection.thresholdLnB, 0)}; see the detection claim above): the intervals describe the perturber the perturbed model needs, not a measured subhalo.`
      : favoured
      ? 'The evidence favours a perturber: the intervals are the measurement.'
      : `The evidence does not favour a perturber (ln B &le; ${formatNumber(summary.bayesFactor.favouredAbove, 0)}): the 95% upper limit is the result; the intervals are shown for reference.`;
    return `<h3>${escapeMarkup(p.key)} <span class="muted">${escapeMarkup(p.kind)}</span></h3>`
      + `<p class="note">${note} Mass prior: ${prior}.</p>`
      + htmlTable({
        className: favoured ? 'perturber-table' : 'perturber-table not-favoured',
        head: [['quantity', numberCell('median'), numberCell('68% interval'), numberCell('95% interval'), numberCell(truth === null ? '' : 'truth')]],
        rows,
      });
  });
  return blocks.length === 0 ? '<p class="note">This run has no perturber summary.</p>' : blocks.join('\n');
}
