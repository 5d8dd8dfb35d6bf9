import type { CommandModule } from 'yargs';
import { join } from 'node:path';
import { runCalibration } from '../calibration/runCalibration.js';
import { writeReport } from '../report/writeReport.js';
import { runDefaults } from '../settings/runDefaults.js';
import { wholeNumberOption } from './dataOptions.js';
import { batchRunSettingsOf, formatSubmission, trailingJobOptions, withBatchRunOptions, type BatchRunArguments } from './batchCommand.js';
import { formatCalibration } from './formatCalibration.js';
import { formatBatchStatus } from './formatBatchStatus.js';

interface CalibrateArguments extends BatchRunArguments {
  config: string;
  out: string;
  draws: number;
  'null-draws'?: number;
  job: 'fit' | 'compare';
  seed: number;
  'rank-draws': number;
  'detect-above': number;
  'job-options'?: string;
  collect: boolean;
  report: boolean;
}

export const calibrateCommand: CommandModule<object, CalibrateArguments> = {
  command: 'calibrate',
  describe: 'Check a config\'s inference on its own simulations: rank statistics, interval coverage and detection rates',
  builder: (y) => withBatchRunOptions(y
    .usage('$0 calibrate --config FILE --draws N [--null-draws M] --out DIR [options] [-- OPTIONS OF EVERY FIT]\n\n' +
      'Draws N parameter sets from the config\'s priors (perturbers included) and M without perturbers, simulates each with ' +
      'simulate\'s noise model, fits each as a batch row (here, or on Slurm with --slurm) and reports simulation-based calibration ' +
      '(Talts et al. 2018): ranks of the truth among posterior draws per parameter with uniformity tests, coverage of the 68% and 95% ' +
      'intervals, and for --job compare the false-detection rate and the detection rate against mass. Run it again to continue; ' +
      'after a Slurm submission, run it again with --collect once the tasks have ended.')
    .option('config', { type: 'string', demandOption: true, describe: 'model config with priors' })
    .option('out', { type: 'string', demandOption: true, describe: 'calibration folder' })
    .option('draws', { type: 'number', demandOption: true, describe: 'draws with the config\'s perturbers' })
    .option('null-draws', { type: 'number', describe: 'draws without perturbers [default: --draws for --job compare, 0 for fit]' })
    .option('job', { choices: ['compare', 'fit'] as const, default: 'compare' as const, describe: 'compare: both models on every draw (ranks, coverage, detections); fit: the true model only' })
    .option('seed', { type: 'number', default: runDefaults.calibration.seed, describe: 'seed of the prior draws and of the simulations\' noise' })
    .option('rank-draws', { type: 'number', default: runDefaults.calibration.rankDraws, describe: 'L: posterior draws per simulation for the rank statistic' })
    .option('detect-above', { type: 'number', default: runDefaults.calibration.detectAboveLnB, describe: 'a comparison detects the perturber when ln B exceeds this' })
    .option('job-options', { type: 'string', describe: 'options of every fit as one string, e.g. "--live-points 50" (or give them after --)' })
    .option('collect', { type: 'boolean', default: false, describe: 'only collect the fits finished so far; run nothing' })
    .option('report', { type: 'boolean', default: true, describe: 'write report.html and figures (--no-report to skip)' }))
    .example('$0 calibrate --config configs/demo.yaml --draws 25 --out chains/demo-calibration -- --live-points 50 --slice-steps 1', '25 draws with a subhalo and 25 without, fitted here'),
  handler: async (args) => {
    const run = batchRunSettingsOf(args);
    const draws = wholeNumberOption('draws', args.draws, 0);
    const nullDraws = args['null-draws'] === undefined ? (args.job === 'compare' ? draws : 0) : wholeNumberOption('null-draws', args['null-draws'], 0);
    const runOptions = [...(args['job-options']?.trim().split(/\s+/).filter((t) => t !== '') ?? []), ...trailingJobOptions()];
    const outcome = await runCalibration({
      config: args.config, out: args.out, draws, nullDraws, job: args.job,
      seed: wholeNumberOption('seed', args.seed, 1), runOptions,
      rankDraws: wholeNumberOption('rank-draws', args['rank-draws'], 1), detectAboveLnB: args['detect-above'],
      collectOnly: args.collect, batch: run, onNote: run.onNote,
    });
    if (run.onProgress !== undefined && process.stderr.isTTY === true) process.stderr.write('\n');
    if (outcome.summary === null) {
      for (const s of outcome.batch?.mode === 'slurm' ? outcome.batch.submissions : []) process.stdout.write(`${formatSubmission(s)}\n`);
      process.stdout.write(`follow with: arcsift batch status ${join(args.out, 'batch')}; when the tasks have ended, run this command again with --collect\n`);
      return;
    }
    if (outcome.batch !== null && outcome.batch.mode === 'local' && outcome.batch.status.counts.finished < outcome.batch.status.rows.length) {
      process.stdout.write(`${formatBatchStatus(outcome.batch.status)}\n\n`);
    }
    process.stdout.write(`${formatCalibration(outcome.summary)}\n\nwrote ${join(args.out, 'calibration.json')} and ${join(args.out, 'calibration-ranks.csv')}\n`);
    if (args.report) process.stdout.write(`report: ${writeReport(args.out)}\n`);
    if (run.signal.aborted) process.exitCode = 130;
  },
};
