import type { CommandModule } from 'yargs';
import { basename, dirname, extname, join } from 'node:path';
import { loadConfig, type ArcsiftConfig } from '../config/arcsiftConfig.js';
import { writeReport } from '../report/writeReport.js';
import { InputError, expectedFound } from '../errors.js';
import { runDefaults } from '../settings/runDefaults.js';
import { runSensitivityToFolder } from '../sensitivity/runSensitivityToFolder.js';
import { smoothBestFitFromFolder, smoothBestFitFromRun } from '../sensitivity/smoothBestFit.js';
import { firstPerturber } from '../vet/perturberPositionConfig.js';
import { loadDataOf, wholeNumberOption, withDataOptions, type DataArguments } from './dataOptions.js';
import { evidenceSettingsOf, inOutputFolder, withSamplerOptions, type SamplerArguments } from './samplerOptions.js';
import { reportUnfinished } from './reportUnfinished.js';
import type { SensitivitySummary } from '../records/sensitivitySummary.js';

interface SensitivityArguments extends DataArguments, SamplerArguments {
  config: string;
  report: boolean;
  out?: string;
  grid: number;
  threshold: number;
  'mass-tolerance': number;
  'best-fit'?: string;
}

/** The plain-text result of `sensitivity`. */
export function formatSensitivity(summary: SensitivitySummary): string {
  const [lower, upper] = summary.perturber.log10MassPriorRange;
  const lines = [
    `Detection sensitivity to a ${summary.perturber.kind} perturber over ${summary.gridPoints} grid points ` +
      `(${summary.settings.gridSize} x ${summary.settings.gridSize} over the mask's bounding box, points inside the mask)`,
    `  detected when Delta chi^2 / 2 >= ${summary.settings.threshold} (Delta chi^2 >= ${summary.settings.deltaChiSquareThreshold}); ` +
      `log10 mass searched over the prior [${lower}, ${upper}] to ${summary.settings.toleranceDex} dex`,
    `  smooth best fit from ${summary.bestFit.from}`,
    '',
    '  log10 M/Msun   fraction of the grid where detectable',
    ...summary.decades.map((d) => `  ${String(d.log10Mass).padEnd(13)}  ${(100 * d.fraction).toFixed(0).padStart(3)}% (${d.points} of ${summary.gridPoints})`),
  ];
  const undetected = summary.points.filter((p) => p.limit === 'above-upper').length;
  if (undetected > 0) lines.push(`  ${undetected} point(s) not detectable even at log10 M = ${upper}`);
  lines.push('', `Approximation: ${summary.approximation}`);
  return lines.join('\n');
}

export const sensitivityCommand: CommandModule<object, SensitivityArguments> = {
  command: 'sensitivity',
  describe: 'Map the smallest perturber mass the data would detect, over a grid of positions in the mask',
  builder: (y) => withSamplerOptions(withDataOptions(y
    .usage(
      '$0 sensitivity --config FILE --data DIR [options]\n\n' +
      'Plants the config\'s first perturber (its kind) in the smooth model\'s best fit at each grid point and finds, by ' +
      'bisection in log10 mass over its mass prior, the mass where the expected Delta chi^2 / 2 of the best smooth refit ' +
      'reaches --threshold (noise-free Asimov data, local Nelder-Mead refit, no evidence). The best fit comes from ' +
      '--best-fit DIR (a finished compare, smooth fit or vet run) or a short nested run of the smooth model (the sampler ' +
      'options below). Grid points are shared among --threads worker threads.')
    .option('config', { type: 'string', demandOption: true, describe: 'model config; its first perturber gives the kind and the mass prior range' })
    .option('out', { type: 'string', describe: 'output folder [default: chains/<config name>-sensitivity]' })
    .option('report', { type: 'boolean', default: true, describe: 'write report.html and figures at the end (--no-report to skip)' })
    .option('grid', { type: 'number', default: runDefaults.sensitivity.gridSize, describe: 'N for the N x N grid over the mask\'s bounding box' })
    .option('threshold', { type: 'number', default: runDefaults.sensitivity.threshold, describe: 'detected when Delta chi^2 / 2 reaches this (5: Delta chi^2 = 10)' })
    .option('mass-tolerance', { type: 'number', default: runDefaults.sensitivity.toleranceDex, describe: 'bisection stops at this width in log10 mass (dex)' })
    .option('best-fit', { type: 'string', describe: 'run folder whose smooth best fit to use (instead of a short nested run)' })), { livePoints: runDefaults.sensitivity.livePoints })
    .example('$0 sensitivity --config configs/demo.yaml --data chains/mock --grid 8', 'an 8 x 8 sensitivity map'),
  handler: async (args) => {
    const config = loadConfig(args.config);
    firstPerturber(config);
    const out = args.out ?? join('chains', `${basename(args.config, extname(args.config))}-sensitivity`);
    const gridSize = wholeNumberOption('grid', args.grid, 1);
    if (!(args.threshold > 0) || !Number.isFinite(args.threshold)) throw new InputError(`--threshold: ${expectedFound('a number > 0', args.threshold)}`);
    if (!(args['mass-tolerance'] > 0)) throw new InputError(`--mass-tolerance: ${expectedFound('a number > 0', args['mass-tolerance'])}`);
    await inOutputFolder(out, args, ['smooth'], 'sensitivity.json', () => mapIntoFolder(args, config, out, gridSize));
  },
};

/** The sensitivity map itself, into a folder the command holds. */
async function mapIntoFolder(args: SensitivityArguments, config: ArcsiftConfig, out: string, gridSize: number): Promise<void> {
  const data = loadDataOf(args, config);
  const run = evidenceSettingsOf(args, 'smooth best fit');
  let bestFit;
  if (args['best-fit'] !== undefined) {
    bestFit = smoothBestFitFromFolder(config, data, args['best-fit']);
  } else {
    bestFit = await smoothBestFitFromRun(config, data, { ...run.settings, checkpointPath: join(out, 'smooth', 'checkpoint.json') });
    run.finish();
  }
  const terminal = process.stderr.isTTY === true && !args.quiet;
  const summary = await runSensitivityToFolder(config, data, out, {
    gridSize,
    threshold: args.threshold,
    toleranceDex: args['mass-tolerance'],
    threads: run.settings.threads,
    seed: run.settings.seed,
    bestFit,
    signal: run.settings.signal,
    onPoint: terminal ? (done, total) => process.stderr.write(`\r\x1b[2Ksensitivity: ${done} of ${total} grid points`) : undefined,
  });
  if (terminal) process.stderr.write('\n');
  process.stdout.write(`${formatSensitivity(summary)}\n\nwrote ${summary.files.map}, ${summary.files.table} and ${summary.files.summary}\n`);
  if (args.report) process.stdout.write(`report: ${writeReport(dirname(summary.files.summary))}\n`);
  reportUnfinished(summary, summary.files.summary);
}
