// Tests of src/results/bayesFactorReading.ts.
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { bayesFactorReading, evidenceGrade, KASS_RAFTERY_LN_EDGES } from '../../src/results/index.js';

// Kass & Raftery 1995 (J. Am. Stat. Assoc. 90, 773), their table of evidence against H0 (the paper
// was not reachable here; the edges agree with the reproduction in the pcal R package manual):
//   2 ln B10   B10        evidence against H0
//   0 to 2     1 to 3     not worth more than a bare mention
//   2 to 6     3 to 20    positive
//   6 to 10    20 to 150  strong
//   > 10       > 150      very strong
const TABLE: readonly { twoLnFrom: number; twoLnTo: number; bFrom: number; bTo: number; grade: string }[] = [
  { twoLnFrom: 0, twoLnTo: 2, bFrom: 1, bTo: 3, grade: 'not worth more than a bare mention' },
  { twoLnFrom: 2, twoLnTo: 6, bFrom: 3, bTo: 20, grade: 'positive' },
  { twoLnFrom: 6, twoLnTo: 10, bFrom: 20, bTo: 150, grade: 'strong' },
  { twoLnFrom: 10, twoLnTo: Infinity, bFrom: 150, bTo: Infinity, grade: 'very strong' },
];

describe('evidenceGrade', () => {
  it('follows the Kass & Raftery table in 2 ln B, just inside each row', () => {
    for (const row of TABLE) {
      const inside = [row.twoLnFrom + 0.01, Math.min(row.twoLnTo, 1000) - 0.01];
      for (const twoLn of inside) {
        expect(evidenceGrade(twoLn / 2)).toBe(row.grade);
        expect(evidenceGrade(-twoLn / 2)).toBe(row.grade);
      }
    }
  });

  it('agrees with the table\'s B10 column away from its rounded edges', () => {
    // The B column rounds e, e^3 = 20.1 and e^5 = 148 to 3, 20 and 150, so take the geometric middle of each row.
    for (const row of TABLE) {
      const b = row.bTo === Infinity ? 1e4 : Math.sqrt(row.bFrom * row.bTo);
      expect(evidenceGrade(Math.log(b))).toBe(row.grade);
    }
  });

  it('puts each edge (2 ln B = 2, 6, 10) in the stronger grade and states the edges in ln B', () => {
    expect(KASS_RAFTERY_LN_EDGES.map((edge) => 2 * edge.lnBayesFactorFrom)).toEqual(TABLE.map((row) => row.twoLnFrom));
    expect(KASS_RAFTERY_LN_EDGES.map((edge) => edge.grade)).toEqual(TABLE.map((row) => row.grade));
    expect(evidenceGrade(1)).toBe('positive');
    expect(evidenceGrade(3)).toBe('strong');
    expect(evidenceGrade(5)).toBe('very strong');
    expect(evidenceGrade(Infinity)).toBe('very strong');
    expect(() => evidenceGrade(NaN)).toThrow(InputError);
  });
});

describe('bayesFactorReading', () => {
  it('reads both directions in plain words', () => {
    expect(bayesFactorReading(4).sentence).toBe('strong evidence for the perturbed model over the smooth model');
    expect(bayesFactorReading(-2).sentence).toBe('positive evidence for the smooth model over the perturbed model');
    expect(bayesFactorReading(-7.5).favoured).toBe('smooth model');
    expect(bayesFactorReading(12, 'model with a subhalo', 'model without').sentence).toBe(
      'very strong evidence for the model with a subhalo over the model without',
    );
    expect(bayesFactorReading(0.4).sentence).toBe(
      'evidence for the perturbed model over the smooth model not worth more than a bare mention',
    );
    const even = bayesFactorReading(0);
    expect(even.favoured).toBeUndefined();
    expect(even.sentence).toBe('no evidence either way between the perturbed model and the smooth model');
  });
});
