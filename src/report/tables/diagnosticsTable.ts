import { escapeMarkup } from '../text/escapeMarkup.js';
import { formatCount, formatNumber } from '../text/formatNumber.js';
import { rejectionWords } from '../text/rejectionWords.js';
import { htmlTable, numberCell, type TableCell } from './htmlTable.js';
import type { ComparisonSummary } from '../../records/comparisonSummary.js';
import type { ModelRecord } from '../../records/modelRecord.js';

/** The nested sampler's own record of each run: settings, cost, efficiency and the insertion-rank check. */
export function diagnosticsTable(summary: ComparisonSummary): string {
  return nestedDiagnosticsTable([
    { tone: 'smooth', label: 'smooth', record: summary.models.smooth },
    { tone: 'perturbed', label: 'perturbed', record: summary.models.perturbed },
  ]);
}

/** The nested sampler's record of one or more runs, a column each (`tone` names the swatch class). */
export function nestedDiagnosticsTable(runs: readonly { readonly tone: string; readonly label: string; readonly record: ModelRecord }[]): string {
  const row = (label: string, cell: (m: ModelRecord) => string | TableCell): (string | TableCell)[] => [label, ...runs.map((r) => cell(r.record))];
  const rank = (m: ModelRecord): TableCell => ({
    html: `${m.insertionRankPValue === null ? 'n/a' : formatNumber(m.insertionRankPValue, 3)}${m.insertionRankWarning ? ' <span class="tag warn">biased draws?</span>' : ''}`,
    className: m.insertionRankWarning ? 'num warn' : 'num',
  });
  const evidence = (m: ModelRecord): string => {
    const e = m.evidence;
    if (e === undefined || e.method === 'nested') return 'nested-sampling sum';
    return `importance sampling (nested sum ${formatNumber(e.nestedLnEvidence, 2)} &plusmn; ${formatNumber(e.nestedLnEvidenceError, 2)})`;
  };
  const importance = (m: ModelRecord): string | TableCell => {
    const i = m.evidence?.importance;
    if (i === undefined || i === null) return 'n/a';
    const warn = i.suspect ? ' <span class="tag warn">weights too uneven?</span>' : '';
    return {
      html: `${formatCount(Math.round(i.effectiveSampleSize))} of ${formatCount(i.finalDraws)} draws; k&#770; ${formatNumber(i.paretoShape, 2)} (limit ${formatNumber(i.paretoShapeLimit, 2)})${warn}`,
      className: i.suspect ? 'num warn' : 'num',
    };
  };
  return htmlTable({
    id: 'diagnostics-table',
    head: [['', ...runs.map((r) => `<span class="swatch ${r.tone}"></span>${escapeMarkup(r.label)}`)]],
    rows: [
      row('draw method', (m) => escapeMarkup(m.method)),
      row('live points', (m) => numberCell(formatCount(m.livePoints))),
      row('iterations', (m) => numberCell(formatCount(m.iterations))),
      row('likelihood evaluations', (m) => numberCell(formatCount(m.evaluations))),
      row('efficiency (accepted / evaluated)', (m) => numberCell(`${formatNumber(100 * m.efficiency, 2)}%`)),
      row('insertion-rank p-value (Fowlie, Handley &amp; Su 2020)', rank),
      row('ln Z from', (m) => evidence(m)),
      row('importance draws: effective size; Pareto k&#770; (Vehtari et al. 2024)', importance),
      row('non-finite likelihoods', (m) => numberCell(formatCount(m.nonFiniteLikelihoods))),
      ...(runs.some((r) => r.record.likelihoodRejections !== undefined)
        ? [
          row('pixelated source: likelihood calls rejected, by reason', (m) => m.likelihoodRejections === undefined ? 'n/a' : escapeMarkup(rejectionWords(m.likelihoodRejections))),
          row('pixelated source: rays weighed by their triangle (degenerate natural-neighbour ring)', (m) => m.likelihoodRejections?.triangleFallbacks === undefined ? 'n/a' : numberCell(formatCount(m.likelihoodRejections.triangleFallbacks))),
        ]
        : []),
      row('stopped because', (m) => escapeMarkup(m.stopReason)),
      row('wall time [s]', (m) => numberCell(formatNumber(m.seconds, 1))),
      row('threads', (m) => numberCell(String(m.threads))),
    ],
  });
}
