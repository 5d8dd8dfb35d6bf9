import { escapeMarkup } from '../text/escapeMarkup.js';
import { digitsForSpread, formatNumber } from '../text/formatNumber.js';
import { htmlTable, numberCell, type TableCell } from './htmlTable.js';
import { parameterLabel } from '../text/parameterLabel.js';
import { summaryCells } from './perturberTable.js';
import { MODEL_NAMES, type TruthRecord } from '../runFolder/readRunFolder.js';
import type { ComparisonSummary } from '../../records/comparisonSummary.js';
import type { ModelRecord } from '../../records/modelRecord.js';

type ParameterRecord = ModelRecord['parameters'][number];

/** Where the true value falls: inside the 68% interval, inside the 95% one, or outside both. */
function truthPlace(p: ParameterRecord, value: number): TableCell {
  if (value >= p.interval68[0] && value <= p.interval68[1]) return { html: '68%', className: 'place in68' };
  if (value >= p.interval95[0] && value <= p.interval95[1]) return { html: '95%', className: 'place in95' };
  return { html: 'out', className: 'place out' };
}

/** One model's column group in a parameter table: `tone` names its swatch class (smooth, perturbed). */
export interface ParameterColumn {
  readonly tone: string;
  readonly label: string;
  readonly parameters: readonly ParameterRecord[];
}

/** Every free parameter of the comparison's two models: median, 68% and 95% intervals per model, and the truth when known. */
export function parameterTable(summary: ComparisonSummary, truth: TruthRecord | null): string {
  return parameterColumnsTable(MODEL_NAMES.map((m) => ({ tone: m, label: `${m} model`, parameters: summary.models[m].parameters })), truth);
}

/** Every free parameter of any of the models, one column group per model, the truth when known. */
export function parameterColumnsTable(models: readonly ParameterColumn[], truth: TruthRecord | null): string {
  const byModel = models.map((m) => new Map(m.parameters.map((p) => [p.name, p])));
  const names = [...new Set([...models].reverse().flatMap((m) => m.parameters).map((p) => p.name))];
  const rows = names.map((name) => {
    const records = byModel.map((m) => m.get(name));
    const any = [...records].reverse().find((r) => r !== undefined)!;
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
  const perModel = (m: ParameterColumn): TableCell => ({ html: `<span class="swatch ${m.tone}"></span>${escapeMarkup(m.label)}`, columns: truth === null ? 3 : 4, className: `group ${m.tone}` });
  const sub = [numberCell('median'), numberCell('68%'), numberCell('95%'), ...(truth === null ? [] : ['truth in'])];
  return htmlTable({
    id: 'parameter-table',
    head: [
      [{ html: '', columns: truth === null ? 2 : 3 }, ...models.map(perModel)],
      ['parameter', 'unit', ...(truth === null ? [] : [numberCell('truth')]), ...models.flatMap(() => sub)],
    ],
    rows,
  });
}
