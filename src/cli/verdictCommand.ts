import type { CommandModule } from 'yargs';
import { basename, extname, join } from 'node:path';
import { FAMILIES_KEY, loadVerdictConfig, type VerdictConfig } from '../config/verdictConfig.js';
import { writeReport } from '../report/writeReport.js';
import { runDefaults } from '../settings/runDefaults.js';
import { checkFamilies } from '../verdict/compareFamilies.js';
import { familyFolder, runVerdictToFolder } from '../verdict/runVerdictToFolder.js';
import { finiteNumberOption, loadDataOf, wholeNumberOption, withDataOptions, type DataArguments } from './dataOptions.js';
import { formatVerdict } from './formatVerdict.js';
import { evidenceSettingsOf, inOutputFolder, withSamplerOptions, type SamplerArguments } from './samplerOptions.js';
import { reportUnfinished } from './reportUnfinished.js';

interface VerdictArguments extends DataArguments, SamplerArguments {
  config: string;
  out?: string;
  perturbers: number;
  'detection-threshold': number;
  report: boolean;
}

export const verdictCommand: CommandModule<object, VerdictArguments> = {
  command: 'verdict',
  describe: 'The robust verdict: smooth versus perturbed under every smooth-model family of the config; a perturber is confirmed only when every family that fits needs it',
  builder: (y) => withSamplerOptions(withDataOptions(y
    .usage(
      '$0 verdict --config FILE --data DIR [options]\n\n' +
      `The config is a complete one (its lens, source and perturbers are the base) with a list ${FAMILIES_KEY} of families, ` +
      'each { name, lens: { mass, shear, multipoles }, source: { light } }: every part a family gives replaces the base\'s ' +
      '(shear: none removes the shear, multipoles: [] the multipoles); lens light, observation and perturbers stay the base\'s. ' +
      'Each family gets a smooth and a perturbed nested fit (all side by side on the worker threads; --resume continues ' +
      'an interrupted verdict run by run), written as a compare folder under OUT/families/.\n\n' +
      'A family is acceptable when its smooth model passes the misfit test (Moran\'s I of the normalised residuals). ' +
      'Confirmed: in every acceptable family ln B exceeds --detection-threshold and the perturbed model passes the misfit test. ' +
      'Not confirmed: some acceptable family does not need the perturber. Not evidence: no family is acceptable; the verdict ' +
      'says which families to add.')
    .option('config', { type: 'string', demandOption: true, describe: `verdict config: a config with priors and a perturber, and ${FAMILIES_KEY}` })
    .option('out', { type: 'string', describe: 'output folder [default: chains/<config name>-verdict]' })
    .option('perturbers', { type: 'number', default: 1, describe: 'how many of the config\'s perturbers the perturbed models hold' })
    .option('detection-threshold', { type: 'number', default: runDefaults.detection.lnBayesFactorThreshold, describe: 'a family needs the perturber when its ln B exceeds this (default: the published robust-detection threshold, about 10 sigma)' })
    .option('report', { type: 'boolean', default: true, describe: 'write report.html (and each family\'s compare report) at the end (--no-report to skip)' })), { livePoints: runDefaults.nested.livePoints })
    .example('$0 verdict --config configs/verdict-demo.yaml --data chains/kestrel-verdict-mock', 'weigh a perturber under four smooth families'),
  handler: async (args) => {
    const verdictConfig = loadVerdictConfig(args.config);
    const out = args.out ?? join('chains', `${basename(args.config, extname(args.config))}-verdict`);
    const perturberCount = wholeNumberOption('perturbers', args.perturbers, 1);
    const detectionThresholdLnB = finiteNumberOption('detection-threshold', args['detection-threshold']);
    const { settings: checked } = evidenceSettingsOf(args, 'check');
    checkFamilies(verdictConfig.families, { evidence: () => checked, perturberCount });
    const checkpointFolders = verdictConfig.families.flatMap((f) => ['smooth', 'perturbed'].map((m) => join(familyFolder(f), m)));
    await inOutputFolder(out, args, checkpointFolders, 'verdict.json', () => verdictIntoFolder(args, verdictConfig, out, perturberCount, detectionThresholdLnB, checked.threads));
  },
};

/** The verdict itself, into a folder the command holds. */
async function verdictIntoFolder(
  args: VerdictArguments, verdictConfig: VerdictConfig, out: string, perturberCount: number, detectionThresholdLnB: number, threads: number,
): Promise<void> {
  const data = loadDataOf(args, verdictConfig.base);
  const runs = 2 * verdictConfig.families.length;
  const sideBySide = threads >= 2;
  if (!args.quiet) {
    process.stderr.write(`${verdictConfig.families.length} families, ${runs} nested runs${sideBySide ? ` side by side on ${threads} threads` : ' one after another'}\n`);
  }
  const finishers: (() => void)[] = [];
  let started = 0;
  const { summary } = await runVerdictToFolder(verdictConfig, data, out, {
    perturberCount,
    detectionThresholdLnB,
    evidence: (family, model) => {
      const run = evidenceSettingsOf(args, `${family.name} / ${model}`, { plainLines: sideBySide });
      finishers.push(run.finish);
      return run.settings;
    },
    // One after another, each run's in-place progress line ends when the next run starts.
    onRunStart: () => {
      if (!sideBySide && started > 0) finishers[started - 1]();
      started++;
    },
  });
  for (const finish of finishers) finish();
  process.stdout.write(`${formatVerdict(summary)}\n\nwrote ${join(out, 'verdict.json')} and one compare folder per family under ${join(out, 'families')}\n`);
  if (args.report) process.stdout.write(`report: ${writeReport(out)}\n`);
  reportUnfinished(summary, join(out, 'verdict.json'));
}
