import { parentPort, workerData } from 'node:worker_threads';
import { noRejections, REJECTION_REASONS, type InversionRejections } from '../inversion/inversionRejections.js';
import { PixelLikelihood } from '../likelihood/pixelLikelihood.js';
import { modelParameterSpace } from '../model/modelParameterSpace.js';
import { modelPriorTransform } from '../model/modelPriorTransform.js';
import { BatchEvaluator } from '../sampling/nested/batchEvaluator.js';
import { runSliceChain, type SliceChainRequest } from '../sampling/nested/sliceChain.js';
import type { LikelihoodTask } from './likelihoodTask.js';

// One worker thread: builds the PixelLikelihood of each model it is given, then answers runs of
// model vectors, or runs whole slice chains of a nested-sampling step with the model's prior
// transform.
const tasks = workerData as readonly LikelihoodTask[];

/** One model held by this worker. */
class HeldModel {
  readonly likelihood: PixelLikelihood;
  private readonly row: Float64Array;
  private chainEvaluator: BatchEvaluator | undefined;

  constructor(private readonly task: LikelihoodTask) {
    this.likelihood = new PixelLikelihood(task.config, task.data, task.perturberCount);
    this.row = new Float64Array(this.likelihood.system.parameters.length);
  }

  /** Rejections already sent to the pool. */
  private readonly reported = noRejections();

  /**
   * The likelihood's rejections by reason since the last call (undefined when none), for the
   * pool to add up: every answer carries those of the evaluations behind it.
   */
  rejectionsSinceLastCall(): InversionRejections | undefined {
    const now = this.likelihood.inversion?.rejections;
    if (now === undefined) return undefined;
    const delta = noRejections();
    let any = false;
    for (const reason of REJECTION_REASONS) {
      delta[reason] = now[reason] - this.reported[reason];
      this.reported[reason] = now[reason];
      if (delta[reason] !== 0) any = true;
    }
    return any ? delta : undefined;
  }

  /** ln L of `count` rows of `points` into a new array. */
  readonly logLikelihoods = (points: Float64Array, count: number): Float64Array => {
    const width = this.row.length;
    const out = new Float64Array(count);
    for (let r = 0; r < count; r++) {
      for (let c = 0; c < width; c++) this.row[c] = points[r * width + c];
      out[r] = this.likelihood.logLikelihood(this.row);
    }
    return out;
  };

  /** The evaluator of slice chains: the same transform as the sampler's thread, then ln L here. */
  evaluatorOfChains(): BatchEvaluator {
    if (this.chainEvaluator === undefined) {
      const space = modelParameterSpace(this.likelihood.system);
      const { transform } = modelPriorTransform(this.likelihood.system, space, this.task.data);
      this.chainEvaluator = new BatchEvaluator({ dim: space.dim, physicalDim: space.physicalDim, transform, logLikelihood: this.logLikelihoods });
    }
    return this.chainEvaluator;
  }
}

// Every model is built at once, so that a bad task fails at start, not inside a run.
const held = tasks.map((task) => new HeldModel(task));

type Message = { model: number; points: Float64Array; count: number } | { model: number; chain: SliceChainRequest; stop?: Int32Array };

/** Thrown inside a chain whose stop flag was set (see ModelPool.runSliceChain). */
class ChainStopped extends Error {}

parentPort!.on('message', (message: Message) => {
  // Answers are copied, not transferred. Transferring detaches the sender's ArrayBuffer, and the
  // first detach in a thread makes V8 check for detached buffers at every typed-array access in
  // optimised code from then on, slowing every later likelihood in both threads (DEVELOPERS.md,
  // measured choices), against microseconds to copy.
  const model = held[message.model];
  if ('chain' in message) {
    const evaluator = model.evaluatorOfChains();
    evaluator.evaluations = 0;
    evaluator.nonFinite = 0;
    const stop = message.stop;
    const evaluate: typeof evaluator.evaluate = stop === undefined ? evaluator.evaluate : (unit, count, physicalOut) => {
      if (Atomics.load(stop, 0) !== 0) throw new ChainStopped();
      return evaluator.evaluate(unit, count, physicalOut);
    };
    runSliceChain(message.chain, evaluate).then(
      (result) => parentPort!.postMessage({ chain: { ...result, nonFinite: evaluator.nonFinite }, rejected: model.rejectionsSinceLastCall() }),
      (error: unknown) => {
        if (error instanceof ChainStopped) {
          parentPort!.postMessage({ stopped: true, rejected: model.rejectionsSinceLastCall() });
          return;
        }
        // Thrown again outside the promise: the worker's 'error' event fails the pool's calls.
        throw error;
      },
    );
    return;
  }
  const values = model.logLikelihoods(message.points, message.count);
  parentPort!.postMessage({ values, rejected: model.rejectionsSinceLastCall() });
});
parentPort!.postMessage({ ready: true });
