import { Worker } from 'node:worker_threads';

/** A fixed arithmetic loop that touches no memory, run in a worker; answers its milliseconds. */
const SPIN = `
const { parentPort } = require('node:worker_threads');
function loop() {
  let sum = 0;
  for (let i = 0; i < 2e8; i++) sum += Math.sqrt(i);
  return sum;
}
const started = performance.now();
const sum = loop();
parentPort.postMessage({ ms: performance.now() - started, sum });
`;

function spin(): Promise<number> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(SPIN, { eval: true });
    worker.once('message', (message: { ms: number }) => {
      void worker.terminate();
      resolve(message.ms);
    });
    worker.once('error', reject);
  });
}

/**
 * How many cores `threads` busy threads get at this moment: threads x (time of the loop alone) /
 * (its mean time when `threads` copies run at once). About `threads` on an idle machine; on a
 * shared virtual machine it can fall well below (measured 1.1 of 2 at times here), which bounds
 * any parallel speed-up measured at the same moment.
 */
export async function machineParallelism(threads: number): Promise<number> {
  const alone = Math.min(await spin(), await spin());
  const together = await Promise.all(Array.from({ length: threads }, () => spin()));
  const mean = together.reduce((a, b) => a + b, 0) / threads;
  return (threads * alone) / mean;
}
