import type { NestedProgress } from '../sampling/nested/index.js';

/**
 * Progress of a nested-sampling run: one line rewritten in place on a terminal, plain lines
 * (at most one per `everySeconds`) otherwise or with `plainLines` (runs side by side), nothing when quiet. The remaining time is
 * estimated from how fast ln Z_remaining - ln Z has been falling towards the stopping tolerance.
 */
export function progressPrinter(label: string, options: { quiet: boolean; tolerance: number; everySeconds?: number; plainLines?: boolean }): {
  onProgress: (p: NestedProgress) => void;
  finish: () => void;
} {
  const stream = process.stderr;
  const terminal = stream.isTTY === true && options.plainLines !== true;
  let lastPrinted = -Infinity;
  let first: { gap: number; seconds: number } | undefined;
  let wrote = false;
  const onProgress = (p: NestedProgress): void => {
    if (options.quiet) return;
    // ln(Z + Z_live) - ln Z, the quantity the run stops on when it falls below the tolerance.
    const difference = p.lnZRemaining - p.lnZ;
    const gap = difference > 30 ? difference : Math.log1p(Math.exp(difference));
    const logGap = Math.log(Math.max(gap, 1e-300));
    if (first === undefined && Number.isFinite(logGap)) first = { gap: logGap, seconds: p.elapsedSeconds };
    let remaining = '?';
    if (first !== undefined && p.elapsedSeconds > first.seconds && logGap < first.gap) {
      const rate = (first.gap - logGap) / (p.elapsedSeconds - first.seconds);
      const left = (logGap - Math.log(options.tolerance)) / rate;
      if (Number.isFinite(left) && left >= 0) remaining = `${Math.round(left)} s`;
    }
    const line = `${label}: iteration ${p.iteration}  ln Z ${p.lnZ.toFixed(2)}  remaining ln Z ${p.lnZRemaining.toFixed(2)}  ` +
      `efficiency ${(100 * p.efficiency).toFixed(1)}%  evaluations ${p.evaluations}  elapsed ${Math.round(p.elapsedSeconds)} s  left ~${remaining}`;
    if (terminal) {
      stream.write(`\r\x1b[2K${line}`);
      wrote = true;
    } else if (p.elapsedSeconds - lastPrinted >= (options.everySeconds ?? 10)) {
      stream.write(`${line}\n`);
      lastPrinted = p.elapsedSeconds;
    }
  };
  const finish = (): void => {
    if (terminal && wrote) stream.write('\n');
  };
  return { onProgress, finish };
}
