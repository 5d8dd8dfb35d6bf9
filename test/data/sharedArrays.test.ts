import { Worker } from 'node:worker_threads';
import { afterAll, describe, expect, it } from 'vitest';
import { loadObservedData, sharedFloat64Array } from '../../src/data/index.js';
import { makeRoot, writeDataFolder } from './dataFolder.js';

// Checks that arrays on a SharedArrayBuffer reach a worker as the same memory, not a copy
// (the structured-clone rule for SharedArrayBuffer in the HTML standard, which Node's
// worker_threads follow; common practice). The worker writes into what it received and the
// main thread looks: with a shared array it sees the write, with a plain one it must not.

const WORKER = `
const { parentPort } = require('node:worker_threads');
parentPort.on('message', (arrays) => {
  for (const array of arrays) array[0] = 42;
  parentPort.postMessage('written');
});
`;

async function writeInWorker(arrays: readonly (Float64Array | Uint8Array | Int32Array)[]): Promise<void> {
  const worker = new Worker(WORKER, { eval: true });
  try {
    await new Promise<void>((resolve, reject) => {
      worker.once('message', () => resolve());
      worker.once('error', reject);
      worker.postMessage(arrays);
    });
  } finally {
    await worker.terminate();
  }
}

describe('observed data shared with worker threads (common practice)', () => {
  const { root, remove } = makeRoot();
  afterAll(remove);

  it('a plain Float64Array is copied: the worker write does not come back (the control)', async () => {
    const plain = new Float64Array(4);
    await writeInWorker([plain]);
    expect(plain[0]).toBe(0);
  });

  it('sharedFloat64Array is shared: the worker write is seen', async () => {
    const shared = sharedFloat64Array(4);
    await writeInWorker([shared]);
    expect(shared[0]).toBe(42);
  });

  it('image, noise, mask, used pixels and PSF values of loaded data are shared', async () => {
    const data = loadObservedData({ folder: writeDataFolder(root) });
    const arrays = [data.image, data.noise, data.mask, data.usedPixels, data.psf.values];
    await writeInWorker(arrays);
    expect(arrays.map((array) => array[0])).toEqual([42, 42, 42, 42, 42]);
  });
});
