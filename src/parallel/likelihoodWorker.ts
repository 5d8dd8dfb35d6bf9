import { parentPort, workerData } from 'node:worker_threads';
import { PixelLikelihood } from '../likelihood/pixelLikelihood.js';
import type { LikelihoodTask } from './likelihoodTask.js';

// One worker thread: builds its PixelLikelihood once, then answers batches of model vectors.
const task = workerData as LikelihoodTask;
const likelihood = new PixelLikelihood(task.config, task.data, task.perturberCount);
const width = likelihood.system.parameters.length;
const row = new Float64Array(width);

parentPort!.on('message', (message: { points: Float64Array; count: number }) => {
  const out = new Float64Array(message.count);
  for (let r = 0; r < message.count; r++) {
    for (let c = 0; c < width; c++) row[c] = message.points[r * width + c];
    out[r] = likelihood.logLikelihood(row);
  }
  parentPort!.postMessage({ values: out }, [out.buffer]);
});
parentPort!.postMessage({ ready: true });
