import type { CommandModule } from 'yargs';
import { readdirSync } from 'node:fs';
import { basename, extname, join } from 'node:path';
import { loadConfig, type ArcsiftConfig } from '../config/arcsiftConfig.js';
import { writeReport } from '../report/writeReport.js';
import { InputError, expectedFound } from '../errors.js';
import { readFlags } from '../vet/readFlags.js';
import { runVetToFolder } from '../vet/runVetToFolder.js';
import { vetConcurrency } from '../vet/vetFlags.js';
import { runDefaults } from '../settings/runDefaults.js';
import { loadDataOf, withDataOptions, type DataArguments } from './dataOptions.js';
import { formatPriors } from './formatComparison.js';
import { formatMisfit, misfitNote } from './formatMisfit.js';
import { cosmologyText } from '../report/text/cosmologyText.js';
import { evidenceSettingsOf, inOutputFolder, withSamplerOptions, type SamplerArguments } from './samplerOptions.js';
import type { VetRunRecord, VetSummary } from '../records/vetSummary.js';
import { reportUnfinished } from './reportUnfinished.js';

interface VetArguments extends DataArguments, SamplerArguments {
  config: string;
  report: boolean;
  flags: string;
  out?: string;
  window: number;
  'detection-threshold': number;
  'disfavour-below': number;
  'map-threshold': number;
  'merge-radius': number;
  'map-prior': boolean;
}

const fixed = (v: number | null, digits = 2): string => (v === null || !Number.isFinite(v) ? '-' : v.toFixed(digits));

function massText(r: VetRunRecord): string {
  const m = r.log10Mass;
  return r.verdict === 'confirmed'
    ? `${fixed(m.median)} [${fixed(m.interval68.lower)}, ${fixed(m.interval68.upper)}] (68%)`
    : `< ${fixed(r.log10MassUpperLimit95)} (95% upper limit)`;
}

/** RA and Dec in degrees for the table, to 1e-6 degrees (4 milliarcsec). */
const degrees = (v: number | undefined): string => (v === undefined || !Number.isFinite(v) ? '-' : v.toFixed(6));

