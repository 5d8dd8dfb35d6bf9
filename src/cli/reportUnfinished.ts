import { EXIT_STATUS } from '../errors.js';

/**
 * After a command wrote its summary: a run a limit cut short says so on standard error in one
 * line that starts `arcsift: warning: unfinished run`, for scripts to key on, and the command
 * exits with status 3. Nothing for a finished run.
 */
export function reportUnfinished(summary: { readonly finished: boolean; readonly unfinishedRuns: readonly string[] }, summaryFile: string): void {
  if (summary.finished) return;
  process.stderr.write(
    `arcsift: warning: unfinished run: ${summary.unfinishedRuns.join(', ')} stopped before converging; ${summaryFile} says finished: false ` +
      '(ln Z, Bayes factors, verdicts and intervals are not final); continue it with --resume and a larger limit\n',
  );
  process.exitCode = EXIT_STATUS.unfinished;
}
