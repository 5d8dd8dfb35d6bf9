import type { RejectionCountsRecord } from '../../records/modelRecord.js';

/** The reasons of a rejection (the fallback count is not one). */
type RejectionReason = Exclude<keyof RejectionCountsRecord, 'triangleFallbacks'>;

const WORDS: ReadonlyArray<readonly [RejectionReason, string]> = [
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

/**
 * The rays weighed by their holding triangle in words ("none" when there were none or the record
 * predates the count): not rejections, the calls went on.
 */
export function fallbackWords(counts: RejectionCountsRecord): string {
  const rays = counts.triangleFallbacks ?? 0;
  return rays === 0 ? 'none' : `${rays} ${rays === 1 ? 'ray weighed by its' : 'rays weighed by their'} holding triangle (degenerate natural-neighbour ring)`;
}
