import { rejectionLines } from './formatRejections.js';
import type { PriorDescription } from '../priors/parameterSpace.js';
import { formatSky } from './formatSky.js';
import { formatMisfit, misfitNote } from './formatMisfit.js';
import { cosmologyText } from '../report/text/cosmologyText.js';
import type { ComparisonSummary } from '../records/comparisonSummary.js';
import type { CountComparisonSummary } from '../records/countComparisonSummary.js';

const fixed = (v: number, digits = 2): string => (Number.isFinite(v) ? v.toFixed(digits) : String(v));

/** A prior bound as written: 12 significant digits hide the rounding of derived bounds (0.92 - 0.3). */
const bound = (v: number | null | undefined): string => (typeof v === 'number' ? String(+v.toPrecision(12)) : String(v));

function describePrior(prior: PriorDescription): string {
  const p = { ...prior, lower: bound(prior.lower), upper: bound(prior.upper) };
  switch (p.kind) {
    case 'uniform': return `uniform [${p.lower}, ${p.upper}]`;
    case 'logUniform': return `log-uniform [${p.lower}, ${p.upper}]`;
    case 'periodic': return `periodic [${p.lower}, ${p.upper})`;
    case 'normal': return `normal (mean ${p.mean}, sigma ${p.sigma})`;
    case 'truncatedNormal': return `normal (mean ${p.mean}, sigma ${p.sigma}) on [${p.lower}, ${p.upper}]`;
    default: return `fixed at ${p.value}`;
  }
}

/** The priors as text lines, free parameters first. */
export function formatPriors(priors: readonly PriorDescription[]): string[] {
  const free = priors.filter((p) => !p.fixed).map((p) => `    ${p.name}: ${describePrior(p)}`);
  const held = priors.filter((p) => p.fixed);
  if (held.length === 0) return [...free, '    held fixed: none'];
  // One line per component, e.g. "lens.mass[0]: einsteinRadiusArcsec=1.1, axisRatio=0.8".
  const byComponent = new Map<string, string[]>();
  for (const p of held) {
    const cut = p.name.lastIndexOf('.');
    const component = cut < 0 ? '' : p.name.slice(0, cut);
    byComponent.set(component, [...(byComponent.get(component) ?? []), `${p.name.slice(cut + 1)}=${p.value}`]);
  }
  return [...free, '    held fixed:', ...[...byComponent].map(([component, values]) => `      ${component === '' ? '' : `${component}: `}${values.join(', ')}`)];
}

