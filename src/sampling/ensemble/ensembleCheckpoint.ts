import { existsSync, readFileSync } from 'node:fs';
import { InputError, expectedFound } from '../../errors.js';
import { writeJsonAtomic } from '../../io/writeFileAtomic.js';
import { SeededStream } from '../../numeric/random/seededStream.js';
import type { SettledEnsembleOptions } from './ensembleOptions.js';
import type { EnsembleState } from './ensembleState.js';
import { decodeFloat64, encodeFloat64 } from './float64Encoding.js';
import { GrowableChain } from './growableChain.js';

const FORMAT = 'arcsift ensemble checkpoint';
const VERSION = 1;

/** The settings a resumed run must share with the run that wrote the checkpoint. */
function identity(dim: number, settled: SettledEnsembleOptions): Record<string, unknown> {
  return {
    dim,
    walkers: settled.walkers,
    seed: settled.seed,
    thin: settled.thin,
    moves: settled.moves.kinds.join(','),
    moveCumulativeWeights: Array.from(settled.moves.cumulative).join(','),
    stretchScale: settled.stretchScale,
    gamma: settled.gamma,
    jitter: settled.jitter,
    targetAutocorrelationTimes: settled.targetAutocorrelationTimes,
    autocorrelationTolerance: settled.autocorrelationTolerance,
    checkEvery: settled.checkEvery,
    burnInFraction: settled.burnInFraction,
  };
}

/** Writes the whole run state atomically as JSON; float arrays are stored bit-exact. */
export function saveEnsembleCheckpoint(
  path: string, dim: number, settled: SettledEnsembleOptions, state: EnsembleState,
): void {
  writeJsonAtomic(path, {
    format: FORMAT,
    version: VERSION,
    run: identity(dim, settled),
    iteration: state.iteration,
    evaluations: state.evaluations,
    nonFiniteProposals: state.nonFiniteProposals,
    converged: state.converged,
    autocorrelationTimeMax: encodeFloat64(Float64Array.of(state.autocorrelationTimeMax)),
    previousTau: state.previousTau === null ? null : encodeFloat64(state.previousTau),
    random: state.random.savedState(),
    positions: encodeFloat64(state.positions),
    logDensities: encodeFloat64(state.logDensities),
    accepted: encodeFloat64(state.accepted),
    chain: encodeFloat64(state.chain.positionRows()),
    chainLogDensities: encodeFloat64(state.chain.logDensityRows()),
  });
}

/** Reads a checkpoint written for the same run settings; null when the file does not exist. */
export function loadEnsembleCheckpoint(
  path: string, dim: number, settled: SettledEnsembleOptions,
): EnsembleState | null {
  if (!existsSync(path)) return null;
  let saved: Record<string, unknown>;
  try {
    saved = JSON.parse(readFileSync(path, 'utf8')) as Record<string, unknown>;
  } catch (error) {
    throw new InputError(`cannot read the checkpoint: ${(error as Error).message}`, { file: path });
  }
  if (saved?.format !== FORMAT || saved.version !== VERSION) {
    throw new InputError(expectedFound(`an ${FORMAT}, version ${VERSION}`, saved?.format), { file: path });
  }
  const expected = identity(dim, settled);
  const found = (saved.run ?? {}) as Record<string, unknown>;
  for (const key of Object.keys(expected)) {
    if (found[key] !== expected[key]) {
      throw new InputError(
        `the checkpoint belongs to another run: expected ${key} = ${String(expected[key])}, found ${String(found[key])}`,
        { file: path, key: `run.${key}` },
      );
    }
  }
  const random = SeededStream.fromSavedState(saved.random, 'random generator state');
  const count = (key: string): number => {
    const value = saved[key];
    if (typeof value !== 'number' || !Number.isInteger(value) || value < 0) {
      throw new InputError(expectedFound('a count', value), { file: path, key });
    }
    return value;
  };
  const sized = (key: string, length: number): Float64Array => {
    const values = decodeFloat64(saved[key], key, path);
    if (values.length !== length) {
      throw new InputError(`expected ${length} values, found ${values.length}`, { file: path, key });
    }
    return values;
  };
  const positions = sized('positions', settled.walkers * dim);
  const chain = new GrowableChain(settled.walkers, dim);
  const chainLogDensities = decodeFloat64(saved.chainLogDensities, 'chainLogDensities', path);
  const rows = chainLogDensities.length / settled.walkers;
  if (!Number.isInteger(rows)) {
    throw new InputError(`expected whole rows of ${settled.walkers} walkers, found ${chainLogDensities.length} values`,
      { file: path, key: 'chainLogDensities' });
  }
  chain.restore(sized('chain', rows * settled.walkers * dim), chainLogDensities);
  return {
    iteration: count('iteration'),
    positions,
    logDensities: sized('logDensities', settled.walkers),
    accepted: sized('accepted', settled.walkers),
    evaluations: count('evaluations'),
    nonFiniteProposals: count('nonFiniteProposals'),
    previousTau: saved.previousTau === null ? null : sized('previousTau', dim),
    autocorrelationTimeMax: decodeFloat64(saved.autocorrelationTimeMax, 'autocorrelationTimeMax', path)[0],
    converged: saved.converged === true,
    chain,
    random,
  };
}
