import { describe, expect, it } from 'vitest';
import { rejectionLines } from '../../src/cli/formatRejections.js';
import { fallbackWords, rejectionTotal, rejectionWords } from '../../src/report/text/rejectionWords.js';

// How a run's pixelated-source rejections read (wording of this project).
describe('rejection counts in words', () => {
  it('names each reason that occurred, with its count, and says nothing when none did', () => {
    const counts = { mesh: 3, notPositiveDefinite: 9, regularisation: 0 };
    expect(rejectionTotal(counts)).toBe(12);
    expect(rejectionWords(counts)).toBe('3 mesh not built, 9 posterior precision not positive definite');
    expect(rejectionWords({ mesh: 0, notPositiveDefinite: 0, regularisation: 0 })).toBe('none');
    expect(rejectionLines(counts, 4000, 'smooth')).toEqual([
      "  smooth model's pixelated source: 12 of 4000 likelihood calls rejected (minus infinity): 3 mesh not built, 9 posterior precision not positive definite",
    ]);
    expect(rejectionLines({ mesh: 0, notPositiveDefinite: 0, regularisation: 0 }, 4000)).toEqual([]);
    expect(rejectionLines(undefined, 4000)).toEqual([]);
  });

  it('says how many rays fell back to their triangle, apart from the rejections', () => {
    const counts = { mesh: 0, notPositiveDefinite: 0, regularisation: 0, triangleFallbacks: 1 };
    expect(rejectionTotal(counts)).toBe(0);
    expect(rejectionWords(counts)).toBe('none');
    expect(fallbackWords(counts)).toBe('1 ray weighed by its holding triangle (degenerate natural-neighbour ring)');
    expect(rejectionLines({ ...counts, mesh: 2, triangleFallbacks: 40 }, 900)).toEqual([
      '  pixelated source: 2 of 900 likelihood calls rejected (minus infinity): 2 mesh not built',
      '  pixelated source: over 900 likelihood calls, 40 rays weighed by their holding triangle (degenerate natural-neighbour ring); those calls went on',
    ]);
    // A record written before the count existed has none to report.
    expect(fallbackWords({ mesh: 0, notPositiveDefinite: 0, regularisation: 0 })).toBe('none');
  });
});
