import type { CommandModule } from 'yargs';
import { basename, extname, join } from 'node:path';
import { loadConfig, type ArcsiftConfig } from '../config/arcsiftConfig.js';
import { writeReport } from '../report/writeReport.js';
import { InputError, expectedFound } from '../errors.js';
import { FIT_CHECKPOINT_FOLDERS, fitPerturberCount, runFitToFolder, type FitEnsembleSettings, type FitWalkerStart } from '../inference/runFitToFolder.js';
import type { EnsembleFitSettings } from '../inference/runModelEnsemble.js';
import type { EvidenceSettings } from '../inference/runModelEvidence.js';
import { runDefaults } from '../settings/runDefaults.js';
import { PROPOSAL_KINDS, type EnsembleProposalKind, type EnsembleProgress } from '../sampling/ensemble/index.js';
import { loadDataOf, wholeNumberOption, withDataOptions, type DataArguments } from './dataOptions.js';
import { formatPriors } from './formatComparison.js';
import { formatMisfit, misfitNote } from './formatMisfit.js';
import { rejectionLines } from './formatRejections.js';
import { formatSky } from './formatSky.js';
import { cosmologyText } from '../report/text/cosmologyText.js';
import { evidenceSettingsOf, inOutputFolder, withSamplerOptions, type SamplerArguments } from './samplerOptions.js';
import type { EnsembleFitSummary, NestedFitSummary } from '../records/fitSummary.js';
import type { ModelRecord } from '../records/modelRecord.js';
import { reportUnfinished } from './reportUnfinished.js';

interface FitArguments extends DataArguments, SamplerArguments {
  config: string;
  report: boolean;
  out?: string;
  perturbers?: number;
  sampler: 'nested' | 'ensemble';
  walkers?: number;
  'max-sweeps'?: number;
  'min-ess'?: number;
  'max-rhat'?: number;
  proposal?: EnsembleProposalKind;
  'posterior-from'?: string;
  'start-at-values'?: boolean;
  'start-live-points'?: number;
}

/** The options that apply to --sampler ensemble only (without defaults in yargs, so that a given one can be told apart). */
const ENSEMBLE_ONLY = ['walkers', 'max-sweeps', 'min-ess', 'max-rhat', 'proposal', 'posterior-from', 'start-at-values', 'start-live-points'] as const;

/** A number for a table: fixed-point where that reads well, exponential otherwise. */
function formatValue(v: number | null): string {
  if (v === null || !Number.isFinite(v)) return 'n/a';
  const size = Math.abs(v);
  return size === 0 || (size >= 1e-3 && size < 1e5) ? v.toFixed(4) : v.toExponential(3);
}

function formatParameters(parameters: ModelRecord['parameters']): string[] {
  const width = Math.max(...parameters.map((p) => p.name.length + (p.unit === '' ? 0 : p.unit.length + 3)));
  return parameters.map((p) => {
    const name = p.unit === '' ? p.name : `${p.name} [${p.unit}]`;
    const line = `  ${name.padEnd(width)}  ${formatValue(p.median).padStart(10)}  68% [${formatValue(p.interval68[0])}, ${formatValue(p.interval68[1])}]`;
    const sky = p.eastOfNorthDeg;
    return sky === undefined ? line : `${line}  = ${formatValue(sky.median)} east of north, 68% [${formatValue(sky.interval68[0])}, ${formatValue(sky.interval68[1])}]`;
  });
}

function formatPriorBlock(summary: NestedFitSummary | EnsembleFitSummary, what: string): string[] {
  return [
    `Priors behind ${what}:`, ...formatPriors(summary.priors), `    amplitudes: ${summary.amplitudePrior}`,
    `Cosmology (distances, Sigma_crit, M200): ${cosmologyText(summary.cosmology)}`, '', `Caution: ${summary.caution}`,
  ];
}

