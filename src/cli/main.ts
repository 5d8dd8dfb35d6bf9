#!/usr/bin/env node
import yargs from 'yargs';
import { hideBin } from 'yargs/helpers';
import { EXIT_STATUS, InputError, RunInterrupted } from '../errors.js';
import { commands } from './commands.js';
import { closestOption, unknownOptionNames } from './closestOption.js';
import { resumeCommandLine } from './resumeCommandLine.js';

/**
 * Prints a user mistake without a stack trace (exit 2), a run stopped by a signal with how to
 * resume it (exit 4); anything else is an internal fault (exit 1).
 */
function reportAndExit(error: unknown): never {
  if (error instanceof InputError) {
    process.stderr.write(`arcsift: ${error.message}\n`);
    process.exit(EXIT_STATUS.userMistake);
  }
  if (error instanceof RunInterrupted) {
    const kept = error.checkpoints.length === 0 ? 'no checkpoint was due yet' : `checkpoints written: ${error.checkpoints.join(', ')}`;
    process.stderr.write(`arcsift: stopped on request; ${kept}\narcsift: continue with: ${resumeCommandLine(hideBin(process.argv))}\n`);
    process.exit(EXIT_STATUS.interrupted);
  }
  process.stderr.write(`arcsift: internal error: ${(error as Error)?.stack ?? String(error)}\n`);
  process.exit(EXIT_STATUS.internalFault);
}

process.on('unhandledRejection', reportAndExit);

const NO_COMMAND = 'name a command';

/** The part of yargs' usage object the failure handler uses (its third argument). */
interface UsageView {
  showHelp(print: (text: string) => void): void;
  getDescriptions?: () => Record<string, unknown>;
}

/** "did you mean --x?" lines for the command line's options that the failing command does not know. */
function suggestions(usage: UsageView): string {
  const known = Object.keys(usage.getDescriptions?.() ?? {});
  if (known.length === 0) return '';
  return unknownOptionNames(hideBin(process.argv), known).map((name) => {
    const negated = name.startsWith('no-') ? closestOption(name.slice(3), known) : undefined;
    const near = negated === undefined ? closestOption(name, known) : `no-${negated}`;
    return near === undefined ? '' : `did you mean --${near} (not --${name})?\n`;
  }).join('');
}

let cli = yargs(hideBin(process.argv))
  .scriptName('arcsift')
  .usage('$0 <command> [options]\n\nFit strong-lens images with and without a dark-matter perturber and weigh the two by Bayesian evidence.')
  .strict()
  .demandCommand(1, NO_COMMAND)
  .recommendCommands()
  .help()
  .alias('help', 'h')
  .version()
  .wrap(Math.min(100, process.stdout.columns ?? 100))
  .fail((message, error, usage) => {
    if (error) reportAndExit(error);
    const view = usage as unknown as UsageView;
    if (message === NO_COMMAND) {
      view.showHelp((text) => process.stderr.write(`${text}\n`));
      process.stderr.write('\narcsift: name one of the commands above\n');
      process.exit(EXIT_STATUS.userMistake);
    }
    process.stderr.write(`arcsift: ${message}\n${suggestions(view)}(run \`arcsift --help\` or \`arcsift <command> --help\`)\n`);
    process.exit(EXIT_STATUS.userMistake);
  });
for (const command of commands) cli = cli.command(command);

try {
  await cli.parseAsync();
} catch (error) {
  reportAndExit(error);
}
