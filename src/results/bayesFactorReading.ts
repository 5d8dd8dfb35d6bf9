import { InputError, expectedFound } from '../errors.js';

/**
 * The grades of evidence of Kass & Raftery 1995 (JASA 90, 773; the table on p. 777), in their
 * words. The paper was not reachable here: edges and wording agree with reproductions of the
 * table (Oxford's A Dictionary of Statistics; the pcal R package manual), the page with one
 * citation of it.
 */
export type EvidenceGrade = 'not worth more than a bare mention' | 'positive' | 'strong' | 'very strong';

/**
 * Lower edges of the grades in ln B: Kass & Raftery 1995 give 2 ln B = 0, 2, 6, 10, i.e.
 * ln B = 0, 1, 3, 5 (B = 1, e, e^3 ~ 20, e^5 ~ 150). A grade holds [its edge, the next edge).
 */
export const KASS_RAFTERY_LN_EDGES: readonly { readonly lnBayesFactorFrom: number; readonly grade: EvidenceGrade }[] = [
  { lnBayesFactorFrom: 0, grade: 'not worth more than a bare mention' },
  { lnBayesFactorFrom: 1, grade: 'positive' },
  { lnBayesFactorFrom: 3, grade: 'strong' },
  { lnBayesFactorFrom: 5, grade: 'very strong' },
];

/** The grade of |ln B| on the Kass & Raftery 1995 scale (2 ln B: 0-2, 2-6, 6-10, > 10). */
export function evidenceGrade(lnBayesFactor: number): EvidenceGrade {
  checkLnBayesFactor(lnBayesFactor);
  const size = Math.abs(lnBayesFactor);
  let grade = KASS_RAFTERY_LN_EDGES[0].grade;
  for (const edge of KASS_RAFTERY_LN_EDGES) if (size >= edge.lnBayesFactorFrom) grade = edge.grade;
  return grade;
}

/** What a ln Bayes factor of model 1 over model 0 says, in both directions. */
export interface BayesFactorReading {
  readonly lnBayesFactor: number;
  readonly grade: EvidenceGrade;
  /** Name of the model the evidence favours; undefined when ln B = 0 exactly. */
  readonly favoured: string | undefined;
  /** e.g. "strong evidence for the perturbed model over the smooth model". */
  readonly sentence: string;
}

/**
 * Plain-words reading of ln B10 = ln Z1 - ln Z0 on the Kass & Raftery 1995 scale: positive values
 * favour model 1, negative values model 0 on the same scale. Names default to arcsift's two models.
 */
export function bayesFactorReading(
  lnBayesFactor: number,
  model1 = 'perturbed model',
  model0 = 'smooth model',
): BayesFactorReading {
  const grade = evidenceGrade(lnBayesFactor);
  if (lnBayesFactor === 0) {
    return { lnBayesFactor, grade, favoured: undefined, sentence: `no evidence either way between the ${model1} and the ${model0}` };
  }
  const [favoured, other] = lnBayesFactor > 0 ? [model1, model0] : [model0, model1];
  const sentence =
    grade === 'not worth more than a bare mention'
      ? `evidence for the ${favoured} over the ${other} not worth more than a bare mention`
      : `${grade} evidence for the ${favoured} over the ${other}`;
  return { lnBayesFactor, grade, favoured, sentence };
}

function checkLnBayesFactor(lnBayesFactor: number): void {
  if (Number.isNaN(lnBayesFactor)) {
    throw new InputError(`ln Bayes factor: ${expectedFound('a number', lnBayesFactor)}`);
  }
}
