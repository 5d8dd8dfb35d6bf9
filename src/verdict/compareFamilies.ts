import { awaitAllRuns } from '../inference/awaitAllRuns.js';
import type { ObservedData } from '../data/observedData.js';
import { InputError } from '../errors.js';
import { inFamily, type SmoothFamily } from '../config/verdictConfig.js';
import { readComparison, type Comparison } from '../inference/compareModels.js';
import { comparisonMethod, runModelEvidence, type EvidenceSettings, type ModelEvidence } from '../inference/runModelEvidence.js';
import { buildLensSystem } from '../model/lensSystem.js';
import { modelParameterSpace } from '../model/modelParameterSpace.js';
import { LikelihoodPool } from '../parallel/likelihoodPool.js';

/** The two models of a family. */
export type FamilyModel = 'smooth' | 'perturbed';

/** Settings of the families' runs. */
export interface FamilySettings {
  /**
   * Nested-sampling settings of one run, by family and model (a function, so that each run gets
   * its own progress printer and checkpoint). Every run takes the thread count of the first.
   */
  readonly evidence: (family: SmoothFamily, model: FamilyModel) => EvidenceSettings;
  /** How many of the config's perturbers the perturbed models hold (default 1). */
  readonly perturberCount?: number;
  /** Called as each run starts (all at once when they run side by side). */
  readonly onRunStart?: (family: SmoothFamily, model: FamilyModel) => void;
}

/** One family's comparison. */
export interface FamilyComparison {
  readonly family: SmoothFamily;
  readonly comparison: Comparison;
}

/**
 * Builds every family's smooth and perturbed model before any run, so that a mistake in any of
 * them stops the verdict at once, naming the family's key (config/verdictConfig.ts inFamily).
 * Returns each family's constrained-draw method, chosen as compareModels does from its perturbed
 * model and used for both its runs (their Bayes factor then carries no difference of biases).
 */
export function checkFamilies(families: readonly SmoothFamily[], settings: Pick<FamilySettings, 'evidence' | 'perturberCount'>): EvidenceSettings['method'][] {
  const perturberCount = settings.perturberCount ?? 1;
  return families.map((family) => {
    if (family.config.perturbers.length < perturberCount) {
      throw new InputError(`comparing needs ${perturberCount} perturber(s) under perturbers, found ${family.config.perturbers.length}`, { file: family.config.file, key: 'perturbers' });
    }
    try {
      modelParameterSpace(buildLensSystem(family.config, { perturberCount: 0 }));
      return comparisonMethod(family.config, perturberCount, settings.evidence(family, 'perturbed'));
    } catch (error) {
      throw inFamily(error, family);
    }
  });
}

/**
 * The smooth-versus-perturbed comparison of every family on the same data. The 2F runs do not
 * depend on each other: with two threads or more they all go side by side on one pool of
 * workers that hold every model (each worker builds a model's likelihood when first asked for
 * it), so a worker freed by one run takes the next run's work and no thread idles while any run
 * still works; with one thread they run one after the other. Each run's result depends on its
 * own settings and seed alone, never on the thread count or the other runs.
 */
export async function compareFamilies(
  families: readonly SmoothFamily[], data: ObservedData, settings: FamilySettings,
): Promise<FamilyComparison[]> {
  const perturberCount = settings.perturberCount ?? 1;
  const methods = checkFamilies(families, settings);
  const runs = families.flatMap((family, f) => (['smooth', 'perturbed'] as const).map((model) => ({
    family, model, perturbers: model === 'smooth' ? 0 : perturberCount,
    settings: { ...settings.evidence(family, model), method: methods[f] },
  })));
  const threads = runs[0].settings.threads;
  let evidences: ModelEvidence[];
  if (threads >= 2) {
    const pool = await LikelihoodPool.start(runs.map((r) => ({ config: r.family.config, data, perturberCount: r.perturbers })), threads);
    try {
      // Every run ends (a stop request: each writes its last checkpoint) before any failure is passed on.
      evidences = await awaitAllRuns(runs.map((r, k) => {
        settings.onRunStart?.(r.family, r.model);
        return runModelEvidence(r.family.config, data, r.perturbers, r.settings, { pool: pool.model(k) });
      }));
    } finally {
      await pool.close();
    }
  } else {
    evidences = [];
    for (const r of runs) {
      settings.onRunStart?.(r.family, r.model);
      evidences.push(await runModelEvidence(r.family.config, data, r.perturbers, r.settings));
    }
  }
  return families.map((family, f) => ({ family, comparison: readComparison(evidences[2 * f], evidences[2 * f + 1], family.config, data) }));
}
