import { InputError, expectedFound } from '../../errors.js';
import type { SeededStream } from '../../numeric/random/seededStream.js';
import type { EnsembleProblem } from './ensembleProblem.js';
import type { EnsembleStart } from './ensembleOptions.js';
import { evaluateBatch } from './evaluateBatch.js';
import { wrapRows, type PeriodicTable } from './periodicWrap.js';

const GAUSSIAN_ROUNDS = 100;

export interface StartingEnsemble {
  readonly positions: Float64Array;
  readonly logDensities: Float64Array;
  readonly evaluations: number;
}

/**
 * Places the walkers: a random pick without replacement of the given draws (a non-finite one is
 * replaced by another unused draw), or center + spread * N(0, 1) per coordinate (walkers with a
 * non-finite log density are redrawn, up to 100 rounds). Periodic coordinates are wrapped into
 * their periods.
 */
export async function startingEnsemble(
  problem: EnsembleProblem, walkers: number, start: EnsembleStart, random: SeededStream,
  periodic: PeriodicTable | null,
): Promise<StartingEnsemble> {
  const dim = problem.dim;
  const positions = new Float64Array(walkers * dim);
  const logDensities = new Float64Array(walkers);
  const candidates = new Float64Array(walkers * dim);
  let evaluations = 0;
  let pending = Array.from({ length: walkers }, (_, w) => w);

  let fill: (slot: number) => boolean;
  if ('around' in start) {
    const { center, spread } = start.around;
    checkVector('start.around.center', center, dim, (x) => Number.isFinite(x), 'finite numbers');
    checkVector('start.around.spread', spread, dim, (x) => x > 0 && Number.isFinite(x), 'finite numbers > 0');
    let rounds = 0;
    fill = (slot) => {
      if (slot === 0 && ++rounds > GAUSSIAN_ROUNDS) return false;
      for (let d = 0; d < dim; d++) candidates[slot * dim + d] = center[d] + spread[d] * random.normal();
      return true;
    };
  } else if ('draws' in start) {
    const points = start.draws;
    const count = points instanceof Float64Array ? points.length / dim : Number.NaN;
    if (!Number.isInteger(count) || count < walkers) {
      throw new InputError(
        `ensemble start.draws: ${expectedFound(`at least ${walkers} draws of ${dim} values (a Float64Array)`,
          points instanceof Float64Array ? `${points.length} values` : points)}`,
      );
    }
    // Partial Fisher-Yates shuffle: each call takes the next point uniformly from those unused.
    const order = Int32Array.from({ length: count }, (_, i) => i);
    let used = 0;
    fill = (slot) => {
      if (used >= count) return false;
      const pick = used + random.integer(count - used);
      const chosen = order[pick];
      order[pick] = order[used];
      order[used] = chosen;
      used++;
      candidates.set(points.subarray(chosen * dim, (chosen + 1) * dim), slot * dim);
      return true;
    };
  } else {
    throw new InputError(`ensemble start: ${expectedFound('{ draws } or { around: { center, spread } }', start)}`);
  }

  while (pending.length > 0) {
    for (let slot = 0; slot < pending.length; slot++) {
      if (!fill(slot)) {
        throw new InputError(
          `ensemble start: expected a finite log posterior for every walker, found ${pending.length} of ${walkers} ` +
            `walkers without one after ${'around' in start ? `${GAUSSIAN_ROUNDS} rounds of redrawing` : 'using every draw'}`,
        );
      }
    }
    wrapRows(candidates, pending.length, dim, periodic);
    const values = await evaluateBatch(problem.logPosterior, candidates, pending.length);
    evaluations += pending.length;
    const still: number[] = [];
    pending.forEach((walker, slot) => {
      if (Number.isFinite(values[slot])) {
        positions.set(candidates.subarray(slot * dim, (slot + 1) * dim), walker * dim);
        logDensities[walker] = values[slot];
      } else {
        still.push(walker);
      }
    });
    pending = still;
  }
  return { positions, logDensities, evaluations };
}

function checkVector(
  what: string, vector: unknown, dim: number, ok: (x: number) => boolean, expected: string,
): void {
  if (!(vector instanceof Float64Array) || vector.length !== dim || !vector.every(ok)) {
    throw new InputError(`ensemble ${what}: ${expectedFound(`${dim} ${expected} (a Float64Array)`, vector)}`);
  }
}
