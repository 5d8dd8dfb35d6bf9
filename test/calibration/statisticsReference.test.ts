import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { chiSquareSurvival } from '../../src/numeric/statistics/chiSquareSurvival.js';
import { wilsonInterval } from '../../src/numeric/statistics/wilsonInterval.js';
import { rankBinCount, rankUniformity } from '../../src/calibration/rankUniformity.js';
import { detectionRates } from '../../src/calibration/detectionRates.js';

// The calibration's small statistics against outside references: scipy 1.10 (Debian's
// python3-scipy; test/fixtures/calibration/make_reference.py wrote reference.json) for the
// chi-square tail and the Wilson interval, and Newcombe (1998, Stat. Med. 17, 857, example 81/263,
// from memory) for the latter too.
const reference = JSON.parse(readFileSync(new URL('../fixtures/calibration/reference.json', import.meta.url), 'utf8')) as {
  chiSquareSurvival: [number, number, number][];
  wilson: [number, number, number, number, number][];
};

describe('calibration statistics against scipy', () => {
  it('chi-square survival to 1e-10 relative (stdlib and scipy both evaluate Q(k/2, x/2) to near double precision)', () => {
    for (const [x, k, p] of reference.chiSquareSurvival) expect(Math.abs(chiSquareSurvival(x, k) - p) / p, `x ${x}, k ${k}`).toBeLessThan(1e-10);
  });

  it('Wilson score interval to 1e-9 (the same closed form; the tolerance covers the normal quantile\'s last digits)', () => {
    for (const [s, n, level, low, high] of reference.wilson) {
      const w = wilsonInterval(s, n, level);
      expect(w.lower, `${s}/${n}`).toBeCloseTo(low, 9);
      expect(w.upper, `${s}/${n}`).toBeCloseTo(high, 9);
    }
    const newcombe = wilsonInterval(81, 263, 0.95);
    expect([newcombe.lower, newcombe.upper].map((v) => Number(v.toFixed(4)))).toEqual([0.2553, 0.3662]);
  });

  it('bins ranks so that each bin holds as many rank values and at least 5 expected draws', () => {
    expect(rankBinCount(400, 99)).toBe(20);
    expect(rankBinCount(60, 99)).toBe(10);
    expect(rankBinCount(24, 99)).toBe(4);
    expect(rankBinCount(8, 99)).toBe(1);
    // Pearson's statistic by hand: 20 ranks, 4 bins of 25 rank values, counts 8, 4, 4, 4: expected 5 each.
    const ranks = [...Array(8).fill(3), ...Array(4).fill(30), ...Array(4).fill(60), ...Array(4).fill(99)];
    const u = rankUniformity(ranks, ranks.map((r) => (r + 0.5) / 100), 99);
    expect(u.histogram).toEqual([8, 4, 4, 4]);
    expect(u.chiSquare).toBeCloseTo((9 + 1 + 1 + 1) / 5, 12);
    expect(u.chiSquarePValue).toBeCloseTo(chiSquareSurvival(12 / 5, 3), 12);
  });

  it('counts false detections, detections by mass and the reliability of P(perturber)', () => {
    const unclaimed = { claim: null, claimThresholdLnB: null };
    const draws = [
      { lnBayesFactor: -2, withPerturber: false, log10Mass: null }, { lnBayesFactor: 4, withPerturber: false, log10Mass: null },
      { lnBayesFactor: -1, withPerturber: false, log10Mass: null }, { lnBayesFactor: 0.5, withPerturber: false, log10Mass: null },
      { lnBayesFactor: -1, withPerturber: true, log10Mass: 7.2 }, { lnBayesFactor: 8, withPerturber: true, log10Mass: 9.9 },
      { lnBayesFactor: 12, withPerturber: true, log10Mass: 10.6 }, { lnBayesFactor: 2, withPerturber: true, log10Mass: 10.9 },
    ].map((d) => ({ ...d, ...unclaimed }));
    const d = detectionRates(draws, 3, [7, 11], 1, 'm');
    expect([d.falseDetection.successes, d.falseDetection.trials]).toEqual([1, 4]);
    expect(d.falseDetectionBound).toBeCloseTo(Math.exp(-3), 15);
    expect(d.byMass.map((b) => [b.log10MassLower, b.successes, b.trials])).toEqual([[7, 0, 1], [8, 0, 0], [9, 1, 1], [10, 1, 2]]);
    // Equal numbers with and without: P = 1 / (1 + exp(-ln B)); ln B = 0.5 gives 0.62, in [0.5, 0.7).
    const bin = d.reliability.find((b) => b.probabilityLower === 0.5)!;
    expect([bin.successes, bin.trials]).toEqual([0, 1]);
    expect(bin.meanProbability).toBeCloseTo(1 / (1 + Math.exp(-0.5)), 12);
    expect(d.reliability.reduce((s, b) => s + b.trials, 0)).toBe(8);
  });

  it('counts what the comparisons claimed by their own rule beside the threshold count', () => {
    // Claims as compare records them (results/detectionClaim.ts): 'detected' only above its own
    // threshold with a smooth model that passes the misfit alarm, 'not-evidence' when it misfits.
    const draw = (lnBayesFactor: number, withPerturber: boolean, claim: 'detected' | 'not-detected' | 'not-evidence' | null) =>
      ({ lnBayesFactor, withPerturber, log10Mass: withPerturber ? 9.5 : null, claim, claimThresholdLnB: claim === null ? null : 50 });
    const d = detectionRates([
      draw(60, false, 'detected'), draw(70, false, 'not-evidence'), draw(4, false, 'not-detected'), draw(1, false, null),
      draw(80, true, 'detected'), draw(55, true, 'detected'), draw(20, true, 'not-detected'),
    ], 3, [9, 10], 1, 'm');
    expect(d.claims!.thresholdsLnB).toEqual([50]);
    expect([d.claims!.falseClaims.successes, d.claims!.falseClaims.trials]).toEqual([1, 3]);
    expect([d.claims!.trueClaims.successes, d.claims!.trueClaims.trials]).toEqual([2, 3]);
    expect([d.claims!.notEvidenceWithout, d.claims!.notEvidenceWith]).toEqual([1, 0]);
    // The threshold count of the same draws: ln B > 3 on 3 of the 4 without a perturber.
    expect([d.falseDetection.successes, d.falseDetection.trials]).toEqual([3, 4]);
  });
});
