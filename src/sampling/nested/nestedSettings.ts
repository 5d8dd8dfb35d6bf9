import { InputError, expectedFound } from '../../errors.js';
import type { NestedMethod, NestedOptions, NestedProblem } from './nestedProblem.js';
import type { NestedSettings } from './nestedState.js';
import { runDefaults } from '../../settings/runDefaults.js';
import { resolveImportanceSettings } from '../importance/importanceSettings.js';

/**
 * 'auto' uses ellipsoids up to this many dimensions and slice sampling above. From
 * `npm run bench -- samplers` (400 live points): on the Gaussian shells ellipsoids need 27x fewer
 * evaluations than slice sampling in 10 dimensions (55 k against 1.46 M) and still 8x fewer in 20
 * (0.79 M against 6.3 M), but on a curved 10-dimensional degeneracy (twisted Gaussian) they need
 * 9x more (15.9 M against 1.7 M), and their coverage rests on clusters of many more points than
 * dimensions, which grows harder above 10.
 */
export const autoEllipsoidMaxDim = 10;

/**
 * Default ellipsoid volume enlargement factor on top of each ellipsoid's bootstrap expansion. With
 * the bootstrap, 1 already gave unbiased ln Z on Gaussian shells (2, 5, 10 dimensions), a
 * 10-dimensional Gaussian and the egg-box (mean pull within 0.4 of zero over 6-20 seeds each).
 */
export const defaultEnlargement = 1;

/** Bootstrap resamples behind each ellipsoid's expansion (see bootstrapExpansion). */
export const ellipsoidBootstraps = 5;

function positiveInteger(value: number | undefined, fallback: number, key: string, minimum = 1): number {
  if (value === undefined) return fallback;
  if (!Number.isInteger(value) || value < minimum) {
    throw new InputError(`nested sampling ${key}: ${expectedFound(`an integer >= ${minimum}`, value)}`);
  }
  return value;
}

export function resolveNestedSettings(problem: NestedProblem, options: NestedOptions): NestedSettings {
  const dim = positiveInteger(problem.dim, 0, 'problem.dim');
  const physicalDim = positiveInteger(problem.physicalDim, 0, 'problem.physicalDim');
  const livePoints = positiveInteger(options.livePoints, runDefaults.nested.livePoints, 'livePoints', 2);
  const seed = positiveInteger(options.seed, 1, 'seed');
  if (seed > 0xffffffff) throw new InputError(`nested sampling seed: ${expectedFound('an integer from 1 to 4294967295', seed)}`);
  const replacementsPerStep = positiveInteger(options.replacementsPerStep, 1, 'replacementsPerStep');
  if (replacementsPerStep >= livePoints) {
    throw new InputError(`nested sampling replacementsPerStep: ${expectedFound(`fewer than livePoints (${livePoints})`, replacementsPerStep)}`);
  }
  const requested: NestedMethod = options.method ?? 'auto';
  if (requested !== 'auto' && requested !== 'ellipsoids' && requested !== 'slice') {
    throw new InputError(`nested sampling method: ${expectedFound('"auto", "ellipsoids" or "slice"', requested)}`);
  }
  const method = requested === 'auto' ? (dim <= autoEllipsoidMaxDim ? 'ellipsoids' : 'slice') : requested;
  const enlargement = options.enlargement ?? defaultEnlargement;
  if (!(enlargement >= 1) || !Number.isFinite(enlargement)) {
    throw new InputError(`nested sampling enlargement: ${expectedFound('a finite number >= 1', enlargement)}`);
  }
  const sliceSteps = positiveInteger(options.slice?.steps, 5 * dim, 'slice.steps');
  const slicePointsPerChain = positiveInteger(options.slice?.pointsPerChain, 1, 'slice.pointsPerChain');
  const periodic = problem.periodic === undefined ? new Array<boolean>(dim).fill(false) : Array.from(problem.periodic);
  if (periodic.length !== dim) {
    throw new InputError(`nested sampling problem.periodic: ${expectedFound(`a list of ${dim} booleans`, problem.periodic)}`);
  }
  const evidence = options.evidence ?? runDefaults.nested.evidence;
  if (evidence !== 'nested' && evidence !== 'importance') {
    throw new InputError(`nested sampling evidence: ${expectedFound('"nested" or "importance"', evidence)}`);
  }
  const boundVolumeFactorForTesting = options.boundVolumeFactorForTesting ?? 1;
  if (!(boundVolumeFactorForTesting > 0)) {
    throw new InputError(`nested sampling boundVolumeFactorForTesting: ${expectedFound('a positive number', boundVolumeFactorForTesting)}`);
  }
  return {
    dim,
    physicalDim,
    livePoints,
    seed,
    method,
    replacementsPerStep,
    enlargement,
    minimumClusterSize: dim + 1,
    bootstraps: ellipsoidBootstraps,
    boundUpdateInterval: Math.max(1, Math.round(livePoints / 10)),
    sliceSteps,
    slicePointsPerChain,
    sliceClusters: options.slice?.clusters ?? evidence === 'importance',
    sliceWidthScale: Math.sqrt(dim + 2),
    periodic,
    boundVolumeFactorForTesting,
    evidence,
    importance: evidence === 'importance' ? resolveImportanceSettings(options.importance) : null,
  };
}
