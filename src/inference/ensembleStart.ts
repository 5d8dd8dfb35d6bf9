import { existsSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { InputError, describeValue } from '../errors.js';
import type { LensSystem } from '../model/lensSystem.js';
import type { EnsembleStart } from '../sampling/ensemble/index.js';
import type { ParameterSpace } from '../priors/parameterSpace.js';
import type { Prior } from '../priors/prior.js';
import { POSTERIOR_TABLES } from '../records/posteriorTables.js';
import { readPosteriorTable } from '../records/readPosteriorTable.js';

/** Spread of the start at the config's values, as a fraction of each prior's width (sigma for normal priors). */
export const configuredStartFraction = 1e-3;

/**
 * Width a prior's start spread is a fraction of: upper - lower for bounded priors; sigma for a
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
 * The walkers' start at the config's values: each free parameter's `value` where the config gives
 * one, otherwise its prior's median (fromUnit(0.5)), spread by a Gaussian of 1e-3 of the prior's
 * width (1e-3 sigma for normal priors). A value outside its prior is a user mistake, reported
 * against the parameter's key.
 */
export function startAtConfiguredValues(system: LensSystem, space: ParameterSpace): EnsembleStart {
  const center = new Float64Array(space.dim);
  const spread = new Float64Array(space.dim);
  for (let k = 0; k < space.dim; k++) {
    const index = space.freeIndices[k];
    const prior = space.priors[index];
    const value = system.parameters[index].value;
    center[k] = value ?? prior.fromUnit(0.5);
    spread[k] = configuredStartFraction * priorWidth(prior);
    if (!(prior.logDensity(center[k]) > -Infinity)) {
      throw new InputError(
        `the value ${describeValue(value)} lies outside its prior [${prior.lower}, ${prior.upper}], so the walkers cannot start there`,
        { file: system.file, key: space.names[index] },
      );
    }
  }
  return { around: { center, spread } };
}

/**
 * The posterior table of a finished fit in `source`: a nested fit's posterior-draws.csv, else an
 * ensemble fit's walker-paths.csv (or `source` itself when it is a file).
 */
export function posteriorDrawsFile(source: string): string {
  if (existsSync(source) && statSync(source).isFile()) return source;
  const draws = join(source, `${POSTERIOR_TABLES.draws}.csv`);
  const paths = join(source, `${POSTERIOR_TABLES.walkerPaths}.csv`);
  return existsSync(draws) || !existsSync(paths) ? draws : paths;
}

/**
 * The walkers' start as a pick of posterior draws of an earlier fit (posterior-draws.csv of a
 * nested fit, or walker-paths.csv of an ensemble fit): its parameter columns must be the model's,
 * in the model's order, and it must hold at least one draw per walker.
 */
export function startFromPosterior(source: string, space: ParameterSpace, walkers: number): EnsembleStart {
  const table = readPosteriorTable(posteriorDrawsFile(source));
  const same = table.names.length === space.names.length && table.names.every((name, c) => name === space.names[c]);
  if (!same) {
    const at = space.names.findIndex((name, c) => table.names[c] !== name);
    const column = at < 0 ? space.names.length : at;
    throw new InputError(
      `the posterior was drawn for another model: expected the ${space.names.length} parameters ${space.names.join(', ')}; ` +
        `found ${table.names.length}, parameter ${column + 1} being ${describeValue(table.names[column])}` +
        ` (start from a fit of the same config and --perturbers)`,
      { file: table.file },
    );
  }
  if (table.count < walkers) {
    throw new InputError(`expected at least ${walkers} posterior draws, one per walker, found ${table.count}`, { file: table.file });
  }
  const points = new Float64Array(table.count * space.dim);
  for (let r = 0; r < table.count; r++) space.toFree(table.points, points, r * space.physicalDim, r * space.dim);
  return { draws: points };
}
