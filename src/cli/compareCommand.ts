import type { CommandModule } from 'yargs';
import { writeReport } from '../report/index.js';
import { basename, extname, join } from 'node:path';
import { loadConfig, type ArcsiftConfig } from '../config/arcsiftConfig.js';
import { runComparisonToFolder } from '../inference/runComparisonToFolder.js';
import { finiteNumberOption, loadDataOf, wholeNumberOption, withDataOptions, type DataArguments } from './dataOptions.js';
import { evidenceSettingsOf, inOutputFolder, withSamplerOptions, type SamplerArguments } from './samplerOptions.js';
import { formatComparison, formatCountComparison } from './formatComparison.js';
import { comparisonSideBySide } from '../inference/compareModels.js';
import { comparePerturberCounts } from '../inference/comparePerturberCounts.js';
import { runDefaults } from '../settings/runDefaults.js';
import { reportUnfinished } from './reportUnfinished.js';

interface CompareArguments extends DataArguments, SamplerArguments {
  config: string;
  out?: string;
  perturbers: number;
  'max-perturbers'?: number;
  'detection-threshold': number;
  report: boolean;
}

export const compareCommand: CommandModule<object, CompareArguments> = {
  command: 'compare',
  describe: 'Weigh a smooth lens model against one with a perturber by their Bayesian evidence',
  builder: (y) => withSamplerOptions(withDataOptions(y
    .option('config', { type: 'string', demandOption: true, describe: 'model config (YAML or JSON) with priors; its perturbers make the perturbed model' })
    .option('out', { type: 'string', describe: 'output folder [default: chains/<config name>-compare]' })
    .option('perturbers', { type: 'number', default: 1, describe: 'how many of the config\'s perturbers the perturbed model holds' })
    .option('report', { type: 'boolean', default: true, describe: 'write report.html and figures at the end (--no-report to skip)' })
    .option('detection-threshold', { type: 'number', default: runDefaults.detection.lnBayesFactorThreshold, describe: 'claim a detection when ln B exceeds this and the smooth model passes the misfit test (default: the published robust-detection threshold, about 10 sigma)' })
    .option('max-perturbers', { type: 'number', describe: 'instead: compare 0, 1, ..., K perturbers by evidence (extra ones copy the last listed perturber)' })), { livePoints: runDefaults.nested.livePoints })
    .example('$0 compare --config configs/demo.yaml --data chains/mock --out chains/mock-compare', 'smooth versus one subhalo'),
  handler: async (args) => {
    const config = loadConfig(args.config);
    const out = args.out ?? join('chains', `${basename(args.config, extname(args.config))}-compare`);
    const perturberCount = wholeNumberOption('perturbers', args.perturbers, 1);
    const maxCount = args['max-perturbers'] === undefined ? undefined : wholeNumberOption('max-perturbers', args['max-perturbers'], 1);
    const folders = maxCount === undefined ? ['smooth', 'perturbed'] : Array.from({ length: maxCount + 1 }, (_, k) => `perturbers-${k}`);
    await inOutputFolder(out, args, folders, undefined, () => (maxCount === undefined
      ? compareIntoFolder(args, config, perturberCount, out)
      : compareCountsIntoFolder(args, config, maxCount, out)));
  },
};

/** Smooth against perturbed, into a folder the command holds. */
async function compareIntoFolder(args: CompareArguments, config: ArcsiftConfig, perturberCount: number, out: string): Promise<void> {
  const data = loadDataOf(args, config);
  const plain = { plainLines: comparisonSideBySide({ smooth: evidenceSettingsOf(args, 'smooth').settings, perturbed: evidenceSettingsOf(args, 'perturbed').settings }) };
  const smooth = evidenceSettingsOf(args, 'smooth', plain);
  const perturbed = evidenceSettingsOf(args, 'perturbed', plain);
  const { summary } = await runComparisonToFolder(config, data, out, {
    smooth: smooth.settings,
    perturbed: perturbed.settings,
    perturberCount,
    detectionThresholdLnB: finiteNumberOption('detection-threshold', args['detection-threshold']),
    onModelStart: (label) => { if (label === 'perturbed') smooth.finish(); },
  });
  perturbed.finish();
  process.stdout.write(`${formatComparison(summary)}\n\nwrote ${join(out, 'summary.json')} and the samples, corner data and images under ${out}\n`);
  if (args.report) process.stdout.write(`report: ${writeReport(out)}\n`);
  reportUnfinished(summary, join(out, 'summary.json'));
}

/** 0, 1, ..., maxCount perturbers by evidence, into a folder the command holds. */
async function compareCountsIntoFolder(args: CompareArguments, config: ArcsiftConfig, maxCount: number, out: string): Promise<void> {
  const data = loadDataOf(args, config);
  const run = evidenceSettingsOf(args, 'model');
  const summary = await comparePerturberCounts(config, data, maxCount, out, run.settings, (k) => {
    run.finish();
    if (!args.quiet) process.stderr.write(`model with ${k} perturber(s)\n`);
  }, finiteNumberOption('detection-threshold', args['detection-threshold']));
  run.finish();
  process.stdout.write(`${formatCountComparison(summary)}\n\nwrote ${join(out, 'summary.json')} and perturbers-0 ... perturbers-${maxCount} under ${out}\n`);
  reportUnfinished(summary, join(out, 'summary.json'));
}
