import type { VerdictSummary } from '../records/verdictSummary.js';
import { formatPriors } from './formatComparison.js';

const fixed = (v: number | null, digits = 2): string => (v === null || !Number.isFinite(v) ? '-' : v.toFixed(digits));
const pValue = (p: number): string => (p < 0.001 ? p.toExponential(0) : p.toFixed(3));

/**
 * The plain-text robust verdict: one row per family (ln Z of both models, ln B with its error,
 * the smooth chi^2 per degree of freedom and both misfit tests), the family the smooth data
 * prefer, the least favourable ln B among the acceptable families, the verdict and why, the
 * families not tried, each family's components, and the priors (the perturber's in full, which
 * every family shares; the rest per family in verdict.json and the report).
 */
export function formatVerdict(summary: VerdictSummary): string {
  const v = summary.verdict;
  const header = ['family', 'ln Z smooth', 'ln Z perturbed', 'ln B', 'smooth chi2/dof', 'smooth misfit p', 'perturbed misfit p', 'acceptable'];
  const rows = summary.families.map((f) => [
    f.name,
    `${fixed(f.smooth.lnEvidence)} +- ${fixed(f.smooth.lnEvidenceError)}`,
    `${fixed(f.perturbed.lnEvidence)} +- ${fixed(f.perturbed.lnEvidenceError)}`,
    `${fixed(f.lnBayesFactor)} +- ${fixed(f.lnBayesFactorError)}`,
    fixed(f.smooth.misfit.chiSquarePerDegreeOfFreedom, 3),
    `${pValue(f.smooth.misfit.pValue)}${f.smooth.misfit.alarm ? ' MISFIT' : ''}`,
    `${pValue(f.perturbed.misfit.pValue)}${f.perturbed.misfit.alarm ? ' MISFIT' : ''}`,
    f.acceptable ? 'yes' : 'no',
  ]);
  const table = [header, ...rows];
  const widths = header.map((_, c) => Math.max(...table.map((line) => line[c].length)));
  const least = v.leastFavourable;
  const lines = [
    `Robust verdict over ${summary.families.length} smooth-model families (ln B = ln Z perturbed - ln Z smooth within each family)`,
    '',
    ...table.map((line) => `  ${line.map((text, c) => text.padEnd(widths[c])).join('  ').trimEnd()}`),
    '',
    `  preferred by the data without a perturber: ${v.preferredFamily} (highest smooth ln Z)`,
    `  least favourable ln B among the acceptable families (smooth model passes the misfit test): ` +
      (least === null ? 'none (no family is acceptable)' : `${fixed(least.lnBayesFactor)} +- ${fixed(least.lnBayesFactorError)} (${least.family})`),
    `  detection threshold: ${v.thresholdSource}`,
    `  misfit test: Moran's I of each best fit's normalised residuals, one-sided permutation p, alarm at p <= ${summary.families[0]?.smooth.misfit.falseAlarmRate}` +
      ' (chi2/dof with nominal degrees of freedom: pixels - sampled parameters - linear amplitudes)',
    '',
    `Verdict: ${verdictLine(v.sentence)}.`,
    ...v.reasons.map((r) => `  ${r}`),
    '',
    `Not tried (the verdict says nothing of these): ${v.suggestions.join('; ')}.`,
    '',
    'Families (components of the smooth model; every family adds the same perturber):',
    ...summary.families.flatMap((f) => [
      `  ${f.name} [${f.key}${f.replaces.length === 0 ? ', the base config' : `, replaces ${f.replaces.join(', ')}`}] -> ${f.folder}`,
      `    lens: ${f.components.lens}`,
      `    source: ${f.components.source}`,
      `    free parameters: ${f.priors.smooth.filter((p) => !p.fixed).length} smooth, ${f.priors.perturbed.filter((p) => !p.fixed).length} perturbed; within-family claim: ${f.claim.claim}`,
    ]),
    '',
    'Priors of the perturber (the same in every family; each family\'s other priors: verdict.json families[k].priors and the report):',
    ...formatPriors(perturberPriors(summary)),
    ...(summary.families[0]?.positionPriors ?? []).map((p) => `    ${p.key} position: ${p.region} (instead of the box above)`),
    `    amplitudes: ${summary.amplitudePrior}`,
    '',
    `Limits: ${summary.limits}`,
    `Caution: ${summary.caution}`,
  ];
  return lines.join('\n');
}

/** The priors of the perturbed models' perturber parameters (those the smooth models lack), from the first family. */
function perturberPriors(summary: VerdictSummary): VerdictSummary['families'][number]['priors']['perturbed'] {
  const first = summary.families[0];
  if (first === undefined) return [];
  const smooth = new Set(first.priors.smooth.map((p) => p.name));
  return first.priors.perturbed.filter((p) => !smooth.has(p.name));
}

/** The verdict's sentence with its leading claim in capitals: "NOT CONFIRMED: in family ...". */
function verdictLine(sentence: string): string {
  const colon = sentence.indexOf(':');
  return colon < 0 ? sentence : `${sentence.slice(0, colon).toUpperCase()}${sentence.slice(colon)}`;
}