/** The plain-text result of a nested-sampling fit: ln Z with its priors, and the parameters. */
export function formatNestedFit(summary: NestedFitSummary): string {
  const m = summary.model;
  const lines = [
    `Fit of the ${m.label} model by nested sampling (${m.livePoints} live points, ${m.method})`,
    `  ln Z = ${summary.evidence.lnEvidence.toFixed(2)} +- ${summary.evidence.lnEvidenceError.toFixed(2)}   (${m.evaluations} likelihood evaluations, ${m.seconds.toFixed(0)} s on ${m.threads} thread(s); stopped: ${m.stopReason})`,
  ];
  if (m.stopReason !== 'converged') {
    lines.push(`  warning: the run stopped (${m.stopReason}) before the live points' share of ln Z fell below the tolerance: ln Z and the intervals are not final; resume it (--resume) or allow more evaluations`);
  }
  if (m.insertionRankWarning) {
    lines.push(`  warning: the insertion-rank check gives p = ${m.insertionRankPValue.toExponential(1)}: the constrained draws may be biased, so ln Z is suspect (Fowlie, Handley & Su 2020)`);
  }
  lines.push(...rejectionLines(m.likelihoodRejections, m.evaluations));
  lines.push(`  ${formatMisfit('best fit', m.misfit)}`);
  if (m.misfit !== undefined) lines.push(`  (${misfitNote(m.misfit)})`);
  lines.push('', 'Parameters (posterior median, central 68% interval)', ...formatParameters(m.parameters));
  for (const p of summary.perturbers) {
    if (p.log10M200 !== null && p.kind !== 'pointMass') {
      lines.push(`  ${p.key} (${p.kind}): log10 M200/Msun median ${formatValue(p.log10M200.median)}, 95% [${formatValue(p.log10M200.interval95.lower)}, ${formatValue(p.log10M200.interval95.upper)}]`);
    }
    if (p.sky !== undefined) lines.push(`  ${p.key} (${p.kind}) on the sky: ${formatSky(p.sky)}`);
  }
  lines.push('', ...formatPriorBlock(summary, 'this ln Z and these intervals'));
  return lines.join('\n');
}

/** The plain-text result of an ensemble fit: its diagnostics per parameter, the medians and any warnings. */
export function formatEnsembleFit(summary: EnsembleFitSummary): string {
  const m = summary.model;
  const stop = m.converged
    ? `mixed: R-hat <= ${m.stopRule.maxRHat} and ESS >= ${m.stopRule.minEffectiveSampleSize} for every parameter`
    : m.stopped ? 'stopped on request' : 'sweep limit reached before the walkers mixed';
  const lines = [
    `Fit of the ${m.label} model by ensemble MCMC (${m.walkers} walkers, ${m.sweeps} sweeps, ${stop})`,
    `  walkers started: ${m.start}`,
    `  ${formatMisfit('best sample', m.misfit)}`,
    ...(m.misfit === undefined ? [] : [`  (${misfitNote(m.misfit)})`]),
    `  ${m.evaluations} likelihood evaluations, ${m.seconds.toFixed(0)} s on ${m.threads} thread(s); burn-in ${m.burnInSweeps} sweeps left out; ` +
      `acceptance fraction mean ${m.acceptanceFraction.mean.toFixed(3)}, min ${m.acceptanceFraction.min.toFixed(3)}`,
    `  after burn-in: ${m.retainedSamples} samples, smallest ESS ${formatValue(m.smallestEffectiveSampleSize)}, largest R-hat ${formatValue(m.maxRHat)}`,
    ...rejectionLines(m.likelihoodRejections, m.evaluations),
    '',
  ];
  const names = m.parameters.map((p) => (p.unit === '' ? p.name : `${p.name} [${p.unit}]`));
  const width = Math.max(9, ...names.map((n) => n.length));
  lines.push(`  ${'parameter'.padEnd(width)}  ${'tau'.padStart(8)}  ${'R-hat'.padStart(6)}  ${'ESS bulk'.padStart(8)}  ${'ESS tail'.padStart(8)}  ${'median'.padStart(10)}  68% interval`);
  m.parameters.forEach((p, k) => {
    const d = m.diagnostics[k];
    const count = (v: number | null): string => (v === null ? 'n/a' : v.toFixed(0));
    lines.push(`  ${names[k].padEnd(width)}  ${(d.autocorrelationTime === null ? 'n/a' : d.autocorrelationTime.toFixed(1)).padStart(8)}  ` +
      `${(d.rHat === null ? 'n/a' : d.rHat.toFixed(3)).padStart(6)}  ${count(d.bulkEffectiveSampleSize).padStart(8)}  ${count(d.tailEffectiveSampleSize).padStart(8)}  ` +
      `${formatValue(p.median).padStart(10)}  [${formatValue(p.interval68[0])}, ${formatValue(p.interval68[1])}]`);
  });
  for (const warning of m.warnings) lines.push(`  warning: ${warning}`);
  lines.push('', ...formatPriorBlock(summary, 'these intervals'));
  return lines.join('\n');
}

