import { existsSync } from 'node:fs';
import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { ImagePlaneSky } from '../data/imagePlaneSky.js';
import { InputError, expectedFound } from '../errors.js';
import { writeJsonAtomic } from '../io/writeFileAtomic.js';
import type { PriorDescription } from '../priors/parameterSpace.js';
import { amplitudePriorText } from './amplitudePriorText.js';
import { summarisePerturbers } from './perturberSummary.js';
import { runModelEnsemble, type EnsembleFitSettings, type EnsembleWalkerStart, type ModelEnsemble } from './runModelEnsemble.js';
import { runModelEvidence, type EvidenceSettings, type ModelEvidence } from './runModelEvidence.js';
import { writeEnsembleOutputs } from './writeEnsembleOutputs.js';
import { writeModelOutputs } from './writeModelOutputs.js';
import { priorCaution } from '../records/cautions.js';
import type { EnsembleRecord } from '../records/ensembleRecord.js';
import type { EnsembleFitSummary, NestedFitSummary } from '../records/fitSummary.js';
import type { ModelRecord } from '../records/modelRecord.js';
import type { PerturberSummary } from '../records/perturberSummary.js';
import { runProvenance } from '../records/provenance.js';
import { unfinishedRuns } from '../records/unfinishedRuns.js';
import { POSTERIOR_SIDECAR, POSTERIOR_TABLES } from '../records/posteriorTables.js';

/** How one model is fitted: nested sampling (evidence and posterior) or ensemble MCMC (posterior only). */
export type FitSettings =
  | {
    readonly sampler: 'nested';
    /** How many of the config's perturbers the model holds (default: all; 0 = smooth). */
    readonly perturberCount?: number;
    readonly nested: EvidenceSettings;
  }
  | {
    readonly sampler: 'ensemble';
    readonly perturberCount?: number;
    readonly ensemble: FitEnsembleSettings;
  };

/** An ensemble fit's settings, its walkers' start as a fit allows. */
export type FitEnsembleSettings = Omit<EnsembleFitSettings, 'start'> & { readonly start: FitWalkerStart };

/**
 * Where an ensemble fit's walkers start: as the ensemble sampler allows, or (arcsift's default)
 * at draws of the posterior of a short nested run of the same model made first into the fit's
 * folder (NESTED_START_FOLDER), with these settings.
 */
export type FitWalkerStart = EnsembleWalkerStart | { readonly nestedRun: EvidenceSettings };

/** The sub-folder of an ensemble fit that holds the nested run its walkers start from. */
export const NESTED_START_FOLDER = 'nested-start';


export type FitOutcome =
  | { readonly sampler: 'nested'; readonly summary: NestedFitSummary; readonly run: ModelEvidence }
  | { readonly sampler: 'ensemble'; readonly summary: EnsembleFitSummary; readonly run: ModelEnsemble };

/** The checkpoint of a fit in `folder` (either sampler). */
export function fitCheckpointPath(folder: string): string {
  return join(folder, 'checkpoint.json');
}

/** The folders of a fit that may hold a checkpoint ('' is the fit's own folder). */
export const FIT_CHECKPOINT_FOLDERS: readonly string[] = ['', NESTED_START_FOLDER];

/** The number of perturbers a fit holds: all of the config's by default; more than it lists is a user mistake. */
export function fitPerturberCount(config: ArcsiftConfig, requested?: number): number {
  const available = config.perturbers.length;
  if (requested === undefined) return available;
  if (!Number.isInteger(requested) || requested < 0) {
    throw new InputError(`the number of perturbers to fit: ${expectedFound('a whole number >= 0', requested)}`, { file: config.file, key: 'perturbers' });
  }
  if (requested > available) {
    throw new InputError(
      `the number of perturbers to fit: ${expectedFound(`at most ${available}, the number listed under perturbers`, requested)}`,
      { file: config.file, key: 'perturbers' },
    );
  }
  return requested;
}

/**
 * The walkers' start of an ensemble fit in `folder`: with a nested run first, that run is made
 * (or resumed from its checkpoint, or taken as it is when its posterior tables are there) into
 * NESTED_START_FOLDER, and the walkers start at its posterior draws.
 */
