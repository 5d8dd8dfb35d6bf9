import { thresholdSource } from '../results/detectionClaim.js';
import type { RobustVerdict } from '../records/verdictSummary.js';

/** What the rule reads of one family's comparison. */
export interface FamilyOutcome {
  readonly name: string;
  /** ln Z_perturbed - ln Z_smooth within the family, and its error. */
  readonly lnBayesFactor: number;
  readonly lnBayesFactorError: number;
  readonly smoothLnEvidence: number;
  /** The misfit alarms of the family's smooth and perturbed best fits. */
  readonly smoothMisfit: boolean;
  readonly perturbedMisfit: boolean;
  /** True when both of the family's runs stopped because they converged. */
  readonly converged: boolean;
}

/** The rule, in the words README uses; written into every verdict.json. */
export const VERDICT_RULE =
  'A family is acceptable when its smooth model passes the misfit test: only then does its ln B weigh the perturber against a ' +
  'smooth model that describes the data (a family whose smooth model misfits is reported and set aside: its ln B only says ' +
  'which of two wrong models is less wrong). Confirmed: at least one family is acceptable and in every acceptable family ln B ' +
  'exceeds the detection threshold, the perturbed model passes the misfit test and both runs converged. Not confirmed: some ' +
  'acceptable family fails one of these; the verdict names it (the least favourable ln B first). Not evidence: no family is ' +
  'acceptable, so no ln B is evidence of a subhalo; the verdict says which families to add.';

/** What the verdict does not guarantee; written into every verdict.json and the report. */
export const VERDICT_LIMITS =
  'The verdict holds for the families tried, with their priors: a smooth freedom none of them has (listed as not tried) can ' +
  'still remove the need for the perturber, and a different mass or position prior changes every ln B. The misfit test ' +
  'assumes independent pixel noise and finds structure it is sensitive to (neighbouring residuals alike), not every misfit. ' +
  'A confirmed perturber is needed by the data under these models, not shown to be a dark-matter subhalo rather than another ' +
  'compact mass (a satellite galaxy, a line-of-sight halo).';

const fixed = (v: number, digits = 1): string => v.toFixed(digits);
const quoted = (name: string): string => `"${name}"`;

/**
 * The robust verdict of several smooth-model families (arcsift's own rule, VERDICT_RULE, stated
 * in README): the perturber is claimed only when it is needed under every family whose smooth
 * model fits the data. `suggestions` are the families to add (familySuggestions.ts), cited in the
 * sentence when no family fits.
 */
export function robustVerdict(families: readonly FamilyOutcome[], thresholdLnB: number, suggestions: readonly string[]): RobustVerdict {
  if (families.length === 0) throw new RangeError('robustVerdict: no families');
  const preferred = families.reduce((best, f) => (f.smoothLnEvidence > best.smoothLnEvidence ? f : best));
  const acceptable = families.filter((f) => !f.smoothMisfit);
  const setAside = families.filter((f) => f.smoothMisfit);
  const reasons: string[] = [];
  const others = families.filter((f) => f !== preferred).map((f) => f.smoothLnEvidence);
  const margin = others.length === 0 ? '' : `, ${fixed(preferred.smoothLnEvidence - Math.max(...others))} above the next`;
  reasons.push(`Without a perturber the data prefer family ${quoted(preferred.name)} (highest smooth ln Z${margin})` +
    (preferred.smoothMisfit ? ', but its smooth model fails the misfit test.' : '.'));
  if (setAside.length > 0) {
    reasons.push(`Set aside, their smooth model failing the misfit test (ln B not evidence): ${setAside.map((f) => `${quoted(f.name)} (ln B ${fixed(f.lnBayesFactor)})`).join(', ')}.`);
  }
  const unconverged = families.filter((f) => !f.converged);
  if (unconverged.length > 0) reasons.push(`Runs that stopped before converging (ln Z not final; resume them): ${unconverged.map((f) => quoted(f.name)).join(', ')}.`);
  const base = { thresholdLnB, thresholdSource: thresholdSource(thresholdLnB), acceptableFamilies: acceptable.map((f) => f.name), preferredFamily: preferred.name, suggestions };

  if (acceptable.length === 0) {
    const repaired = families.filter((f) => !f.perturbedMisfit && f.lnBayesFactor > thresholdLnB);
    if (repaired.length > 0) {
      reasons.push(`In ${repaired.map((f) => quoted(f.name)).join(', ')} the perturber removes the structure (the perturbed fit passes) with ln B above ` +
        `the threshold: a subhalo is one explanation, smooth freedom these families lack another; only a family whose smooth model fits can tell them apart.`);
    }
    return {
      ...base,
      verdict: 'not-evidence',
      leastFavourable: null,
      sentence: `not evidence of a subhalo: the smooth model of every family (${families.length}) fails the misfit test, so each ln B weighs the perturber ` +
        `against a smooth model that does not fit the data, and a perturber that soaks up a misfit is not a subhalo. Add families with freedom ` +
        `none of these has: ${suggestions.join('; ')}`,
      reasons,
    };
  }

  const least = acceptable.reduce((low, f) => (f.lnBayesFactor < low.lnBayesFactor ? f : low));
  const leastFavourable = { family: least.name, lnBayesFactor: least.lnBayesFactor, lnBayesFactorError: least.lnBayesFactorError };
  if (acceptable.length === 1 && families.length > 1) reasons.push(`The verdict rests on one family only, ${quoted(acceptable[0].name)}.`);
  const notConfirmed = (sentence: string): RobustVerdict => ({ ...base, verdict: 'not-confirmed', leastFavourable, sentence, reasons });
  if (least.lnBayesFactor <= thresholdLnB) {
    const how = least.lnBayesFactor < 0 ? 'better than with it' : 'well enough';
    return notConfirmed(`not confirmed: in family ${quoted(least.name)}, whose smooth model fits the data, ln B = ${fixed(least.lnBayesFactor)} +- ` +
      `${fixed(least.lnBayesFactorError)} does not exceed the detection threshold ${thresholdLnB}: a smooth model without the perturber explains the data ${how}`);
  }
  const perturbedMisfit = acceptable.find((f) => f.perturbedMisfit);
  if (perturbedMisfit !== undefined) {
    return notConfirmed(`not confirmed: in family ${quoted(perturbedMisfit.name)} the smooth model passes the misfit test but the perturbed model fails it: ` +
      'its run may have missed the best fit; rerun it with more live points');
  }
  const stopped = acceptable.find((f) => !f.converged);
  if (stopped !== undefined) {
    return notConfirmed(`not confirmed: the runs of family ${quoted(stopped.name)} stopped before converging, so their ln Z is not final; resume them`);
  }
  return {
    ...base,
    verdict: 'confirmed',
    leastFavourable,
    sentence: `confirmed: the perturber is needed in every family whose smooth model fits the data (${acceptable.length} of ${families.length}); ` +
      `the least favourable ln B is ${fixed(least.lnBayesFactor)} +- ${fixed(least.lnBayesFactorError)} (${quoted(least.name)}), above the detection threshold ${thresholdLnB}`,
    reasons,
  };
}