/**
 * Progress of an ensemble run on stderr: one line rewritten in place on a terminal, plain lines
 * (at most one per `everySeconds`) otherwise, nothing when quiet.
 */
export function ensembleProgressPrinter(label: string, options: { quiet: boolean; everySeconds?: number }): {
  onProgress: (p: EnsembleProgress) => void;
  finish: () => void;
} {
  const stream = process.stderr;
  const terminal = stream.isTTY === true;
  const started = performance.now();
  let lastPrinted = -Infinity;
  let wrote = false;
  const onProgress = (p: EnsembleProgress): void => {
    if (options.quiet) return;
    const elapsed = (performance.now() - started) / 1000;
    if (!terminal && elapsed - lastPrinted < (options.everySeconds ?? 10)) return;
    const ess = Number.isFinite(p.smallestEffectiveSampleSize) ? p.smallestEffectiveSampleSize.toFixed(0) : '?';
    const rHat = Number.isFinite(p.largestRHat) ? p.largestRHat.toFixed(3) : '?';
    const line = `${label}: sweep ${p.sweep}/${p.maxSweeps}  acceptance ${(100 * p.acceptanceFraction).toFixed(1)}%  ` +
      `smallest ESS ${ess}  largest R-hat ${rHat}  evaluations ${p.evaluations}  elapsed ${Math.round(elapsed)} s`;
    if (terminal) {
      stream.write(`\r\x1b[2K${line}`);
      wrote = true;
    } else {
      stream.write(`${line}\n`);
      lastPrinted = elapsed;
    }
  };
  const finish = (): void => {
    if (terminal && wrote) stream.write('\n');
  };
  return { onProgress, finish };
}

/** Where the walkers start: at the config's values, an earlier fit's posterior, or (default) a short nested run's. */
function walkerStartOf(args: FitArguments, nested: EvidenceSettings): FitWalkerStart {
  const from = args['posterior-from'];
  const atValues = args['start-at-values'] === true;
  if ([atValues, from !== undefined, args['start-live-points'] !== undefined].filter(Boolean).length > 1) {
    throw new InputError('--start-at-values, --posterior-from and --start-live-points each say where the walkers start: give one of them');
  }
  if (atValues) return 'configuredValues';
  if (from !== undefined) return { posteriorFrom: from };
  const livePoints = wholeNumberOption('start-live-points', args['start-live-points'] ?? runDefaults.ensemble.startLivePoints, 10);
  return { nestedRun: { ...nested, livePoints, maxEvaluations: undefined } };
}

/** The ensemble settings from the options, checked. */
function ensembleSettingsOf(
  args: FitArguments, nested: EvidenceSettings, onProgress: EnsembleFitSettings['onProgress'],
): FitEnsembleSettings {
  const minEss = args['min-ess'] ?? runDefaults.ensemble.minEffectiveSampleSize;
  if (!(minEss > 0) || !Number.isFinite(minEss)) throw new InputError(`--min-ess: ${expectedFound('a number > 0', minEss)}`);
  const maxRHat = args['max-rhat'] ?? runDefaults.ensemble.maxRHat;
  if (!(maxRHat > 1) || !Number.isFinite(maxRHat)) throw new InputError(`--max-rhat: ${expectedFound('a number > 1', maxRHat)}`);
  return {
    seed: nested.seed,
    threads: nested.threads,
    walkers: args.walkers === undefined ? undefined : wholeNumberOption('walkers', args.walkers, 4),
    maxSweeps: wholeNumberOption('max-sweeps', args['max-sweeps'] ?? runDefaults.ensemble.maxSweeps, 1),
    stopRule: { minEffectiveSampleSize: minEss, maxRHat },
    proposal: args.proposal ?? runDefaults.ensemble.proposal,
    start: walkerStartOf(args, nested),
    checkpointSeconds: nested.checkpointSeconds,
    resume: args.resume,
    onProgress,
    signal: nested.signal,
  };
}

