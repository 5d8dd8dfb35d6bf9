import type { ComparisonSummary } from '../inference/runComparisonToFolder.js';
import type { PriorDescription } from '../sampling/parameterSpace.js';
import { escapeMarkup } from './escapeMarkup.js';
import { htmlTable, type TableCell } from './htmlTable.js';
import { parameterLabel } from './parameterLabel.js';

/** A prior in interval notation, e.g. `uniform on [0.9, 1.3]`, `normal(0, 0.1) on [-1, 1]`. */
export function priorText(p: PriorDescription): string {
  const range = `[${p.lower ?? '-inf'}, ${p.upper ?? 'inf'}]`;
  switch (p.kind) {
    case 'uniform': return `uniform on ${range}`;
    case 'logUniform': return `uniform in log on ${range}`;
    case 'periodic': return `uniform, periodic on [${p.lower}, ${p.upper})`;
    case 'normal': return `normal(mean ${p.mean}, sd ${p.sigma})`;
    case 'truncatedNormal': return `normal(mean ${p.mean}, sd ${p.sigma}) cut to ${range}`;
    case 'fixed': return `held at ${p.value}`;
    default: return `${p.kind} on ${range}`;
  }
}

/**
 * Every prior behind the two evidences, side by side: a Bayes factor means nothing without them.
 * Free parameters first, then the held ones; the amplitude prior last.
 */
export function priorTable(summary: ComparisonSummary): string {
  const smooth = new Map(summary.priors.smooth.map((p) => [p.name, p]));
  const perturbed = new Map(summary.priors.perturbed.map((p) => [p.name, p]));
  const names = [...new Set([...perturbed.keys(), ...smooth.keys()])];
  const isFree = (name: string): boolean => !(perturbed.get(name) ?? smooth.get(name))!.fixed;
  const ordered = [...names.filter(isFree), ...names.filter((n) => !isFree(n))];
  const cell = (p: PriorDescription | undefined): string => (p === undefined ? '<span class="absent">not in this model</span>' : escapeMarkup(priorText(p)));
  // Region priors on perturber positions (summaries written before they existed have none).
  const regions = new Map((summary.positionPriors ?? []).map((r) => [r.key, r.region]));
  const replaced = (name: string): string | undefined => {
    const match = /^(.*)\.center[XY]Arcsec$/.exec(name);
    return match === null ? undefined : regions.get(match[1]);
  };
  const rows: (string | TableCell)[][] = ordered.map((name) => {
    const label = parameterLabel(name, '');
    const p = perturbed.get(name) ?? smooth.get(name)!;
    const region = replaced(name);
    return [
      `<span class="component">${escapeMarkup(label.component)}</span> ${escapeMarkup(label.quantity)}`,
      p.fixed ? '<span class="tag held">held</span>' : '<span class="tag free">free</span>',
      cell(smooth.get(name)),
      region === undefined ? cell(perturbed.get(name)) : `position ${escapeMarkup(region)} <span class="muted">(replaces the box ${escapeMarkup(priorText(perturbed.get(name)!))})</span>`,
    ];
  });
  rows.push(['every linear light amplitude', '<span class="tag free">marginalised</span>', { html: escapeMarkup(summary.amplitudePrior), columns: 2 }]);
  return htmlTable({ id: 'prior-table', head: [['parameter', '', 'smooth model', 'perturbed model']], rows });
}
