import { parentPort, workerData } from 'node:worker_threads';
import { PixelLikelihood } from '../likelihood/pixelLikelihood.js';
import { modelParameterSpace } from '../inference/modelParameterSpace.js';
import { modelPriorTransform } from '../inference/modelPriorTransform.js';
import { BatchEvaluator } from '../sampling/nested/batchEvaluator.js';
import { runSliceChain, type SliceChainRequest } from '../sampling/nested/sliceSampler.js';
import type { LikelihoodTask } from './likelihoodTask.js';

// One worker thread: builds its PixelLikelihood once, then answers runs of model vectors, or runs
// whole slice chains of a nested-sampling step with the model's prior transform.
const task = workerData as LikelihoodTask;
const likelihood = new PixelLikelihood(task.config, task.data, task.perturberCount);
const width = likelihood.system.parameters.length;
const row = new Float64Array(width);
let chainEvaluator: BatchEvaluator | undefined;

/** ln L of `count` rows of `points` into a new array. */
function logLikelihoods(points: Float64Array, count: number): Float64Array {
  const out = new Float64Array(count);
  for (let r = 0; r < count; r++) {
    for (let c = 0; c < width; c++) row[c] = points[r * width + c];
    out[r] = likelihood.logLikelihood(row);
  }
  return out;
}

/** The evaluator of slice chains: the same transform as the sampler's thread, then ln L here. */
function evaluatorOfChains(): BatchEvaluator {
  if (chainEvaluator === undefined) {
    const space = modelParameterSpace(likelihood.system);
    const { transform } = modelPriorTransform(likelihood.system, space, task.data);
    chainEvaluator = new BatchEvaluator({ dim: space.dim, physicalDim: space.physicalDim, transform, logLikelihood: logLikelihoods });
  }
  return chainEvaluator;
}

parentPort!.on('message', (message: { points: Float64Array; count: number } | { chain: SliceChainRequest }) => {
  // Answers are copied, not transferred. Transferring detaches the sender's ArrayBuffer, and the
  // first detach in a thread makes V8 check for detached buffers at every typed-array access in
  // optimised code from then on: measured 20-30% slower likelihoods in both the worker and the
  // main thread (1.36 -> 1.75 ms per demo likelihood in a worker), against microseconds to copy.
  if ('chain' in message) {
    const evaluator = evaluatorOfChains();
    evaluator.evaluations = 0;
    evaluator.nonFinite = 0;
    runSliceChain(message.chain, evaluator.evaluate).then(
      (result) => parentPort!.postMessage({ chain: { ...result, nonFinite: evaluator.nonFinite } }),
      (error: unknown) => {
        throw error;
      },
    );
    return;
  }
  parentPort!.postMessage({ values: logLikelihoods(message.points, message.count) });
});
parentPort!.postMessage({ ready: true });