async function walkerStart(
  config: ArcsiftConfig, data: ObservedData, folder: string, perturberCount: number, start: FitWalkerStart,
): Promise<EnsembleWalkerStart> {
  if (start === 'configuredValues' || 'posteriorFrom' in start) return start;
  const startFolder = join(folder, NESTED_START_FOLDER);
  const done = existsSync(join(startFolder, `${POSTERIOR_TABLES.draws}.csv`)) && existsSync(join(startFolder, POSTERIOR_SIDECAR));
  if (!done) {
    const run = await runModelEvidence(config, data, perturberCount, { ...start.nestedRun, checkpointPath: join(startFolder, 'checkpoint.json') });
    writeModelOutputs(run, config, data, startFolder, start.nestedRun.seed);
  }
  return { posteriorFrom: startFolder };
}

/** Settings as JSON: callbacks and stop signals left out. */
function plainSettings(settings: EvidenceSettings): Record<string, unknown> {
  const { onProgress: _progress, signal: _signal, ...plain } = settings;
  return plain;
}

/**
 * Fits one model (the config's first perturberCount perturbers) and writes everything into
 * `folder`: with nested sampling the weighted and equal-weight posterior tables, with ensemble
 * MCMC the chain after burn-in (walker-paths); corner-plot data, best-fit model and residual images, a
 * checkpoint (checkpoint.json), and summary.json last, so a summary exists only for a finished run.
 */
export async function runFitToFolder(
  config: ArcsiftConfig, data: ObservedData, folder: string, settings: FitSettings,
): Promise<FitOutcome> {
  const started = performance.now();
  const perturberCount = fitPerturberCount(config, settings.perturberCount);
  const checkpointPath = fitCheckpointPath(folder);
  const common = {
    kind: 'fit' as const,
    perturberCount,
    amplitudePrior: amplitudePriorText(config),
    caution: priorCaution,
  };
  if (settings.sampler === 'nested') {
    const run = await runModelEvidence(config, data, perturberCount, { ...settings.nested, checkpointPath });
    const model = writeModelOutputs(run, config, data, folder, settings.nested.seed);
    const summary: NestedFitSummary = {
      ...common,
      ...runProvenance(config, data, settings.nested.seed, started, unfinishedRuns([{ label: run.label, stopReason: run.result.stopReason }])),
      sampler: 'nested',
      settings: { ...plainSettings(settings.nested), checkpointPath },
      priors: run.space.describe(),
      evidence: { lnEvidence: model.lnEvidence, lnEvidenceError: model.lnEvidenceError, lnEvidenceErrorSimulated: model.lnEvidenceErrorSimulated },
      model,
      perturbers: summarisePerturbers(run, ImagePlaneSky.of(data)),
    };
    writeJsonAtomic(join(folder, 'summary.json'), summary);
    return { sampler: 'nested', summary, run };
  }
  const start = await walkerStart(config, data, folder, perturberCount, settings.ensemble.start);
  const ran = await runModelEnsemble(config, data, perturberCount, { ...settings.ensemble, start, checkpointPath });
  const nestedRun = settings.ensemble.start !== 'configuredValues' && 'nestedRun' in settings.ensemble.start ? settings.ensemble.start.nestedRun : undefined;
  const run: ModelEnsemble = nestedRun === undefined ? ran : {
    ...ran,
    start: `posterior draws of a nested run of the same model made first (${nestedRun.livePoints} live points), in ${join(folder, NESTED_START_FOLDER)}`,
  };
  const model = writeEnsembleOutputs(run, config, data, folder);
  const { start: _start, onProgress: _progress, signal: _signal, ...ensembleSettings } = settings.ensemble;
  const summary: EnsembleFitSummary = {
    ...common,
    ...runProvenance(config, data, settings.ensemble.seed, started, run.result.converged ? [] : [`${run.label} ensemble (sweep limit reached before the walkers mixed)`]),
    sampler: 'ensemble',
    settings: { ...ensembleSettings, walkers: run.result.walkers, checkpointPath },
    priors: run.space.describe(),
    model,
  };
  writeJsonAtomic(join(folder, 'summary.json'), summary);
  return { sampler: 'ensemble', summary, run };
}