export const fitCommand: CommandModule<object, FitArguments> = {
  command: 'fit',
  describe: 'Fit one lens model (smooth, or with the config\'s perturbers) by nested sampling or ensemble MCMC',
  builder: (y) => withSamplerOptions(withDataOptions(y
    .option('config', { type: 'string', demandOption: true, describe: 'model config (YAML or JSON) with priors' })
    .option('out', { type: 'string', describe: 'output folder [default: chains/<config name>-fit]' })
    .option('report', { type: 'boolean', default: true, describe: 'write report.html and figures at the end (--no-report to skip)' })
    .option('perturbers', { type: 'number', describe: 'how many of the config\'s perturbers the model holds (0 = smooth) [default: all]' })
    .option('sampler', { choices: ['nested', 'ensemble'] as const, default: 'nested' as const, describe: 'nested sampling (ln Z and posterior) or ensemble MCMC (posterior only)' })
    .option('walkers', { type: 'number', describe: 'ensemble: walkers, even and >= 2 x free parameters [default: max(4, 2 x free + 2)]' })
    .option('max-sweeps', { type: 'number', describe: `ensemble: largest number of sweeps (a sweep proposes a move to every walker once) [default: ${runDefaults.ensemble.maxSweeps}]` })
    .option('min-ess', { type: 'number', describe: `ensemble: stop once every free parameter's bulk and tail effective sample size reach this, and R-hat is within --max-rhat [default: ${runDefaults.ensemble.minEffectiveSampleSize}]` })
    .option('max-rhat', { type: 'number', describe: `ensemble: largest rank-normalised split R-hat (walkers as chains) of a mixed run [default: ${runDefaults.ensemble.maxRHat}]` })
    .option('proposal', { choices: PROPOSAL_KINDS, describe: `ensemble: how walkers propose moves: stretch (Goodman & Weare 2010) or differentialEvolution (ter Braak 2006) [default: ${runDefaults.ensemble.proposal}]` })
    .option('posterior-from', { type: 'string', describe: 'ensemble: start the walkers at posterior draws of an earlier fit of the same model (its folder, or its posterior-draws.csv or walker-paths.csv) [default: of a short nested run made first]' })
    .option('start-live-points', { type: 'number', describe: `ensemble: live points of that short nested run, made in OUT/nested-start [default: ${runDefaults.ensemble.startLivePoints}]` })
    .option('start-at-values', { type: 'boolean', describe: 'ensemble: start the walkers at the config\'s values instead, spread by 1e-3 of each prior\'s width' })), { livePoints: runDefaults.nested.livePoints })
    .example('$0 fit --config configs/demo.yaml --data chains/mock --perturbers 0', 'nested-sampling fit of the smooth model')
    .example('$0 fit --config configs/demo.yaml --data chains/mock --sampler ensemble --posterior-from chains/demo-fit --out chains/demo-mcmc', 'ensemble MCMC started at the posterior of a nested fit'),
  handler: async (args) => {
    const config = loadConfig(args.config);
    const perturberCount = fitPerturberCount(config, args.perturbers === undefined ? undefined : wholeNumberOption('perturbers', args.perturbers, 0));
    if (args.sampler === 'nested') {
      for (const option of ENSEMBLE_ONLY) {
        if (args[option] !== undefined) throw new InputError(`--${option} applies to --sampler ensemble, not to nested sampling`);
      }
    }
    const out = args.out ?? join('chains', `${basename(args.config, extname(args.config))}-fit`);
    await inOutputFolder(out, args, FIT_CHECKPOINT_FOLDERS, undefined, () => fitIntoFolder(args, config, perturberCount, out));
  },
};

/** The fit itself, into a folder the command holds. */
async function fitIntoFolder(args: FitArguments, config: ArcsiftConfig, perturberCount: number, out: string): Promise<void> {
  const data = loadDataOf(args, config);
  const label = perturberCount === 0 ? 'smooth' : 'perturbed';
  const nested = evidenceSettingsOf(args, label);
  let summary: NestedFitSummary | EnsembleFitSummary;
  let text: string;
  if (args.sampler === 'nested') {
    const outcome = await runFitToFolder(config, data, out, { sampler: 'nested', perturberCount, nested: nested.settings });
    nested.finish();
    summary = outcome.summary as NestedFitSummary;
    text = formatNestedFit(summary);
  } else {
    const printer = ensembleProgressPrinter(label, { quiet: args.quiet });
    const ensemble = ensembleSettingsOf(args, nested.settings, printer.onProgress);
    const outcome = await runFitToFolder(config, data, out, { sampler: 'ensemble', perturberCount, ensemble });
    printer.finish();
    summary = outcome.summary as EnsembleFitSummary;
    text = formatEnsembleFit(summary);
  }
  process.stdout.write(`${text}\n\nwrote ${join(out, 'summary.json')} and the samples, corner data and images under ${out}\n`);
  if (args.report) process.stdout.write(`report: ${writeReport(out)}\n`);
  reportUnfinished(summary, join(out, 'summary.json'));
}
