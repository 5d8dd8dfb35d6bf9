import { describe, expect, it } from 'vitest';
import { ReverseCuthillMcKee } from '../../../src/numeric/sparse/reverseCuthillMcKee.js';
import { SymmetricSparseAccumulator } from '../../../src/numeric/sparse/symmetricSparseAccumulator.js';
import { isPermutation, patternOf, profileAndBandwidth, scipyCases } from './rcmTestTools.js';
import { accumulate, dominantCase, gridEdges, shuffled, spdCases, uniformStream } from './sparseTestMatrices.js';

describe('ReverseCuthillMcKee', () => {
  it('returns a permutation for every test pattern, with and without indices forced last', () => {
    const u = uniformStream(5);
    const rcm = new ReverseCuthillMcKee();
    for (const c of spdCases()) {
      const m = accumulate(new SymmetricSparseAccumulator(), c, u);
      const order = rcm.order(m, new Int32Array(c.n));
      expect(isPermutation(order, c.n), c.name).toBe(true);
      const last = shuffled(c.n, u).slice(0, Math.min(3, c.n));
      const forced = rcm.order(m, new Int32Array(c.n + 2), last);
      expect(isPermutation(forced, c.n), c.name).toBe(true);
      expect(Array.from(forced.subarray(c.n - last.length, c.n))).toEqual(last);
    }
  });

  it('rejects indices forced last that repeat or fall outside the matrix, and a short buffer', () => {
    const m = patternOf(scipyCases[0]);
    const rcm = new ReverseCuthillMcKee();
    expect(() => rcm.order(m, new Int32Array(m.size), [3, 3])).toThrow(RangeError);
    expect(() => rcm.order(m, new Int32Array(m.size), [m.size])).toThrow(RangeError);
    expect(() => rcm.order(m, new Int32Array(m.size - 1))).toThrow(RangeError);
  });

  it('brings a shuffled k x k 5-point grid to bandwidth <= k + 1, far below the shuffled one', () => {
    // Common practice: RCM from a corner of a k x k 5-point grid numbers it by anti-diagonals,
    // whose neighbours lie at most about one level width (<= k) apart; the shuffled ordering
    // has a bandwidth near k^2.
    const u = uniformStream(9);
    for (const k of [3, 5, 8, 13, 21, 30]) {
      const c = dominantCase(`grid ${k}`, k * k, gridEdges(k, shuffled(k * k, u)), u);
      const m = accumulate(new SymmetricSparseAccumulator(), c, u);
      const identity = Int32Array.from({ length: k * k }, (_, i) => i);
      const shuffledBandwidth = profileAndBandwidth(m, identity).bandwidth;
      const { bandwidth } = profileAndBandwidth(m, new ReverseCuthillMcKee().order(m, new Int32Array(k * k)));
      expect(bandwidth, `k = ${k}`).toBeLessThanOrEqual(k + 1);
      if (k >= 8) expect(bandwidth * 4, `k = ${k}`).toBeLessThan(shuffledBandwidth);
    }
  });

  it("has a profile within 10% of scipy's reverse_cuthill_mckee on the fixtures", () => {
    // The orderings differ by tie-breaking and by the start node (scipy starts each component at
    // a node of least degree, as its output ends on one in 100 of 100 random connected graphs
    // with SciPy 1.10; ours at a pseudo-peripheral node), so
    // only the profile is compared; 10% allows for tie-breaking, not for a wrong algorithm
    // (scipy's profiles are 3.2 to 11 times below those of the shuffled input orderings).
    const rcm = new ReverseCuthillMcKee();
    for (const c of scipyCases) {
      const m = patternOf(c);
      const order = rcm.order(m, new Int32Array(c.n));
      expect(isPermutation(order, c.n), c.name).toBe(true);
      const ours = profileAndBandwidth(m, order);
      expect(ours.profile, c.name).toBeLessThanOrEqual(1.1 * c.scipyProfile);
      expect(ours.profile * 3, c.name).toBeLessThan(c.shuffledProfile);
    }
  });

  it("measures scipy's ordering as the fixture script does: same profile and bandwidth", () => {
    for (const c of scipyCases) {
      const m = patternOf(c);
      expect(profileAndBandwidth(m, c.scipyOrder), c.name).toEqual({ profile: c.scipyProfile, bandwidth: c.scipyBandwidth });
      expect(profileAndBandwidth(m, Array.from({ length: c.n }, (_, i) => i)), c.name).toEqual({ profile: c.shuffledProfile, bandwidth: c.shuffledBandwidth });
    }
  });

  it('gives the same ordering when one instance is reused across sizes as fresh instances', () => {
    const reused = new ReverseCuthillMcKee();
    for (const c of [scipyCases[1], scipyCases[0], scipyCases[4], scipyCases[3]]) {
      const m = patternOf(c);
      const a = Array.from(reused.order(m, new Int32Array(c.n), [0, 1]));
      const b = Array.from(new ReverseCuthillMcKee().order(m, new Int32Array(c.n), [0, 1]));
      expect(a, c.name).toEqual(b);
    }
  });
});
