import type { CommandModule } from 'yargs';
import { loadConfig } from '../config/arcsiftConfig.js';
import { writeReport } from '../report/index.js';
import { comparisonSideBySide } from '../inference/compareModels.js';
import { demoConfigPath, runDemo } from '../inference/runDemo.js';
import type { TruthPlacement } from '../inference/truthComparison.js';
import { runDefaults } from '../settings/runDefaults.js';
import { evidenceSettingsOf, inOutputFolder, withSamplerOptions, type SamplerArguments } from './samplerOptions.js';
import { formatComparison } from './formatComparison.js';
import type { ComparisonDetection } from '../records/comparisonSummary.js';
import { reportUnfinished } from './reportUnfinished.js';
import { join } from 'node:path';

interface DemoArguments extends SamplerArguments {
  config?: string;
  out: string;
  'noise-seed': number;
  fresh: boolean;
  report: boolean;
}

/** The table of where the planted subhalo's true values fall in the posterior, and the verdict (the comparison's detection claim). */
export function formatTruthTable(placements: readonly TruthPlacement[], detection: ComparisonDetection, lnB: number, lnBError: number): string {
  const lines = [
    'The planted subhalo against the posterior',
    '  parameter                     truth    median   95% interval          truth at posterior quantile',
  ];
  for (const p of placements) {
    const short = p.name.replace('perturbers[0].', '');
    lines.push(`  ${short.padEnd(28)} ${p.truth.toFixed(3).padStart(7)}  ${p.median.toFixed(3).padStart(7)}   [${p.lower95.toFixed(3)}, ${p.upper95.toFixed(3)}]`.padEnd(80) +
      `  ${(100 * p.quantileOfTruth).toFixed(0)}%${p.inside95 ? '' : '  (outside the 95% interval)'}`);
  }
  const lnBText = `ln B = ${lnB.toFixed(1)} +- ${lnBError.toFixed(1)}`;
  lines.push(detection.claim === 'detected'
    ? `  verdict: the planted subhalo was DETECTED (${lnBText}, above the detection threshold ${detection.thresholdLnB})`
    : detection.claim === 'not-detected'
    ? `  verdict: the planted subhalo was NOT detected (${lnBText}, not above the detection threshold ${detection.thresholdLnB})`
    : `  verdict: NOT evidence of the planted subhalo: the smooth model fails the misfit test (${lnBText})`);
  return lines.join('\n');
}

export const demoCommand: CommandModule<object, DemoArguments> = {
  command: 'demo',
  describe: 'Run the main job on the built-in scenario: simulate it, then compare smooth and perturbed models',
  builder: (y) => withSamplerOptions(y
    .option('config', { type: 'string', describe: 'another scenario to run the demo on [default: the built-in configs/demo.yaml]' })
    .option('out', { type: 'string', default: 'chains/demo', describe: 'folder for the demo run (data/ and compare/ inside)' })
    .option('noise-seed', { type: 'number', default: runDefaults.demo.noiseSeed, describe: 'seed of the simulated noise' })
    .option('report', { type: 'boolean', default: true, describe: 'write report.html and figures at the end (--no-report to skip)' })
    .option('fresh', { type: 'boolean', default: true, describe: 'remove an earlier demo run in --out first (--no-fresh with --resume continues one)' }),
  { livePoints: runDefaults.demo.livePoints, sliceStepsPerParameter: runDefaults.demo.sliceStepsPerParameter }),
  handler: async (args) => {
    // The demo's folder is locked whole; runDemo checks its compare/ folder (fresh, resumed).
    await inOutputFolder(args.out, args, [], undefined, () => demoIntoFolder(args));
  },
};

/** The demo itself, into a folder the command holds. */
async function demoIntoFolder(args: DemoArguments): Promise<void> {
  const started = performance.now();
  const configPath = args.config ?? demoConfigPath;
  const plain = { plainLines: comparisonSideBySide({ smooth: evidenceSettingsOf(args, 'smooth').settings, perturbed: evidenceSettingsOf(args, 'perturbed').settings }) };
  const smooth = evidenceSettingsOf(args, '   smooth', plain);
  const perturbed = evidenceSettingsOf(args, '   perturbed', plain);
  process.stdout.write(`arcsift demo: ${loadConfig(configPath).title}\n1. simulating the scenario of ${configPath}\n`);
  const outcome = await runDemo({
    configPath, out: args.out, noiseSeed: args['noise-seed'], fresh: args.fresh,
    smooth: smooth.settings, perturbed: perturbed.settings,
    onStage: (stage) => {
      if (stage === 'simulated') {
        process.stdout.write(`   wrote ${args.out}/data/image.fits, noise.fits, psf.fits, mask.fits, truth.json\n`);
        process.stdout.write(`2. nested sampling of the smooth and the perturbed model (${smooth.settings.livePoints} live points, ${smooth.settings.threads} threads${plain.plainLines ? ', the two models side by side' : ''})\n`);
      }
      if (stage === 'perturbed') smooth.finish();
    },
  });
  perturbed.finish();
  const { comparison, summary } = outcome;
  process.stdout.write(`\n${formatComparison(summary)}\n\n`);
  process.stdout.write(`${formatTruthTable(outcome.truth, summary.detection, comparison.lnBayesFactor, comparison.lnBayesFactorError)}\n`);
  if (args.report) process.stdout.write(`\nreport (open it in a browser): ${writeReport(outcome.compareFolder)}\n`);
  process.stdout.write(`\ndemo finished in ${((performance.now() - started) / 1000).toFixed(0)} s; results in ${outcome.compareFolder}\n`);
  reportUnfinished(summary, join(outcome.compareFolder, 'summary.json'));
}
