import { escapeMarkup } from '../text/escapeMarkup.js';
import { LN_EVIDENCE_DIGITS } from './evidenceTable.js';
import { formatNumber } from '../text/formatNumber.js';
import { htmlTable, numberCell } from './htmlTable.js';
import type { ComparisonSummary } from '../../records/comparisonSummary.js';

/** The Bayes factor of the perturbed over the smooth model, its reading and its frequentist bound. */
export function bayesFactorTable(summary: ComparisonSummary): string {
  const b = summary.bayesFactor;
  const p = b.pValueBound === null ? 'n/a' : b.pValueBound < 1e-3 ? b.pValueBound.toExponential(2) : formatNumber(b.pValueBound, 3);
  const rows: [string, string][] = [
    ['ln B = ln Z<sub>perturbed</sub> &minus; ln Z<sub>smooth</sub>', `${formatNumber(b.lnBayesFactor, LN_EVIDENCE_DIGITS)} &plusmn; ${formatNumber(b.lnBayesFactorError, LN_EVIDENCE_DIGITS)}`],
    ['2 ln B', formatNumber(2 * b.lnBayesFactor, LN_EVIDENCE_DIGITS)],
    ['reading (Kass &amp; Raftery 1995)', escapeMarkup(b.reading)],
    ['grade', escapeMarkup(b.kassRafteryGrade)],
    [`perturber favoured (ln B &gt; ${formatNumber(b.favouredAbove, 0)})`, b.perturberFavoured ? 'yes' : 'no'],
    ...(summary.detection === undefined ? [] : [
      ['detection threshold', `ln B &gt; ${formatNumber(summary.detection.thresholdLnB, 0)}`] as [string, string],
      ['detection claim', `<span class="tag claim-${summary.detection.claim}">${summary.detection.claim}</span>`] as [string, string],
    ]),
    ['significance bound (Sellke, Bayarri &amp; Berger 2001)', escapeMarkup(b.significance)],
    ['p-value bound', p],
    ['sigma bound (two-sided)', b.sigmaBound === null ? 'n/a' : formatNumber(b.sigmaBound, 2)],
  ];
  return htmlTable({
    id: 'bayes-factor-table',
    className: 'key-value',
    head: [['quantity', 'value']],
    rows: rows.map(([k, v]) => [k, /^[-0-9.]/.test(v) ? numberCell(v) : v]),
  });
}
