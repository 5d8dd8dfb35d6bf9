import type { RejectionCountsRecord } from '../records/modelRecord.js';
import { rejectionTotal, rejectionWords } from '../report/text/rejectionWords.js';

/** With a pixelated source that rejected calls: one line, how many and why (nothing otherwise). */
export function rejectionLines(counts: RejectionCountsRecord | undefined, evaluations: number, label = ''): string[] {
  if (counts === undefined || rejectionTotal(counts) === 0) return [];
  const whose = label === '' ? 'pixelated source' : `${label} model's pixelated source`;
  return [`  ${whose}: ${rejectionTotal(counts)} of ${evaluations} likelihood calls rejected (minus infinity): ${rejectionWords(counts)}`];
}
