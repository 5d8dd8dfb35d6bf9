import { formatNumber } from '../text/formatNumber.js';
import { htmlTable, numberCell } from './htmlTable.js';
import { MODEL_NAMES } from '../runFolder/readRunFolder.js';
import type { ComparisonSummary } from '../../records/comparisonSummary.js';

/** Digits of every ln Z and ln B in the report. */
export const LN_EVIDENCE_DIGITS = 2;

/** True when some model's ln Z comes from importance sampling after the nested run. */
export function usesImportanceEvidence(summary: ComparisonSummary): boolean {
  return MODEL_NAMES.some((name) => summary.models[name].evidence?.method === 'importance');
}

/**
 * The evidence of each model: ln Z with its error, the information H, the best ln L and the free
 * parameters. For the nested sum the errors are from the information (Skilling 2006) and from
 * simulated prior volumes; for importance-sampled evidence, the error from the weights and, beside
 * it, the nested sum with its simulated error (which does not apply to the ln Z shown).
 */
export function evidenceTable(summary: ComparisonSummary): string {
  const importance = usesImportanceEvidence(summary);
  const rows = MODEL_NAMES.map((name) => {
    const m = summary.models[name];
    const nested = m.evidence?.method === 'importance' ? m.evidence : undefined;
    const errors = importance
      ? [
        numberCell(nested === undefined ? `${formatNumber(m.lnEvidence, LN_EVIDENCE_DIGITS)} (same)` : formatNumber(nested.nestedLnEvidence, LN_EVIDENCE_DIGITS)),
        numberCell(formatNumber(m.lnEvidenceErrorSimulated, LN_EVIDENCE_DIGITS)),
      ]
      : [numberCell(formatNumber(m.lnEvidenceErrorSimulated, LN_EVIDENCE_DIGITS))];
    return [
      `<span class="swatch ${name}"></span>${name}`,
      numberCell(formatNumber(m.lnEvidence, LN_EVIDENCE_DIGITS)),
      numberCell(formatNumber(m.lnEvidenceError, LN_EVIDENCE_DIGITS)),
      ...errors,
      numberCell(formatNumber(m.informationNats, 2)),
      numberCell(formatNumber(m.bestLnLikelihood, 2)),
      numberCell(String(m.parameters.length)),
    ];
  });
  return htmlTable({
    id: 'evidence-table',
    head: [[
      'model', numberCell('ln Z'),
      ...(importance
        ? [numberCell('&plusmn; (importance weights)'), numberCell('nested sum'), numberCell('&plusmn; nested (simulated)')]
        : [numberCell('&plusmn; (from H)'), numberCell('&plusmn; (simulated)')]),
      numberCell('information H [nats]'), numberCell('best ln L'), numberCell('free parameters'),
    ]],
    rows,
  });
}
