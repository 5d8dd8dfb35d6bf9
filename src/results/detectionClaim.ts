/**
 * Where the default detection threshold comes from, said beside every claim that uses it.
 * Ritondale et al. 2019 (MNRAS 485, 2179; abstract checked) report "a detection criterion of
 * 10 sigma" and that a 5-sigma threshold gave many spurious detections; Vegetti et al. 2014
 * (MNRAS 442, 2017) use the same criterion, and both express it as a difference of log evidence
 * of 50 (sigma = sqrt(2 Delta ln Z)); the last two points are quoted from memory.
 */
export const DETECTION_THRESHOLD_SOURCE =
  'ln B > 50 (about 10 sigma), the robust-detection threshold of Vegetti et al. 2014 (MNRAS 442, 2017) and ' +
  'Ritondale et al. 2019 (MNRAS 485, 2179), who found a 5-sigma threshold gave many spurious detections';

/** The published robust-detection threshold in ln B (runDefaults.detection holds the run default). */
export const PUBLISHED_DETECTION_THRESHOLD = 50;

/** What a Bayes factor of a perturber claims: a detection, none, or nothing at all because the smooth model misfits. */
export type DetectionClaimKind = 'detected' | 'not-detected' | 'not-evidence';

/** The claim and why, in words. */
export interface DetectionClaim {
  readonly claim: DetectionClaimKind;
  readonly thresholdLnB: number;
  /** Where the threshold comes from (the published value, or the user's own). */
  readonly thresholdSource: string;
  readonly sentence: string;
}

/** What the claim reads of one smooth-versus-perturbed comparison. */
export interface DetectionInput {
  /** ln Z_perturbed - ln Z_smooth. */
  readonly lnBayesFactor: number;
  readonly thresholdLnB: number;
  /** The misfit alarm of the smooth model's best fit. */
  readonly smoothMisfit: boolean;
  /** The misfit alarm of the perturbed model's best fit. */
  readonly perturbedMisfit: boolean;
}

/** Where a threshold comes from: the published value, or the user's. */
export function thresholdSource(thresholdLnB: number): string {
  return thresholdLnB === PUBLISHED_DETECTION_THRESHOLD
    ? DETECTION_THRESHOLD_SOURCE
    : `ln B > ${thresholdLnB}, set for this run (the published robust-detection threshold is ln B > ${PUBLISHED_DETECTION_THRESHOLD})`;
}

/**
 * The detection claim of one comparison (arcsift's own rule, stated in README). A Bayes factor
 * says which of two models is less wrong, not that either fits: when the smooth model's best-fit
 * residuals hold spatial structure (its misfit alarm sounds), ln B weighs the perturber against a
 * smooth model that does not describe the data, and a perturber that soaks up that misfit is not a
 * subhalo, so the claim is `not-evidence` whatever ln B is. Otherwise the perturber is `detected`
 * when ln B exceeds the threshold and `not-detected` below it. The evidence grade of Kass &
 * Raftery (1995) still describes ln B; the claim uses the threshold.
 */
export function detectionClaim(input: DetectionInput): DetectionClaim {
  const { lnBayesFactor, thresholdLnB } = input;
  const base = { thresholdLnB, thresholdSource: thresholdSource(thresholdLnB) };
  const lnB = lnBayesFactor.toFixed(1);
  if (input.smoothMisfit) {
    const perturbed = input.perturbedMisfit
      ? 'the perturbed model\'s residuals fail the test too, so the perturber soaks up part of a misfit it cannot remove'
      : 'the perturbed model\'s residuals pass, so the perturber removes the structure, but a smooth model with more freedom might remove it as well';
    return {
      ...base,
      claim: 'not-evidence',
      sentence: `not evidence of a subhalo (ln B = ${lnB}): the smooth model's residuals hold spatial structure it missed ` +
        `(misfit alarm), so ln B only says which of two models is less wrong; ${perturbed}. Compare smooth families with ` +
        'more freedom (multipoles, a power law, a decomposed lens, a more flexible source) with `arcsift verdict`',
    };
  }
  if (lnBayesFactor > thresholdLnB) {
    return {
      ...base,
      claim: 'detected',
      sentence: `perturber detected: ln B = ${lnB} exceeds the detection threshold ${thresholdLnB} and the smooth model's residuals pass the misfit test` +
        (input.perturbedMisfit ? ' (but the perturbed model\'s fail it: check that its run found the best fit)' : ''),
    };
  }
  return {
    ...base,
    claim: 'not-detected',
    sentence: `no detection: ln B = ${lnB} does not exceed the detection threshold ${thresholdLnB}`,
  };
}