/** The plain-text result of `vet`: the table with its thresholds, the priors and the cautions. */
export function formatVetTable(summary: VetSummary): string {
  const t = summary.thresholds;
  if (summary.smooth === null) {
    return [
      `No candidates to vet in ${summary.flags.file}: no fit was run, and vet.json and vet.csv say so (an empty table is a valid result).`,
      ...summary.flags.notices.map((notice) => `  notice: ${notice}`),
    ].join('\n');
  }
  const smooth = summary.smooth;
  const rows = [...summary.candidates, ...(summary.mapPrior === null ? [] : [summary.mapPrior])];
  const massName = summary.perturberKind === 'nfw' || summary.perturberKind === 'truncatedNfw' ? 'log10 M200/Msun' : 'log10 M/Msun';
  const onSky = summary.wcs !== undefined;
  const table = [
    ['candidate', 'flag (x, y) "', 'score', 'ln B', 'verdict', massName, 'posterior (x, y) "', 'offset "', 'chi2/dof', 'misfit p', ...(onSky ? [`posterior RA, Dec (deg, ${summary.wcs?.frame})`] : [])],
    ...rows.map((r) => [
      r.id,
      r.flag === null ? 'map prior' : `(${fixed(r.flag.xArcsec, 3)}, ${fixed(r.flag.yArcsec, 3)})`,
      fixed(r.score),
      `${fixed(r.lnBayesFactor)} +- ${fixed(r.lnBayesFactorError)}`,
      r.finished === false ? `${r.verdict} (NOT FINAL)` : r.verdict,
      massText(r),
      `(${fixed(r.position.xArcsec.median, 3)}, ${fixed(r.position.yArcsec.median, 3)})`,
      fixed(r.offsetArcsec, 3),
      fixed(r.model.misfit?.chiSquarePerDegreeOfFreedom ?? null, 3),
      r.model.misfit === undefined ? '-' : `${r.model.misfit.pValue.toFixed(3)}${r.model.misfit.alarm ? ' MISFIT' : ''}`,
      ...(onSky ? [`${degrees(r.position.sky?.raDeg.median)}, ${degrees(r.position.sky?.decDeg.median)}`] : []),
    ]),
  ];
  const widths = table[0].map((_, c) => Math.max(...table.map((line) => line[c].length)));
  const lines: string[] = [
    `Vetting ${summary.candidates.length} flag(s) from ${summary.flags.file} against one smooth fit ` +
      `(ln Z = ${fixed(smooth.lnEvidence)} +- ${fixed(smooth.lnEvidenceError)})`,
    `Verdicts: confirmed when ln B > ${t.confirmAboveLnB}, disfavoured when ln B < ${t.disfavourBelowLnB}, inconclusive between ` +
      '(ln B = ln Z perturbed - ln Z smooth); not-evidence for every flag when the smooth fit fails the misfit test',
    `  detection threshold: ${summary.thresholdSource ?? `ln B > ${t.confirmAboveLnB}`}`,
    `  ${formatMisfit('shared smooth fit', smooth.misfit)}`,
    ...(smooth.misfit === undefined ? [] : [`  (${misfitNote(smooth.misfit)})`]),
    ...(summary.smoothMisfitNote ? [`  ${summary.smoothMisfitNote}`] : []),
    '',
    ...table.map((line) => `  ${line.map((text, c) => text.padEnd(widths[c])).join('  ').trimEnd()}`),
  ];
  for (const notice of summary.flags.notices) lines.push(`  notice: ${notice}`);
  for (const r of [...rows.map((r) => ({ id: r.id, model: r.model })), { id: 'smooth', model: smooth }]) {
    if (r.model.insertionRankWarning) {
      lines.push(`  warning: the insertion-rank check of run ${r.id} gives p = ${r.model.insertionRankPValue.toExponential(1)}: ` +
        'its constrained draws may be biased, so its ln Z is suspect (Fowlie, Handley & Su 2020)');
    }
    if (r.model.stopReason !== 'converged') {
      lines.push(`  warning: run ${r.id} stopped (${r.model.stopReason}) before converging: its ln Z, and every ln B and verdict that uses it, are not final`);
    }
  }
  lines.push(
    '',
    `Priors behind these Bayes factors (the perturbed models; the smooth model has the same without the ${summary.perturberKind} perturber):`,
    ...formatPriors(summary.priors.perturbed),
    `    ${summary.priors.positionPrior}`,
    `    amplitudes: ${summary.amplitudePrior}`,
    `Cosmology (distances, Sigma_crit, M200): ${cosmologyText(summary.cosmology)}`,
    '',
  );
  if (summary.mapPriorNote !== null) lines.push(`Note: ${summary.mapPriorNote}`);
  lines.push(`Caution: ${summary.caution}`);
  return lines.join('\n');
}

function finiteOption(name: string, value: number, positive: boolean): number {
  if (!Number.isFinite(value) || (positive && !(value > 0))) throw new InputError(`--${name}: ${expectedFound(positive ? 'a number > 0' : 'a number', value)}`);
  return value;
}

