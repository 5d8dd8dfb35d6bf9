import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { ImagePlaneSky } from '../data/imagePlaneSky.js';
import { InputError } from '../errors.js';
import { bayesFactorReading, significanceBound, type BayesFactorReading, type SignificanceBound } from '../results/index.js';
import type { PriorDescription } from '../priors/parameterSpace.js';
import { awaitAllRuns } from './awaitAllRuns.js';
import { summarisePerturbers } from './perturberSummary.js';
import { comparisonMethod, runModelEvidence, type EvidenceSettings, type ModelEvidence } from './runModelEvidence.js';
import { LikelihoodPool } from '../parallel/likelihoodPool.js';
import type { PerturberSummary } from '../records/perturberSummary.js';
import { runDefaults } from '../settings/runDefaults.js';


/** The smooth-versus-perturbed comparison and its reading. */
export interface Comparison {
  readonly smooth: ModelEvidence;
  readonly perturbed: ModelEvidence;
  /** ln Z_perturbed - ln Z_smooth. */
  readonly lnBayesFactor: number;
  /** Errors of the two ln Z added in quadrature (Skilling's estimate). */
  readonly lnBayesFactorError: number;
  readonly reading: BayesFactorReading;
  readonly significance: SignificanceBound;
  readonly perturberFavoured: boolean;
  readonly perturbers: readonly PerturberSummary[];
  /** The priors behind each evidence: a Bayes factor means nothing without them. */
  readonly priors: { readonly smooth: readonly PriorDescription[]; readonly perturbed: readonly PriorDescription[] };
  readonly amplitudePriorSigma: number;
}

export interface ComparisonSettings {
  readonly smooth: EvidenceSettings;
  readonly perturbed: EvidenceSettings;
  /** How many of the config's perturbers the perturbed model holds (default 1). */
  readonly perturberCount?: number;
  /** The detection claim's threshold in ln B (default runDefaults.detection.lnBayesFactorThreshold). */
  readonly detectionThresholdLnB?: number;
  /** Called as each run starts (both at once when they run side by side, see comparisonSideBySide). */
  readonly onModelStart?: (label: string) => void;
}

/** True when compareModels runs the two models at once (two threads or more for each model's settings). */
export function comparisonSideBySide(settings: Pick<ComparisonSettings, 'smooth' | 'perturbed'>): boolean {
  return settings.smooth.threads >= 2 && settings.perturbed.threads >= 2;
}

/** Nested sampling of the smooth and the perturbed model, and the Bayes factor between them. */
export async function compareModels(config: ArcsiftConfig, data: ObservedData, settings: ComparisonSettings): Promise<Comparison> {
  const perturberCount = settings.perturberCount ?? 1;
  if (config.perturbers.length < perturberCount) {
    throw new InputError(
      `comparing needs ${perturberCount} perturber(s) under perturbers, found ${config.perturbers.length}`,
      { file: config.file, key: 'perturbers' },
    );
  }
  const method = comparisonMethod(config, perturberCount, settings.perturbed);
  // The two runs do not depend on each other: with two threads or more they go side by side,
  // sharing one pool of workers that hold both models, so a worker freed by one run's slice
  // chain takes the other's, and the run that finishes last gets every worker. Each result
  // depends on its seed alone.
  let smooth: ModelEvidence;
  let perturbed: ModelEvidence;
  if (comparisonSideBySide(settings)) {
    const threads = Math.max(settings.smooth.threads, settings.perturbed.threads);
    const pool = await LikelihoodPool.start([{ config, data, perturberCount: 0 }, { config, data, perturberCount }], threads);
    try {
      settings.onModelStart?.('smooth');
      settings.onModelStart?.('perturbed');
      [smooth, perturbed] = await awaitAllRuns([
        runModelEvidence(config, data, 0, { ...settings.smooth, method }, { pool: pool.model(0) }),
        runModelEvidence(config, data, perturberCount, { ...settings.perturbed, method }, { pool: pool.model(1) }),
      ]);
    } finally {
      await pool.close();
    }
  } else {
    settings.onModelStart?.('smooth');
    smooth = await runModelEvidence(config, data, 0, { ...settings.smooth, method });
    settings.onModelStart?.('perturbed');
    perturbed = await runModelEvidence(config, data, perturberCount, { ...settings.perturbed, method });
  }
  return readComparison(smooth, perturbed, config, data);
}

/** The Bayes factor of two finished runs of one config (smooth and perturbed) and its reading. */
export function readComparison(smooth: ModelEvidence, perturbed: ModelEvidence, config: ArcsiftConfig, data: ObservedData): Comparison {
  const lnBayesFactor = perturbed.result.lnZ - smooth.result.lnZ;
  const lnBayesFactorError = Math.hypot(perturbed.result.lnZError, smooth.result.lnZError);
  return {
    smooth,
    perturbed,
    lnBayesFactor,
    lnBayesFactorError,
    reading: bayesFactorReading(lnBayesFactor),
    significance: significanceBound(lnBayesFactor),
    perturberFavoured: lnBayesFactor > runDefaults.comparison.favouredLnBayesFactor,
    perturbers: summarisePerturbers(perturbed, ImagePlaneSky.of(data)),
    priors: { smooth: smooth.space.describe(), perturbed: perturbed.space.describe() },
    amplitudePriorSigma: config.amplitudePriorSigma,
  };
}
