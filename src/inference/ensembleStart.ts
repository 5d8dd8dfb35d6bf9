import { existsSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { InputError, describeValue } from '../errors.js';
import type { LensSystem } from '../model/lensSystem.js';
import type { EnsembleStart } from '../sampling/ensemble/index.js';
import type { ParameterSpace } from '../priors/parameterSpace.js';
import type { Prior } from '../priors/prior.js';
import { POSTERIOR_TABLES } from '../records/posteriorTables.js';
import { readPosteriorTable } from '../records/readPosteriorTable.js';

/** Radius of the starting ball as a fraction of each prior's width (sigma for normal priors). */
export const startBallFraction = 1e-3;

/**
 * Width a prior's starting ball is a fraction of: upper - lower for bounded priors; sigma for a
 * normal prior (its support is unbounded) and the smaller of sigma and upper - lower for a
 * truncated normal.
 */
function priorWidth(prior: Prior): number {
  const spec = prior.spec;
  if (spec.kind === 'normal') return spec.sigma;
  if (spec.kind === 'truncatedNormal') return Math.min(spec.sigma, spec.upper - spec.lower);
  return prior.upper - prior.lower;
}

/**
 * The walkers' start as a Gaussian ball around the config's values: each free parameter's
 * `value` where the config gives one, otherwise its prior's median (fromUnit(0.5)), with a
 * standard deviation of 1e-3 of the prior's width (1e-3 sigma for normal priors). A centre
 * outside its prior is a user mistake, reported against the parameter's key.
 */
export function ballAroundConfiguredValues(system: LensSystem, space: ParameterSpace): EnsembleStart {
  const center = new Float64Array(space.dim);
  const scale = new Float64Array(space.dim);
  for (let k = 0; k < space.dim; k++) {
    const index = space.freeIndices[k];
    const prior = space.priors[index];
    const value = system.parameters[index].value;
    center[k] = value ?? prior.fromUnit(0.5);
    scale[k] = startBallFraction * priorWidth(prior);
    if (!(prior.logDensity(center[k]) > -Infinity)) {
      throw new InputError(
        `the value ${describeValue(value)} lies outside its prior [${prior.lower}, ${prior.upper}], so the walkers cannot start there`,
        { file: system.file, key: space.names[index] },
      );
    }
  }
  return { ball: { center, scale } };
}

/**
 * The posterior draws of a finished run in `folder`: a nested fit's posterior-draws.csv, else an
 * ensemble fit's walker-paths.csv (or `folder` itself when it is a file).
 */
export function startSamplesFile(folder: string): string {
  if (existsSync(folder) && statSync(folder).isFile()) return folder;
  const draws = join(folder, `${POSTERIOR_TABLES.draws}.csv`);
  const paths = join(folder, `${POSTERIOR_TABLES.walkerPaths}.csv`);
  return existsSync(draws) || !existsSync(paths) ? draws : paths;
}

/**
 * The walkers' start as a pick of posterior draws of an earlier run (posterior-draws.csv of a
 * nested fit, or walker-paths.csv of an ensemble fit): its parameter columns must be the model's,
 * in the model's order, and it must hold at least one draw per walker.
 */
export function startFromSamples(folder: string, space: ParameterSpace, walkers: number): EnsembleStart {
  const table = readPosteriorTable(startSamplesFile(folder));
  const same = table.names.length === space.names.length && table.names.every((name, c) => name === space.names[c]);
  if (!same) {
    const at = space.names.findIndex((name, c) => table.names[c] !== name);
    const column = at < 0 ? space.names.length : at;
    throw new InputError(
      `the samples were drawn for another model: expected the ${space.names.length} columns ${space.names.join(', ')}; ` +
        `found ${table.names.length} columns, column ${column + 1} being ${describeValue(table.names[column])}` +
        ` (start from a run of the same config and --perturbers)`,
      { file: table.file },
    );
  }
  if (table.count < walkers) {
    throw new InputError(`expected at least ${walkers} samples, one per walker, found ${table.count}`, { file: table.file });
  }
  const points = new Float64Array(table.count * space.dim);
  for (let r = 0; r < table.count; r++) space.toFree(table.points, points, r * space.physicalDim, r * space.dim);
  return { points };
}
