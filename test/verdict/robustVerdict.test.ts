// Tests of src/verdict/robustVerdict.ts on hand-made family outcomes: arcsift's own rule, stated
// in README ("The robust verdict") and VERDICT_RULE. The numbers are invented; the first case is
// the pattern reported for a smooth lens with small m = 3 and 4 multipoles and no subhalo (an
// isothermal family gives ln B = +29.8 +- 1.5, the same with multipoles +1.6 +- 1.5, the latter
// preferred by the smooth data by ln Z +90), the scenario the verdict exists for.
import { describe, expect, it } from 'vitest';
import { VERDICT_RULE, robustVerdict, type FamilyOutcome } from '../../src/verdict/robustVerdict.js';

const family = (name: string, lnBayesFactor: number, extra: Partial<FamilyOutcome> = {}): FamilyOutcome => ({
  name, lnBayesFactor, lnBayesFactorError: 1.5, smoothLnEvidence: 0, smoothMisfit: false, perturbedMisfit: false, converged: true, ...extra,
});
const suggestions = ['a decomposed lens', 'a pixelated source'];

describe('the robust verdict', () => {
  it('confirms when every acceptable family needs the perturber above the threshold', () => {
    const v = robustVerdict([family('sie', 80, { smoothLnEvidence: 10 }), family('sie + multipoles', 62, { smoothLnEvidence: 40 }), family('power law', 55)], 50, suggestions);
    expect(v.verdict).toBe('confirmed');
    expect(v.leastFavourable).toEqual({ family: 'power law', lnBayesFactor: 55, lnBayesFactorError: 1.5 });
    expect(v.acceptableFamilies).toEqual(['sie', 'sie + multipoles', 'power law']);
    expect(v.preferredFamily).toBe('sie + multipoles');
    expect(v.sentence).toBe('confirmed: the perturber is needed in every family whose smooth model fits the data (3 of 3); the least favourable ln B is 55.0 +- 1.5 ("power law"), above the detection threshold 50');
    expect(v.reasons[0]).toBe('Without a perturber the data prefer family "sie + multipoles" (highest smooth ln Z, 30.0 above the next).');
  });

  it('does not confirm when one acceptable family is below the threshold, and names it', () => {
    const v = robustVerdict([family('sie + shear', 29.8), family('sie + shear + multipoles', 1.6, { smoothLnEvidence: 90 })], 50, suggestions);
    expect(v.verdict).toBe('not-confirmed');
    expect(v.leastFavourable?.family).toBe('sie + shear + multipoles');
    expect(v.sentence).toMatch(/^not confirmed: in family "sie \+ shear \+ multipoles", whose smooth model fits the data, ln B = 1\.6 \+- 1\.5 does not exceed the detection threshold 50: a smooth model without the perturber explains the data well enough$/);
    // Even when the other family is far above the threshold.
    expect(robustVerdict([family('a', 500), family('b', 49.9)], 50, suggestions).verdict).toBe('not-confirmed');
    expect(robustVerdict([family('a', 500), family('b', -3)], 50, suggestions).sentence).toMatch(/explains the data better than with it$/);
  });

  it('sets aside a family whose smooth model misfits: it neither confirms nor vetoes', () => {
    const v = robustVerdict([family('sie', 3, { smoothMisfit: true }), family('sie + multipoles', 70)], 50, suggestions);
    expect(v.verdict).toBe('confirmed');
    expect(v.acceptableFamilies).toEqual(['sie + multipoles']);
    expect(v.reasons).toContain('Set aside, their smooth model failing the misfit test (ln B not evidence): "sie" (ln B 3.0).');
    expect(v.reasons).toContain('The verdict rests on one family only, "sie + multipoles".');
    expect(robustVerdict([family('sie', 300, { smoothMisfit: true }), family('sie + multipoles', 2)], 50, suggestions).verdict).toBe('not-confirmed');
  });

  it('is not evidence when every family misfits, says why and which families to add', () => {
    const v = robustVerdict([family('sie', 29.8, { smoothMisfit: true, perturbedMisfit: true }), family('sie + multipoles', 80, { smoothMisfit: true })], 50, suggestions);
    expect(v.verdict).toBe('not-evidence');
    expect(v.leastFavourable).toBeNull();
    expect(v.acceptableFamilies).toEqual([]);
    expect(v.sentence).toBe('not evidence of a subhalo: the smooth model of every family (2) fails the misfit test, so each ln B weighs the perturber ' +
      'against a smooth model that does not fit the data, and a perturber that soaks up a misfit is not a subhalo. Add families with freedom none ' +
      'of these has: a decomposed lens; a pixelated source');
    // The family whose perturbed fit passes with ln B above the threshold is named as one where the perturber removes the structure.
    expect(v.reasons.some((r) => /^In "sie \+ multipoles" the perturber removes the structure/.test(r))).toBe(true);
    expect(v.reasons.some((r) => /^In "sie"/.test(r))).toBe(false);
  });

  it('does not confirm on a misfit perturbed fit or an unfinished run of an acceptable family', () => {
    expect(robustVerdict([family('a', 80, { perturbedMisfit: true }), family('b', 70)], 50, suggestions).sentence)
      .toMatch(/^not confirmed: in family "a" the smooth model passes the misfit test but the perturbed model fails it/);
    const stopped = robustVerdict([family('a', 80), family('b', 70, { converged: false })], 50, suggestions);
    expect(stopped.verdict).toBe('not-confirmed');
    expect(stopped.sentence).toMatch(/runs of family "b" stopped before converging/);
    expect(stopped.reasons).toContain('Runs that stopped before converging (ln Z not final; resume them): "b".');
  });

  it('uses the threshold it is given and strictly', () => {
    expect(robustVerdict([family('a', 12)], 10, suggestions).verdict).toBe('confirmed');
    expect(robustVerdict([family('a', 10)], 10, suggestions).verdict).toBe('not-confirmed');
    expect(robustVerdict([family('a', 12)], 10, suggestions).thresholdSource).toMatch(/^ln B > 10, set for this run/);
  });

  it('states its rule in the words README uses', () => {
    expect(VERDICT_RULE).toMatch(/^A family is acceptable when its smooth model passes the misfit test/);
  });
});
