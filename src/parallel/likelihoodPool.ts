import { Worker } from 'node:worker_threads';
import { availableParallelism } from 'node:os';
import { PixelLikelihood } from '../likelihood/pixelLikelihood.js';
import { buildLensSystem } from '../model/lensSystem.js';
import { BatchOccupancy } from './batchOccupancy.js';
import type { LikelihoodTask } from './likelihoodTask.js';
import { workerScriptUrl } from './workerScriptUrl.js';
import type { SliceChainRequest, SliceChainResult } from '../sampling/nested/sliceSampler.js';

/** A worker's answer: the ln L of a run of points, or where a slice chain ended. */
export type WorkerReply = { readonly values: Float64Array } | { readonly chain: SliceChainResult };

/**
 * What a worker is asked, waiting for or held by a worker: a run of consecutive points of one
 * call, or one slice chain of a nested-sampling step.
 */
interface Job {
  readonly message: { readonly points: Float64Array; readonly count: number } | { readonly chain: SliceChainRequest };
  readonly done: (reply: WorkerReply) => void;
  readonly reject: (error: Error) => void;
}

/** The default thread count: every available core. */
export function defaultThreadCount(): number {
  return availableParallelism();
}

/**
 * Evaluates batches of model vectors (row-major, one row per point, in the model's parameter
 * order) across worker threads. Every call's points are cut into runs and put on one queue shared
 * by all calls, so several callers (e.g. independent sampling chains, one point each) keep every
 * worker busy; an idle worker takes the next run, and every answer is stored at its point's index
 * in its call's result, so results never depend on the thread count or on timing.
 * With one thread everything runs in the calling thread.
 */
export class LikelihoodPool {
  readonly threads: number;
  readonly width: number;
  private readonly workers: Worker[];
  private readonly local: PixelLikelihood | undefined;
  private readonly queue: Job[] = [];
  private readonly idle: Worker[];
  private readonly running = new Map<Worker, Job>();
  private failure: Error | undefined;
  /** Number of likelihood evaluations made so far. */
  evaluations = 0;
  /** Messages sent to workers so far (runs of points and slice chains). */
  messages = 0;
  /** Batch sizes of the calls made so far. */
  readonly occupancy = new BatchOccupancy();

  private constructor(threads: number, width: number, workers: Worker[], local: PixelLikelihood | undefined) {
    this.threads = threads;
    this.width = width;
    this.workers = workers;
    this.local = local;
    this.idle = workers.slice();
    for (const worker of workers) {
      worker.on('message', (reply: WorkerReply | { ready: true }) => {
        if ('ready' in reply) return;
        const job = this.running.get(worker);
        this.running.delete(worker);
        this.idle.push(worker);
        this.dispatch();
        job?.done(reply);
      });
      worker.on('error', (error) => this.fail(error));
    }
  }

  private fail(error: Error): void {
    this.failure = error;
    for (const job of this.running.values()) job.reject(error);
    for (const job of this.queue) job.reject(error);
    this.running.clear();
    this.queue.length = 0;
  }

  /** Hands queued runs to idle workers. */
  private dispatch(): void {
    while (this.idle.length > 0 && this.queue.length > 0) {
      const worker = this.idle.shift()!;
      const job = this.queue.shift()!;
      this.running.set(worker, job);
      this.messages++;
      // Copied, not transferred: see likelihoodWorker.ts.
      worker.postMessage(job.message);
    }
  }

  /**
   * Starts `threads` workers. One thread runs in the calling thread unless `inWorker` is set: runs
   * that share the process (vetting candidates side by side) each need a worker of their own.
   */
  static async start(task: LikelihoodTask, threads = defaultThreadCount(), options: { inWorker?: boolean } = {}): Promise<LikelihoodPool> {
    const count = Math.max(1, Math.floor(threads));
    if (count === 1 && options.inWorker !== true) {
      const local = new PixelLikelihood(task.config, task.data, task.perturberCount);
      return new LikelihoodPool(1, local.system.parameters.length, [], local);
    }
    const width = buildLensSystem(task.config, { perturberCount: task.perturberCount }).parameters.length;
    const url = workerScriptUrl(import.meta.url, './likelihoodWorker.js');
    const workers = await Promise.all(Array.from({ length: count }, () => new Promise<Worker>((resolve, reject) => {
      const worker = new Worker(url, { workerData: task });
      worker.once('error', reject);
      worker.once('message', () => {
        worker.off('error', reject);
        resolve(worker);
      });
    })));
    return new LikelihoodPool(count, width, workers, undefined);
  }

  /**
   * ln L of `count` model vectors stored row-major in `points`. The points are copied before
   * this returns, so the caller may reuse `points` at once; calls may overlap.
   */
  async evaluate(points: Float64Array, count: number): Promise<Float64Array> {
    if (this.failure !== undefined) throw this.failure;
    this.evaluations += count;
    this.occupancy.record(count);
    const width = this.width;
    const out = new Float64Array(count);
    if (this.local !== undefined) {
      for (let r = 0; r < count; r++) out[r] = this.local.logLikelihood(points.subarray(r * width, (r + 1) * width));
      return out;
    }
    if (count === 0) return out;
    // Runs of about count / (8 threads) points: an expensive point does not hold a whole
    // half-batch up, and small calls go out one point per run.
    const piece = Math.max(1, Math.floor(count / (8 * this.workers.length)));
    return new Promise<Float64Array>((resolve, reject) => {
      let outstanding = count;
      for (let from = 0; from < count; from += piece) {
        const size = Math.min(piece, count - from);
        this.queue.push({
          message: { points: points.slice(from * width, (from + size) * width), count: size },
          done: (reply) => {
            if (!('values' in reply)) return reject(new Error('likelihood worker: expected values, got a chain'));
            out.set(reply.values, from);
            outstanding -= size;
            if (outstanding === 0) resolve(out);
          },
          reject,
        });
      }
      this.dispatch();
    });
  }

  /** True when the likelihood runs in worker threads (false: in the calling thread). */
  get inWorkers(): boolean {
    return this.local === undefined;
  }

  /**
   * Runs one slice chain of a nested-sampling step in the next idle worker, which holds the
   * model's prior transform and likelihood, so the chain's points need no message each. Workers
   * only (inWorkers).
   */
  runSliceChain(request: SliceChainRequest): Promise<SliceChainResult> {
    if (this.failure !== undefined) return Promise.reject(this.failure);
    if (this.local !== undefined) return Promise.reject(new Error('runSliceChain needs worker threads'));
    return new Promise<SliceChainResult>((resolve, reject) => {
      this.queue.push({
        message: { chain: request },
        done: (reply) => {
          if (!('chain' in reply)) return reject(new Error('likelihood worker: expected a chain, got values'));
          this.evaluations += reply.chain.evaluations;
          resolve(reply.chain);
        },
        reject,
      });
      this.dispatch();
    });
  }

  async close(): Promise<void> {
    await Promise.all(this.workers.map((worker) => worker.terminate()));
  }
}
