// Tests of src/results/detectionClaim.ts: arcsift's own detection rule (README, "Reading a
// verdict"): ln B against a threshold, withheld when the smooth model misfits. The default
// threshold is the published robust-detection value, ln B = 50 (10 sigma: Ritondale et al. 2019,
// MNRAS 485, 2179, abstract; Vegetti et al. 2014, MNRAS 442, 2017, from memory).
import { describe, expect, it } from 'vitest';
import { DETECTION_THRESHOLD_SOURCE, PUBLISHED_DETECTION_THRESHOLD, detectionClaim, thresholdSource } from '../../src/results/detectionClaim.js';

const pass = { smoothMisfit: false, perturbedMisfit: false };

describe('the detection claim', () => {
  it('uses 50 as the published threshold and names its sources', () => {
    expect(PUBLISHED_DETECTION_THRESHOLD).toBe(50);
    // sigma = sqrt(2 Delta ln Z): 10 sigma is Delta ln Z = 50 (the convention of the papers cited).
    expect(Math.sqrt(2 * PUBLISHED_DETECTION_THRESHOLD)).toBe(10);
    expect(DETECTION_THRESHOLD_SOURCE).toMatch(/Vegetti et al\. 2014 .*Ritondale et al\. 2019/);
    expect(thresholdSource(50)).toBe(DETECTION_THRESHOLD_SOURCE);
    expect(thresholdSource(10)).toMatch(/^ln B > 10, set for this run \(the published robust-detection threshold is ln B > 50\)$/);
  });

  it('detects strictly above the threshold when the smooth model fits', () => {
    expect(detectionClaim({ lnBayesFactor: 50.01, thresholdLnB: 50, ...pass }).claim).toBe('detected');
    expect(detectionClaim({ lnBayesFactor: 50, thresholdLnB: 50, ...pass }).claim).toBe('not-detected');
    expect(detectionClaim({ lnBayesFactor: 29.8, thresholdLnB: 50, ...pass }).sentence).toBe('no detection: ln B = 29.8 does not exceed the detection threshold 50');
    expect(detectionClaim({ lnBayesFactor: 12, thresholdLnB: 10, ...pass }).claim).toBe('detected');
  });

  it('is never a detection when the smooth model misfits, whatever ln B, and says why', () => {
    for (const perturbedMisfit of [false, true]) {
      const claim = detectionClaim({ lnBayesFactor: 500, thresholdLnB: 50, smoothMisfit: true, perturbedMisfit });
      expect(claim.claim).toBe('not-evidence');
      expect(claim.sentence).toMatch(/^not evidence of a subhalo \(ln B = 500\.0\): the smooth model's residuals hold spatial structure/);
      expect(claim.sentence).toMatch(/arcsift verdict/);
      expect(claim.sentence).toMatch(perturbedMisfit ? /soaks up part of a misfit/ : /removes the structure, but a smooth model with more freedom/);
    }
  });

  it('keeps a detection when only the perturbed model misfits, with a warning', () => {
    const claim = detectionClaim({ lnBayesFactor: 80, thresholdLnB: 50, smoothMisfit: false, perturbedMisfit: true });
    expect(claim.claim).toBe('detected');
    expect(claim.sentence).toMatch(/check that its run found the best fit/);
  });
});
