import { EXIT_STATUS } from '../errors.js';

let shared: { stopRequested: boolean } | undefined;

/**
 * The stop request every sampler of this command shares, set by the first SIGTERM or SIGINT (a
 * scheduler's notice before it kills a job, or Ctrl-C): each run then ends its current step,
 * writes a last checkpoint and throws RunInterrupted. A second signal exits at once with status
 * 4, keeping the checkpoints already written (each was written whole, then renamed into place).
 * The handlers are installed once, on first use.
 */
export function stopOnSignals(): { stopRequested: boolean } {
  if (shared !== undefined) return shared;
  const signal = { stopRequested: false };
  const handler = (name: NodeJS.Signals): void => {
    if (signal.stopRequested) {
      process.stderr.write(`arcsift: ${name} again: stopping at once; the checkpoints written so far are kept\n`);
      process.exit(EXIT_STATUS.interrupted);
    }
    signal.stopRequested = true;
    process.stderr.write(`arcsift: ${name} received: ending the current step and writing a last checkpoint (send it again to stop at once)\n`);
  };
  process.on('SIGTERM', handler);
  process.on('SIGINT', handler);
  shared = signal;
  return signal;
}
