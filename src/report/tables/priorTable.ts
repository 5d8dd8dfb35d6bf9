import type { PriorDescription } from '../../priors/parameterSpace.js';
import { escapeMarkup } from '../text/escapeMarkup.js';
import { htmlTable, type TableCell } from './htmlTable.js';
import { parameterLabel } from '../text/parameterLabel.js';
import type { ComparisonSummary } from '../../records/comparisonSummary.js';

/** A prior in interval notation, e.g. `uniform on [0.9, 1.3]`, `normal(0, 0.1) on [-1, 1]`. */
export function priorText(p: PriorDescription): string {
  // 12 significant digits hide the rounding of derived bounds (0.92 - 0.3 = 0.6200000000000001).
  const tidy = (v: number | null): string | null => (v === null ? null : String(+v.toPrecision(12)));
  const range = `[${tidy(p.lower) ?? '-inf'}, ${tidy(p.upper) ?? 'inf'}]`;
  switch (p.kind) {
    case 'uniform': return `uniform on ${range}`;
    case 'logUniform': return `uniform in log on ${range}`;
    case 'periodic': return `uniform, periodic on [${tidy(p.lower)}, ${tidy(p.upper)})`;
    case 'normal': return `normal(mean ${p.mean}, sd ${p.sigma})`;
    case 'truncatedNormal': return `normal(mean ${p.mean}, sd ${p.sigma}) cut to ${range}`;
    case 'fixed': return `held at ${p.value}`;
    default: return `${p.kind} on ${range}`;
  }
}

/** One model's column in a prior table. */
export interface PriorColumn {
  readonly label: string;
  readonly priors: readonly PriorDescription[];
  /** Region priors on perturber positions (perturber key -> region), shown in place of the boxes they replace. */
  readonly regions?: ReadonlyMap<string, string>;
}

/**
 * Every prior behind the two evidences, side by side: a Bayes factor means nothing without them.
 * Free parameters first, then the held ones; the amplitude prior last.
 */
export function priorTable(summary: ComparisonSummary): string {
  return priorColumnsTable(
    [
      { label: 'smooth model', priors: summary.priors.smooth },
      { label: 'perturbed model', priors: summary.priors.perturbed, regions: new Map((summary.positionPriors ?? []).map((r) => [r.key, r.region])) },
    ],
    summary.amplitudePrior,
  );
}

/**
 * The priors of one or more models, one column each (each column's region priors on perturber
 * positions shown in place of the boxes they replace); free parameters first, then the held
 * ones, the amplitude prior last.
 */
export function priorColumnsTable(models: readonly PriorColumn[], amplitudePrior: string): string {
  const maps = models.map((m) => new Map(m.priors.map((p) => [p.name, p])));
  const names = [...new Set([...maps].reverse().flatMap((m) => [...m.keys()]))];
  const find = (name: string): PriorDescription => [...maps].reverse().map((m) => m.get(name)).find((p) => p !== undefined)!;
  const isFree = (name: string): boolean => !find(name).fixed;
  const ordered = [...names.filter(isFree), ...names.filter((n) => !isFree(n))];
  const cell = (p: PriorDescription | undefined): string => (p === undefined ? '<span class="absent">not in this model</span>' : escapeMarkup(priorText(p)));
  const replaced = (name: string, column: PriorColumn): string | undefined => {
    const match = /^(.*)\.center[XY]Arcsec$/.exec(name);
    return match === null ? undefined : column.regions?.get(match[1]);
  };
  const rows: (string | TableCell)[][] = ordered.map((name) => {
    const label = parameterLabel(name, '');
    const p = find(name);
    const cells = maps.map((m, k) => {
      const region = replaced(name, models[k]);
      return region !== undefined && m.get(name) !== undefined
        ? `position ${escapeMarkup(region)} <span class="muted">(replaces the box ${escapeMarkup(priorText(m.get(name)!))})</span>`
        : cell(m.get(name));
    });
    return [
      `<span class="component">${escapeMarkup(label.component)}</span> ${escapeMarkup(label.quantity)}`,
      p.fixed ? '<span class="tag held">held</span>' : '<span class="tag free">free</span>',
      ...cells,
    ];
  });
  rows.push(['every linear light amplitude', '<span class="tag free">marginalised</span>', { html: escapeMarkup(amplitudePrior), columns: models.length }]);
  return htmlTable({ id: 'prior-table', head: [['parameter', '', ...models.map((m) => escapeMarkup(m.label))]], rows });
}
