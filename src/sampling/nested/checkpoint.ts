import { existsSync, readFileSync } from 'node:fs';
import { InputError } from '../../errors.js';
import { writeFileAtomic } from '../../io/writeFileAtomic.js';
import type { NestedSettings, NestedStateRecord } from './nestedState.js';
import { checkpointTallies } from '../runTallies.js';

/** Format tag written at the top of every nested-sampling checkpoint file. */
export const checkpointFormat = 'arcsift nested-sampling checkpoint';
/** Version 2 adds clusters and the importance stage; version 1 files are read as one cluster, nested evidence. */
export const checkpointVersion = 2;

// JSON has no -Infinity, Infinity or NaN: they are written as these strings and read back.
const nonFiniteNames = new Map<string, number>([
  ['-Infinity', -Infinity],
  ['Infinity', Infinity],
  ['NaN', NaN],
]);

function encodeNonFinite(_key: string, value: unknown): unknown {
  return typeof value === 'number' && !Number.isFinite(value) ? String(value) : value;
}

function decodeNonFinite(_key: string, value: unknown): unknown {
  return typeof value === 'string' && nonFiniteNames.has(value) ? nonFiniteNames.get(value) : value;
}

/**
 * Writes a state record atomically (temporary file, then rename). Doubles round-trip exactly
 * through JSON's shortest decimal form (ECMAScript Number::toString), non-finite values by name.
 * `runIdentity` (the caller's record of the run's config, data and seed) is stored beside it.
 */
export function writeCheckpoint(path: string, record: NestedStateRecord, runIdentity?: unknown): void {
  const identity = runIdentity === undefined ? {} : { runIdentity };
  writeFileAtomic(path, JSON.stringify({ format: checkpointFormat, version: checkpointVersion, ...identity, state: record }, encodeNonFinite));
}

/**
 * Reads a checkpoint if the file exists (null otherwise), checking it belongs to the same run:
 * `checkIdentity` first, with the stored run identity, then the sampler's settings.
 */
export function readCheckpoint(
  path: string, expected: NestedSettings, checkIdentity?: (stored: unknown, file: string) => void,
): NestedStateRecord | null {
  if (!existsSync(path)) return null;
  let parsed: { format?: unknown; version?: unknown; runIdentity?: unknown; state?: NestedStateRecord };
  try {
    parsed = JSON.parse(readFileSync(path, 'utf8'), decodeNonFinite) as typeof parsed;
  } catch (error) {
    throw new InputError(`expected a nested-sampling checkpoint in JSON, could not read it (${(error as Error).message})`, { file: path });
  }
  if (parsed.format !== checkpointFormat || (parsed.version !== 1 && parsed.version !== checkpointVersion) || parsed.state === undefined) {
    throw new InputError(`expected a "${checkpointFormat}" version ${checkpointVersion} file`, { file: path });
  }
  checkIdentity?.(parsed.runIdentity, path);
  if (parsed.state.tallies !== undefined) checkpointTallies(parsed.state.tallies, path);
  const found = parsed.state.settings as unknown as Record<string, unknown>;
  // Settings added since version 1 was first written, at the values that reproduce older runs.
  if (found.slicePointsPerChain === undefined) found.slicePointsPerChain = 1;
  if (found.evidence === undefined) found.evidence = 'nested';
  if (found.sliceClusters === undefined) found.sliceClusters = false;
  if (found.importance === undefined) found.importance = null;
  for (const [key, value] of Object.entries(expected)) {
    if (JSON.stringify(found[key]) !== JSON.stringify(value)) {
      throw new InputError(
        `checkpoint was written by a run with ${key} = ${JSON.stringify(found[key])}, this run has ${JSON.stringify(value)}; ` +
          'resume with the same settings or remove the file',
        { file: path, key },
      );
    }
  }
  return parsed.state;
}
