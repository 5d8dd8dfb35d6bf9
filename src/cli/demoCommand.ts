import type { CommandModule } from 'yargs';
import { writeReport } from '../report/index.js';
import { fileURLToPath } from 'node:url';
import { join } from 'node:path';
import { loadConfig } from '../config/arcsiftConfig.js';
import { loadObservedData } from '../data/index.js';
import { runComparisonToFolder } from '../inference/runComparisonToFolder.js';
import { comparisonSideBySide } from '../inference/compareModels.js';
import { placeTruth } from '../inference/truthComparison.js';
import { simulateToFolder } from '../simulate/simulateToFolder.js';
import { buildLensSystem } from '../model/lensSystem.js';
import { checkOutputFolder, evidenceSettingsOf, withSamplerOptions, type SamplerArguments } from './samplerOptions.js';
import { formatComparison } from './formatComparison.js';
import { rmSync } from 'node:fs';

interface DemoArguments extends SamplerArguments {
  config?: string;
  out: string;
  'noise-seed': number;
  fresh: boolean;
  report: boolean;
}

/** configs/demo.yaml of the installed package. */
export const demoConfigPath = fileURLToPath(new URL('../../configs/demo.yaml', import.meta.url));

export const demoCommand: CommandModule<object, DemoArguments> = {
  command: 'demo',
  describe: 'Run the main job on the built-in scenario: simulate it, then compare smooth and perturbed models',
  builder: (y) => withSamplerOptions(y
    .option('config', { type: 'string', describe: 'another scenario to run the demo on [default: the built-in configs/demo.yaml]' })
    .option('out', { type: 'string', default: 'chains/demo', describe: 'folder for the demo run (data/ and compare/ inside)' })
    .option('noise-seed', { type: 'number', default: 1, describe: 'seed of the simulated noise' })
    .option('report', { type: 'boolean', default: true, describe: 'write report.html and figures at the end (--no-report to skip)' })
    .option('fresh', { type: 'boolean', default: true, describe: 'remove an earlier demo run in --out first (--no-fresh with --resume continues one)' }),
  { livePoints: 50, sliceStepsPerParameter: 1 }),
  handler: async (args) => {
    const started = performance.now();
    const configPath = args.config ?? demoConfigPath;
    const config = loadConfig(configPath);
    const dataDir = join(args.out, 'data');
    const compareDir = join(args.out, 'compare');
    if (args.fresh && !args.resume) rmSync(compareDir, { recursive: true, force: true });
    checkOutputFolder(compareDir, args.resume, ['smooth', 'perturbed']);
    process.stdout.write(`arcsift demo: ${config.title}\n1. simulating the scenario of ${configPath}\n`);
    simulateToFolder(config, dataDir, { seed: args['noise-seed'], noiseless: false });
    process.stdout.write(`   wrote ${dataDir}/image.fits, noise.fits, psf.fits, mask.fits, truth.json\n`);
    const data = loadObservedData({ folder: dataDir }, { columns: config.observation.columns, rows: config.observation.rows, pixelScaleArcsec: config.observation.pixelScaleArcsec });
    const plain = { plainLines: comparisonSideBySide({ smooth: evidenceSettingsOf(args, 'smooth').settings, perturbed: evidenceSettingsOf(args, 'perturbed').settings }) };
    const smooth = evidenceSettingsOf(args, '   smooth', plain);
    const perturbed = evidenceSettingsOf(args, '   perturbed', plain);
    process.stdout.write(`2. nested sampling of the smooth and the perturbed model (${smooth.settings.livePoints} live points, ${smooth.settings.threads} threads${plain.plainLines ? ", the two models side by side" : ""})\n`);
    const { comparison, summary } = await runComparisonToFolder(config, data, compareDir, {
      smooth: smooth.settings,
      perturbed: perturbed.settings,
      perturberCount: 1,
      onModelStart: (label) => { if (label === 'perturbed') smooth.finish(); },
    });
    perturbed.finish();
    process.stdout.write(`\n${formatComparison(summary)}\n\n`);

    const truth = buildLensSystem(config).configuredValues();
    const key = config.perturbers[0].entries;
    const names = [key.log10MassSolar.key, key.centerXArcsec.key, key.centerYArcsec.key];
    const placements = placeTruth(comparison, truth, names);
    process.stdout.write('The planted subhalo against the posterior\n');
    process.stdout.write('  parameter                     truth    median   95% interval          truth at posterior quantile\n');
    for (const p of placements) {
      const short = p.name.replace('perturbers[0].', '');
      process.stdout.write(`  ${short.padEnd(28)} ${p.truth.toFixed(3).padStart(7)}  ${p.median.toFixed(3).padStart(7)}   [${p.lower95.toFixed(3)}, ${p.upper95.toFixed(3)}]`.padEnd(80) +
        `  ${(100 * p.quantileOfTruth).toFixed(0)}%${p.inside95 ? '' : '  (outside the 95% interval)'}\n`);
    }
    const found = comparison.perturberFavoured;
    process.stdout.write(`  verdict: the planted subhalo was ${found ? 'FOUND' : 'NOT found'} (ln B = ${comparison.lnBayesFactor.toFixed(1)} +- ${comparison.lnBayesFactorError.toFixed(1)})\n`);
    if (args.report) process.stdout.write(`\nreport (open it in a browser): ${writeReport(compareDir)}\n`);
    process.stdout.write(`\ndemo finished in ${((performance.now() - started) / 1000).toFixed(0)} s; results in ${compareDir}\n`);
  },
};
