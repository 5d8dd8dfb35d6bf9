import { formatNumber } from '../text/formatNumber.js';
import { htmlTable, numberCell } from './htmlTable.js';
import { MODEL_NAMES } from '../runFolder/readRunFolder.js';
import type { ComparisonSummary } from '../../records/comparisonSummary.js';

/** Digits of every ln Z and ln B in the report. */
export const LN_EVIDENCE_DIGITS = 2;

/**
 * The evidence of each model: ln Z with its error estimated from the information (Skilling 2006)
 * and from simulated prior volumes, the information H, the best ln L and the free parameters.
 */
export function evidenceTable(summary: ComparisonSummary): string {
  const rows = MODEL_NAMES.map((name) => {
    const m = summary.models[name];
    return [
      `<span class="swatch ${name}"></span>${name}`,
      numberCell(formatNumber(m.lnEvidence, LN_EVIDENCE_DIGITS)),
      numberCell(formatNumber(m.lnEvidenceError, LN_EVIDENCE_DIGITS)),
      numberCell(formatNumber(m.lnEvidenceErrorSimulated, LN_EVIDENCE_DIGITS)),
      numberCell(formatNumber(m.informationNats, 2)),
      numberCell(formatNumber(m.bestLnLikelihood, 2)),
      numberCell(String(m.parameters.length)),
    ];
  });
  return htmlTable({
    id: 'evidence-table',
    head: [[
      'model', numberCell('ln Z'), numberCell('&plusmn; (from H)'), numberCell('&plusmn; (simulated)'),
      numberCell('information H [nats]'), numberCell('best ln L'), numberCell('free parameters'),
    ]],
    rows,
  });
}
