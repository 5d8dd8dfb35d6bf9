import type { RejectionCountsRecord } from '../../records/modelRecord.js';

const WORDS: ReadonlyArray<readonly [keyof RejectionCountsRecord, string]> = [
  ['mesh', 'mesh not built'],
  ['notPositiveDefinite', 'posterior precision not positive definite'],
  ['regularisation', 'regularisation matrix not positive definite'],
];

/** The pixelated source's rejections by reason in words ("none" when every count is 0). */
export function rejectionWords(counts: RejectionCountsRecord): string {
  const parts = WORDS.filter(([key]) => counts[key] > 0).map(([key, words]) => `${counts[key]} ${words}`);
  return parts.length === 0 ? 'none' : parts.join(', ');
}

/** The total of a record's rejections. */
export function rejectionTotal(counts: RejectionCountsRecord): number {
  return WORDS.reduce((sum, [key]) => sum + counts[key], 0);
}
