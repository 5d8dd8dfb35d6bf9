import { existsSync, readFileSync } from 'node:fs';
import { InputError, expectedFound } from '../../errors.js';
import { writeJsonAtomic } from '../../io/writeFileAtomic.js';
import { SeededStream } from '../../numeric/random/seededStream.js';
import type { SettledEnsembleOptions } from './ensembleOptions.js';
import type { EnsembleState } from './ensembleState.js';
import { decodeFloat64, encodeFloat64 } from './float64Encoding.js';
import { GrowableChain } from './growableChain.js';
import { checkpointTallies } from '../runTallies.js';

const FORMAT = 'arcsift ensemble checkpoint';
const VERSION = 2;

/**
 * The settings that fix the chain, which a resumed run must share with the run that wrote the
 * checkpoint. The stop rule, its checks and maxSweeps may change: they only say where to stop.
 */
function identity(dim: number, settled: SettledEnsembleOptions): Record<string, unknown> {
  return {
    dim,
    walkers: settled.walkers,
    seed: settled.seed,
    thin: settled.thin,
    proposals: settled.proposals.kinds.join(','),
    proposalCumulativeWeights: Array.from(settled.proposals.cumulative).join(','),
    stretchScale: settled.stretchScale,
    gamma: settled.gamma,
    jitter: settled.jitter,
    burnInFraction: settled.burnInFraction,
  };
}

/**
 * Writes the whole run state atomically as JSON; float arrays are stored bit-exact. `runIdentity`
 * (the caller's record of what the run was made from) is stored beside the sampler's settings.
 */
export function saveEnsembleCheckpoint(
  path: string, dim: number, settled: SettledEnsembleOptions, state: EnsembleState, runIdentity?: unknown,
  tallies?: Record<string, number>,
): void {
  writeJsonAtomic(path, {
    format: FORMAT,
    version: VERSION,
    ...(runIdentity === undefined ? {} : { runIdentity }),
    run: identity(dim, settled),
    sweep: state.sweep,
    evaluations: state.evaluations,
    nonFiniteProposals: state.nonFiniteProposals,
    random: state.random.savedState(),
    positions: encodeFloat64(state.positions),
    logDensities: encodeFloat64(state.logDensities),
    accepted: encodeFloat64(state.accepted),
    chain: encodeFloat64(state.chain.positionRows()),
    chainLogDensities: encodeFloat64(state.chain.logDensityRows()),
    ...(tallies === undefined ? {} : { tallies }),
  });
}

/**
 * Reads a checkpoint written for the same run settings; null when the file does not exist.
 * `checkIdentity`, when given, is called first with the stored run identity (undefined when none).
 */
export function loadEnsembleCheckpoint(
  path: string, dim: number, settled: SettledEnsembleOptions, checkIdentity?: (stored: unknown, file: string) => void,
): EnsembleState | null {
  if (!existsSync(path)) return null;
  let saved: Record<string, unknown>;
  try {
    saved = JSON.parse(readFileSync(path, 'utf8')) as Record<string, unknown>;
  } catch (error) {
    throw new InputError(`cannot read the checkpoint: ${(error as Error).message}`, { file: path });
  }
  if (saved?.format !== FORMAT || saved.version !== VERSION) {
    throw new InputError(expectedFound(`an ${FORMAT}, version ${VERSION}`, `${String(saved?.format)} version ${String(saved?.version)}`), { file: path });
  }
  checkIdentity?.(saved.runIdentity, path);
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
    sweep: count('sweep'),
    positions,
    logDensities: sized('logDensities', settled.walkers),
    accepted: sized('accepted', settled.walkers),
    evaluations: count('evaluations'),
    nonFiniteProposals: count('nonFiniteProposals'),
    lastCheck: null,
    chain,
    random,
    ...(saved.tallies === undefined ? {} : { tallies: checkpointTallies(saved.tallies, path) }),
  };
}

