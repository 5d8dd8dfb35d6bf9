#!/usr/bin/env node
import yargs from 'yargs';
import { hideBin } from 'yargs/helpers';
import { InputError } from '../errors.js';
import { commands } from './commands.js';

/** Prints a user mistake without a stack trace (exit 2); anything else is an internal fault (exit 1). */
function reportAndExit(error: unknown): never {
  if (error instanceof InputError) {
    process.stderr.write(`arcsift: ${error.message}\n`);
    process.exit(2);
  }
  process.stderr.write(`arcsift: internal error: ${(error as Error)?.stack ?? String(error)}\n`);
  process.exit(1);
}

process.on('unhandledRejection', reportAndExit);

let cli = yargs(hideBin(process.argv))
  .scriptName('arcsift')
  .usage('$0 <command> [options]\n\nFit strong-lens images with and without a dark-matter perturber and weigh the two by Bayesian evidence.')
  .strict()
  .demandCommand(1, 'name a command (see the list above)')
  .recommendCommands()
  .help()
  .alias('help', 'h')
  .version()
  .wrap(Math.min(100, process.stdout.columns ?? 100))
  .fail((message, error) => {
    if (error) reportAndExit(error);
    process.stderr.write(`arcsift: ${message}\n(run \`arcsift --help\` or \`arcsift <command> --help\`)\n`);
    process.exit(2);
  });
for (const command of commands) cli = cli.command(command);

try {
  await cli.parseAsync();
} catch (error) {
  reportAndExit(error);
}
