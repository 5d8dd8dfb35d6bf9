import type { RejectionCountsRecord } from '../records/modelRecord.js';
import { fallbackWords, rejectionTotal, rejectionWords } from '../report/text/rejectionWords.js';

/**
 * With a pixelated source that rejected calls: one line, how many and why; with rays weighed by
 * their holding triangle, one more line saying how many (nothing otherwise).
 */
export function rejectionLines(counts: RejectionCountsRecord | undefined, evaluations: number, label = ''): string[] {
  if (counts === undefined) return [];
  const whose = label === '' ? 'pixelated source' : `${label} model's pixelated source`;
  const lines: string[] = [];
  if (rejectionTotal(counts) > 0) lines.push(`  ${whose}: ${rejectionTotal(counts)} of ${evaluations} likelihood calls rejected (minus infinity): ${rejectionWords(counts)}`);
  if ((counts.triangleFallbacks ?? 0) > 0) lines.push(`  ${whose}: over ${evaluations} likelihood calls, ${fallbackWords(counts)}; those calls went on`);
  return lines;
}
