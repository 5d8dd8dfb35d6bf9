import type { ComparisonSummary } from '../inference/runComparisonToFolder.js';
import type { ModelRecord } from '../inference/writeModelOutputs.js';
import { escapeMarkup } from './escapeMarkup.js';
import { digitsForSpread, formatNumber } from './formatNumber.js';
import { htmlTable, numberCell, type TableCell } from './htmlTable.js';
import { parameterLabel } from './parameterLabel.js';
import { summaryCells } from './perturberTable.js';
import { MODEL_NAMES, type TruthRecord } from './readRunFolder.js';

type ParameterRecord = ModelRecord['parameters'][number];

/** Where the true value falls: inside the 68% interval, inside the 95% one, or outside both. */
function truthPlace(p: ParameterRecord, value: number): TableCell {
  if (value >= p.interval68[0] && value <= p.interval68[1]) return { html: '68%', className: 'place in68' };
  if (value >= p.interval95[0] && value <= p.interval95[1]) return { html: '95%', className: 'place in95' };
  return { html: 'out', className: 'place out' };
}

/** Every free parameter of either model: median, 68% and 95% intervals per model, and the truth when known. */
export function parameterTable(summary: ComparisonSummary, truth: TruthRecord | null): string {
  const byModel = MODEL_NAMES.map((m) => new Map(summary.models[m].parameters.map((p) => [p.name, p])));
  const names = [...new Set([...summary.models.perturbed.parameters, ...summary.models.smooth.parameters].map((p) => p.name))];
  const rows = names.map((name) => {
    const records = byModel.map((m) => m.get(name));
    const any = (records[1] ?? records[0])!;
    const label = parameterLabel(name, any.unit);
    const digits = digitsForSpread(Math.min(...records.filter((r) => r !== undefined).map((r) => 0.5 * (r!.interval68[1] - r!.interval68[0]))));
    const t = truth?.parameters.find((p) => p.name === name)?.value;
    const cells: (string | TableCell)[] = [
      `<span class="component">${escapeMarkup(label.component)}</span> ${escapeMarkup(label.quantity)}`,
      escapeMarkup(label.unit),
    ];
    if (truth !== null) cells.push(numberCell(t === undefined ? '' : formatNumber(t, digits)));
    records.forEach((r) => {
      if (r === undefined) {
        cells.push({ html: '<span class="absent">not in this model</span>', columns: truth === null ? 3 : 4 });
        return;
      }
      cells.push(...summaryCells({
        median: r.median,
        interval68: { lower: r.interval68[0], upper: r.interval68[1] },
        interval95: { lower: r.interval95[0], upper: r.interval95[1] },
      }, digits));
      if (truth !== null) cells.push(t === undefined ? '' : truthPlace(r, t));
    });
    return cells;
  });
  const perModel = (m: string): TableCell => ({ html: `<span class="swatch ${m}"></span>${m} model`, columns: truth === null ? 3 : 4, className: `group ${m}` });
  const sub = [numberCell('median'), numberCell('68%'), numberCell('95%'), ...(truth === null ? [] : ['truth in'])];
  return htmlTable({
    id: 'parameter-table',
    head: [
      [{ html: '', columns: truth === null ? 2 : 3 }, perModel('smooth'), perModel('perturbed')],
      ['parameter', 'unit', ...(truth === null ? [] : [numberCell('truth')]), ...sub, ...sub],
    ],
    rows,
  });
}