export const vetCommand: CommandModule<object, VetArguments> = {
  command: 'vet',
  describe: 'Vet neural-network flags: the Bayes factor of a perturber at each flagged place against one smooth fit',
  builder: (y) => withSamplerOptions(withDataOptions(y
    .usage(
      '$0 vet --config FILE --data DIR --flags FILE [options]\n\n' +
      'One smooth fit is shared by every candidate; each candidate gets one perturbed fit (the config\'s first perturber, ' +
      'its centre priors replaced by a uniform prior on a --window square around the flag). The runs go side by side, ' +
      'one per thread; a run\'s result depends on --seed, not on --threads.\n\n' +
      'Flags are a CSV list or a probability map. The list has a header and one candidate per line: columns x,y (arcsec ' +
      'from the image centre, x with the column, y with the row) or column,row (pixels counted from 0), optionally ' +
      'coordinates (arcsec or pixel, per line, with x,y), score and id; lines starting with # are skipped. A map is a FITS ' +
      'or NPY image of the image\'s shape (NPY shape (rows, columns)); its candidates are the local maxima at or above ' +
      '--map-threshold inside the mask, merged within --merge-radius.')
    .option('config', { type: 'string', demandOption: true, describe: 'model config with priors; its first perturber is placed at each flag' })
    .option('flags', { type: 'string', demandOption: true, describe: 'flag list (.csv) or probability map (.fits or .npy) aligned with the image' })
    .option('out', { type: 'string', describe: 'output folder [default: chains/<config name>-vet]' })
    .option('report', { type: 'boolean', default: true, describe: 'write report.html and figures at the end (--no-report to skip)' })
    .option('window', { type: 'number', default: runDefaults.vet.windowArcsec, describe: 'side of the square position prior around each flag, arcsec' })
    .option('detection-threshold', { alias: 'confirm-above', type: 'number', default: runDefaults.detection.lnBayesFactorThreshold, describe: 'confirmed when ln B exceeds this (the default 50 is the published robust-detection threshold, about 10 sigma) and the smooth fit passes the misfit test' })
    .option('disfavour-below', { type: 'number', default: runDefaults.vet.disfavourBelowLnB, describe: 'disfavoured when ln B is below this' })
    .option('map-threshold', { type: 'number', default: runDefaults.vet.mapThreshold, describe: 'map: smallest peak value that makes a candidate' })
    .option('merge-radius', { type: 'number', default: runDefaults.vet.mergeRadiusArcsec, describe: 'map: peaks closer than this (arcsec) to a higher one are merged into it' })
    .option('map-prior', { type: 'boolean', default: false, describe: 'map: one more perturbed fit whose position prior is the map itself (its evidence then depends on the network)' })), { livePoints: runDefaults.nested.livePoints })
    .example('$0 vet --config configs/demo.yaml --data chains/mock --flags flags.csv', 'vet a list of flags'),
  handler: async (args) => {
    const config = loadConfig(args.config);
    const out = args.out ?? join('chains', `${basename(args.config, extname(args.config))}-vet`);
    const windowArcsec = finiteOption('window', args.window, true);
    const thresholds = { confirmAboveLnB: finiteOption('detection-threshold', args['detection-threshold'], false), disfavourBelowLnB: finiteOption('disfavour-below', args['disfavour-below'], false) };
    const mapSettings = { threshold: finiteOption('map-threshold', args['map-threshold'], false), mergeRadiusArcsec: finiteOption('merge-radius', args['merge-radius'], false) };
    await inOutputFolder(out, args, () => readdirSync(out), 'vet.json', () => vetIntoFolder(args, config, out, windowArcsec, thresholds, mapSettings));
  },
};

/** The vetting itself, into a folder the command holds. */
async function vetIntoFolder(
  args: VetArguments, config: ArcsiftConfig, out: string, windowArcsec: number,
  thresholds: { confirmAboveLnB: number; disfavourBelowLnB: number }, mapSettings: { threshold: number; mergeRadiusArcsec: number },
): Promise<void> {
  const data = loadDataOf(args, config);
  const flags = readFlags(args.flags, data, mapSettings);
  if (args['map-prior'] && flags.map === undefined) {
    throw new InputError('--map-prior takes the probability map as the position prior: expected --flags to name a .fits or .npy map, found a list', { file: args.flags });
  }
  const { settings: checked } = evidenceSettingsOf(args, 'check');
  const runs = 1 + flags.candidates.length + (args['map-prior'] ? 1 : 0);
  const sideBySide = vetConcurrency(checked.threads, runs) > 1;
  if (sideBySide && !args.quiet) process.stderr.write(`${runs} runs, ${vetConcurrency(checked.threads, runs)} side by side\n`);
  let finish: (() => void) | undefined;
  const { summary } = await runVetToFolder(config, data, flags, out, {
    windowArcsec,
    thresholds,
    mapPrior: args['map-prior'] && flags.map !== undefined ? { map: flags.map } : undefined,
    evidence: (label) => {
      const run = evidenceSettingsOf(args, label, { plainLines: sideBySide });
      if (!sideBySide) finish = run.finish;
      return run.settings;
    },
    onRunStart: () => finish?.(),
  });
  finish?.();
  const written = summary.smooth === null ? '' : " and each run's samples and images";
  process.stdout.write(`${formatVetTable(summary)}\n\nwrote ${join(out, 'vet.csv')}, ${join(out, 'vet.json')}${written} under ${out}\n`);
  if (args.report) process.stdout.write(`report: ${writeReport(out)}\n`);
  reportUnfinished(summary, join(out, 'vet.json'));
}
