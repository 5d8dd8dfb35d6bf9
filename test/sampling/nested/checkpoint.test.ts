import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { InputError } from '../../../src/errors.js';
import { readCheckpoint, writeCheckpoint } from '../../../src/sampling/nested/checkpoint.js';
import type { NestedSettings, NestedStateRecord } from '../../../src/sampling/nested/nestedState.js';
import { SeededStream } from '../../../src/numeric/random/seededStream.js';

const folder = mkdtempSync(join(tmpdir(), 'arcsift-nested-checkpoint-'));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

const settings: NestedSettings = {
  dim: 2,
  physicalDim: 2,
  livePoints: 10,
  seed: 5,
  method: 'ellipsoids',
  replacementsPerStep: 1,
  enlargement: 1,
  minimumClusterSize: 3,
  bootstraps: 5,
  boundUpdateInterval: 1,
  sliceSteps: 10,
  sliceWidthScale: 2,
  periodic: [false, true],
  boundVolumeFactorForTesting: 1,
  slicePointsPerChain: 1,
  sliceClusters: false,
  evidence: 'nested',
  importance: null,
};

describe('checkpoint files', () => {
  it('round-trip doubles exactly, including -Infinity, Infinity and NaN, and the generator state', () => {
    const stream = SeededStream.fromSeed(5);
    const values = [-Infinity, Infinity, NaN, 0.1 + 0.2, -0, 5e-324, 1.7976931348623157e308, Math.PI];
    for (let i = 0; i < 200; i++) values.push((stream.uniform() - 0.5) * 10 ** Math.floor(40 * stream.uniform() - 20));
    const record: NestedStateRecord = {
      settings,
      arrays: { values },
      scalars: { lnZDead: -Infinity },
      streamState: stream.stateWords(),
      bound: null,
      whitening: null,
    };
    const path = join(folder, 'state.json');
    writeCheckpoint(path, record);
    const read = readCheckpoint(path, settings)!;
    expect(read.arrays.values.length).toBe(values.length);
    // -0 is written by JSON as 0: the only double JSON does not keep, and one the state never holds.
    for (let i = 0; i < values.length; i++) expect(Object.is(read.arrays.values[i], values[i]) || (values[i] === 0 && read.arrays.values[i] === 0)).toBe(true);
    expect(Object.is(read.scalars.lnZDead, -Infinity)).toBe(true);
    const continued = SeededStream.fromState(read.streamState);
    expect(continued.uniform()).toBe(stream.uniform());
  });

  it('returns null when there is no file, and throws InputError on a foreign file', () => {
    expect(readCheckpoint(join(folder, 'missing.json'), settings)).toBeNull();
    const path = join(folder, 'foreign.json');
    writeFileSync(path, '{"hello": 1}');
    expect(() => readCheckpoint(path, settings)).toThrow(InputError);
    expect(() => readCheckpoint(path, settings)).toThrow(/foreign\.json/);
    writeFileSync(path, 'not json');
    expect(() => readCheckpoint(path, settings)).toThrow(InputError);
    expect(readFileSync(path, 'utf8')).toBe('not json');
  });
});
