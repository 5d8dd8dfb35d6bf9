import { describe, expect, it } from 'vitest';
import { rejectionLines } from '../../src/cli/formatRejections.js';
import { rejectionTotal, rejectionWords } from '../../src/report/text/rejectionWords.js';

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
});