/** The plain-text verdict of a comparison, as printed at the end of `compare` and `demo`. */
export function formatComparison(summary: ComparisonSummary): string {
  const { smooth, perturbed } = summary.models;
  const b = summary.bayesFactor;
  const lines: string[] = [];
  lines.push('Evidence');
  lines.push(`  smooth model     ln Z = ${fixed(smooth.lnEvidence)} +- ${fixed(smooth.lnEvidenceError)}   (${smooth.evaluations} likelihood evaluations, ${fixed(smooth.seconds, 0)} s)`);
  lines.push(`  perturbed model  ln Z = ${fixed(perturbed.lnEvidence)} +- ${fixed(perturbed.lnEvidenceError)}   (${perturbed.evaluations} likelihood evaluations, ${fixed(perturbed.seconds, 0)} s)`);
  lines.push(...rejectionLines(smooth.likelihoodRejections, smooth.evaluations, 'smooth'));
  lines.push(...rejectionLines(perturbed.likelihoodRejections, perturbed.evaluations, 'perturbed'));
  lines.push(`  ln Bayes factor (perturbed / smooth) = ${fixed(b.lnBayesFactor)} +- ${fixed(b.lnBayesFactorError)}`);
  lines.push(`  reading (Kass & Raftery 1995): ${b.reading}`);
  lines.push(`  frequentist bound (Sellke, Bayarri & Berger 2001): ${b.significance}`);
  lines.push('', 'Misfit of each best fit');
  lines.push(`  ${formatMisfit('smooth model   ', smooth.misfit)}`);
  lines.push(`  ${formatMisfit('perturbed model', perturbed.misfit)}`);
  if (smooth.misfit !== undefined) lines.push(`  (${misfitNote(smooth.misfit)})`);
  if (summary.detection !== undefined) {
    lines.push('', `Detection: ${summary.detection.sentence}`);
    lines.push(`  threshold: ${summary.detection.thresholdSource}`);
  }
  for (const [label, record] of [['smooth', smooth], ['perturbed', perturbed]] as const) {
    if (record.insertionRankWarning) {
      lines.push(`  warning: the insertion-rank check of the ${label} run gives p = ${record.insertionRankPValue.toExponential(1)}: its constrained draws may be biased, so its ln Z is suspect (Fowlie, Handley & Su 2020)`);
    }
  }
  lines.push('');
  for (const p of summary.perturbers) {
    const m = p.log10Mass;
    const massName = p.kind === 'nfw' || p.kind === 'truncatedNfw' ? 'log10 M200/Msun' : 'log10 M/Msun';
    lines.push(`Perturber ${p.key} (${p.kind})`);
    lines.push(`  ${massName}: median ${fixed(m.median)}, 68% [${fixed(m.interval68.lower)}, ${fixed(m.interval68.upper)}], 95% [${fixed(m.interval95.lower)}, ${fixed(m.interval95.upper)}]`);
    if (p.log10TotalMass !== null && p.kind === 'truncatedNfw') {
      const t = p.log10TotalMass;
      lines.push(`  log10 total (truncated) mass/Msun: median ${fixed(t.median)}, 95% [${fixed(t.interval95.lower)}, ${fixed(t.interval95.upper)}]`);
    }
    lines.push(`  x: ${fixed(p.centerXArcsec.median, 3)}" (68% ${fixed(p.centerXArcsec.interval68.lower, 3)} to ${fixed(p.centerXArcsec.interval68.upper, 3)}), y: ${fixed(p.centerYArcsec.median, 3)}" (68% ${fixed(p.centerYArcsec.interval68.lower, 3)} to ${fixed(p.centerYArcsec.interval68.upper, 3)})`);
    if (p.sky !== undefined) lines.push(`  sky: ${formatSky(p.sky)}`);
    if (!b.perturberFavoured) {
      lines.push(`  the evidence does not favour a perturber (ln B <= ${b.favouredAbove}): 95% upper limit ${massName} < ${fixed(p.log10MassUpperLimit95)}`);
    }
  }
  lines.push('');
  lines.push('Priors behind this Bayes factor (perturbed model; the smooth model has the same without the perturber):');
  lines.push(...formatPriors(summary.priors.perturbed));
  for (const p of summary.positionPriors ?? []) lines.push(`    ${p.key} position: ${p.region} (instead of the box above)`);
  lines.push(`    amplitudes: ${summary.amplitudePrior}`);
  lines.push(`Cosmology (distances, Sigma_crit, M200): ${cosmologyText(summary.cosmology)}`);
  lines.push('');
  lines.push(`Caution: ${summary.caution}`);
  return lines.join('\n');
}

/** The plain-text table of a perturber-count comparison. */
export function formatCountComparison(summary: CountComparisonSummary): string {
  const lines = ['How many perturbers (nested sampling of each count)', '  count   ln Z              ln B vs count - 1   reading'];
  for (const row of summary.rows) {
    const lnB = row.lnBayesFactorToPrevious === null ? '' : fixed(row.lnBayesFactorToPrevious);
    lines.push(`  ${String(row.perturbers).padStart(5)}   ${`${fixed(row.lnEvidence)} +- ${fixed(row.lnEvidenceError)}`.padEnd(16)}  ${lnB.padStart(17)}   ${row.reading}`);
  }
  lines.push(`  preferred: ${summary.preferredCount} perturber(s), the count of highest evidence`);
  if (summary.detection !== undefined) {
    lines.push(`  detection: ${summary.detection.sentence}`);
    lines.push(`  threshold: ${summary.detection.thresholdSource}`);
  }
  lines.push(`  ${formatMisfit('no perturber ', summary.models[0]?.misfit)}`);
  lines.push(`  label switching: ${summary.labelSwitching}`);
  for (const p of summary.perturbers) {
    const m = p.log10Mass;
    lines.push(`  ${p.key}: log10 mass ${fixed(m.median)} (95% ${fixed(m.interval95.lower)} to ${fixed(m.interval95.upper)}), x ${fixed(p.centerXArcsec.median, 3)}", y ${fixed(p.centerYArcsec.median, 3)}"`);
    if (p.sky !== undefined) lines.push(`    sky: ${formatSky(p.sky)}`);
  }
  lines.push('', 'Priors (largest model):', ...formatPriors(summary.priors), '', `Caution: ${summary.caution}`);
  return lines.join('\n');
}
