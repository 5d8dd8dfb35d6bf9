import type { CommandModule } from 'yargs';
import { basename, extname, join } from 'node:path';
import { loadConfig } from '../config/arcsiftConfig.js';
import { writeReport } from '../report/writeReport.js';
import { InputError, expectedFound } from '../errors.js';
import { fitPerturberCount, runFitToFolder } from '../inference/runFitToFolder.js';
import type { EnsembleFitSettings } from '../inference/runModelEnsemble.js';
import { runDefaults } from '../settings/runDefaults.js';
import type { EnsembleMoveKind, EnsembleProgress } from '../sampling/ensemble/index.js';
import { loadDataOf, wholeNumberOption, withDataOptions, type DataArguments } from './dataOptions.js';
import { formatPriors } from './formatComparison.js';
import { formatSky } from './formatSky.js';
import { evidenceSettingsOf, withSamplerOptions, type SamplerArguments } from './samplerOptions.js';
import type { EnsembleFitSummary, NestedFitSummary } from '../records/fitSummary.js';
import type { ModelRecord } from '../records/modelRecord.js';
import { checkOutputFolder } from '../inference/checkOutputFolder.js';

interface FitArguments extends DataArguments, SamplerArguments {
  config: string;
  report: boolean;
  out?: string;
  perturbers?: number;
  sampler: 'nested' | 'ensemble';
  walkers?: number;
  steps: number;
  'target-autocorrelation-times': number;
  move: EnsembleMoveKind;
  'start-from'?: string;
}

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
  return [`Priors behind ${what}:`, ...formatPriors(summary.priors), `    amplitudes: ${summary.amplitudePrior}`, '', `Caution: ${summary.caution}`];
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
  const stop = m.converged ? 'converged (autocorrelation rule)' : m.stopped ? 'stopped on request' : 'step limit reached';
  const lines = [
    `Fit of the ${m.label} model by ensemble MCMC (${m.walkers} walkers, ${m.iterations} iterations, ${stop})`,
    `  ${m.evaluations} likelihood evaluations, ${m.seconds.toFixed(0)} s on ${m.threads} thread(s); burn-in ${m.burnInSteps * m.thin} iterations left out; ` +
      `acceptance fraction mean ${m.acceptanceFraction.mean.toFixed(3)}, min ${m.acceptanceFraction.min.toFixed(3)}`,
    `  chain after burn-in: ${formatValue(m.chainLengthInAutocorrelationTimes)} autocorrelation times, ${m.retainedSamples} samples`,
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
    const tau = Number.isFinite(p.autocorrelationTimeMax) ? p.autocorrelationTimeMax.toFixed(1) : '?';
    const line = `${label}: iteration ${p.iteration}/${p.maxSteps}  acceptance ${(100 * p.acceptanceFraction).toFixed(1)}%  ` +
      `largest tau ${tau}  evaluations ${p.evaluations}  elapsed ${Math.round(elapsed)} s`;
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

/** The ensemble settings from the options, checked. */
function ensembleSettingsOf(args: FitArguments, seed: number, threads: number, onProgress: EnsembleFitSettings['onProgress']): EnsembleFitSettings {
  const target = args['target-autocorrelation-times'];
  if (!(target > 0) || !Number.isFinite(target)) {
    throw new InputError(`--target-autocorrelation-times: ${expectedFound('a number > 0', target)}`);
  }
  return {
    seed,
    threads,
    walkers: args.walkers === undefined ? undefined : wholeNumberOption('walkers', args.walkers, 4),
    maxSteps: wholeNumberOption('steps', args.steps, 1),
    targetAutocorrelationTimes: target,
    move: args.move,
    startFrom: args['start-from'],
    resume: args.resume,
    onProgress,
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
    .option('steps', { type: 'number', default: runDefaults.ensemble.maxSteps, describe: 'ensemble: largest number of iterations' })
    .option('target-autocorrelation-times', { type: 'number', default: runDefaults.ensemble.targetAutocorrelationTimes, describe: 'ensemble: stop once the chain after burn-in is this many autocorrelation times long' })
    .option('move', { choices: ['stretch', 'differentialEvolution'] as const, default: runDefaults.ensemble.move, describe: 'ensemble: proposal move' })
    .option('start-from', { type: 'string', describe: 'ensemble: start the walkers from the posterior draws of an earlier fit (its folder, or its posterior-draws.csv or walker-paths.csv) [default: a small ball around the config\'s values]' })), { livePoints: runDefaults.nested.livePoints })
    .example('$0 fit --config configs/demo.yaml --data chains/mock --perturbers 0', 'nested-sampling fit of the smooth model')
    .example('$0 fit --config configs/demo.yaml --data chains/mock --sampler ensemble --start-from chains/demo-fit --out chains/demo-mcmc', 'ensemble MCMC started from a nested fit'),
  handler: async (args) => {
    const config = loadConfig(args.config);
    const perturberCount = fitPerturberCount(config, args.perturbers === undefined ? undefined : wholeNumberOption('perturbers', args.perturbers, 0));
    if (args.sampler === 'nested') {
      for (const option of ['walkers', 'start-from'] as const) {
        if (args[option] !== undefined) throw new InputError(`--${option} applies to --sampler ensemble, not to nested sampling`);
      }
    }
    const out = args.out ?? join('chains', `${basename(args.config, extname(args.config))}-fit`);
    checkOutputFolder(out, args.resume, ['']);
    const data = loadDataOf(args, config);
    const label = perturberCount === 0 ? 'smooth' : 'perturbed';
    const nested = evidenceSettingsOf(args, label);
    let text: string;
    if (args.sampler === 'nested') {
      const { summary } = await runFitToFolder(config, data, out, { sampler: 'nested', perturberCount, nested: nested.settings });
      nested.finish();
      text = formatNestedFit(summary as NestedFitSummary);
    } else {
      const printer = ensembleProgressPrinter(label, { quiet: args.quiet });
      const ensemble = ensembleSettingsOf(args, nested.settings.seed, nested.settings.threads, printer.onProgress);
      const { summary } = await runFitToFolder(config, data, out, { sampler: 'ensemble', perturberCount, ensemble });
      printer.finish();
      text = formatEnsembleFit(summary as EnsembleFitSummary);
    }
    process.stdout.write(`${text}\n\nwrote ${join(out, 'summary.json')} and the samples, corner data and images under ${out}\n`);
    if (args.report) process.stdout.write(`report: ${writeReport(out)}\n`);
  },
};
