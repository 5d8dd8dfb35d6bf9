import { addRejections, noRejections, type InversionRejections } from '../inversion/inversionRejections.js';
import { PixelLikelihood, checkBrightShare } from '../likelihood/pixelLikelihood.js';
import { buildLensSystem } from '../model/lensSystem.js';
import { BatchOccupancy } from './batchOccupancy.js';
import type { LikelihoodTask } from './likelihoodTask.js';
import { defaultThreadCount, WorkerPool } from './workerPool.js';
import { workerScriptUrl } from './workerScriptUrl.js';
import type { SliceChainRequest, SliceChainResult } from '../sampling/nested/sliceChain.js';

/** A worker's answer: the ln L of a run of points, where a slice chain ended, or that it was stopped. */
export type WorkerReply = (
  { readonly values: Float64Array } | { readonly chain: SliceChainResult } | { readonly stopped: true }
) & {
  /** The pixelated source's rejections, by reason, of the evaluations since the worker's last answer for this model. */
  readonly rejected?: InversionRejections;
};

/** What a worker is asked: a run of consecutive points of one call, or one slice chain of a nested-sampling step. */
type WorkerRequest =
  | { readonly model: number; readonly points: Float64Array; readonly count: number }
  | { readonly model: number; readonly chain: SliceChainRequest; readonly stop?: Int32Array };


/**
 * What a nested-sampling run needs of a likelihood pool for its model: batches of points, whole
 * slice chains (workers only), and counters of what it asked.
 */
export interface ModelPool {
  readonly threads: number;
  /** Length of a model vector. */
  readonly width: number;
  /** True when the likelihood runs in worker threads (false: in the calling thread). */
  readonly inWorkers: boolean;
  /** Likelihood evaluations so far. */
  readonly evaluations: number;
  /** Messages sent to workers so far (runs of points and slice chains). */
  readonly messages: number;
  /** Batch sizes of the calls made so far. */
  readonly occupancy: BatchOccupancy;
  /** Likelihoods of minus infinity from the pixelated source, by reason, so far (all zero without one). */
  readonly rejections: Readonly<InversionRejections>;
  /** Worker threads with nothing to do right now (nothing queued), for any model of the pool. */
  readonly idleThreads: number;
  evaluate(points: Float64Array, count: number): Promise<Float64Array>;
  /**
   * `stop`, if given: an Int32Array on a SharedArrayBuffer; once its first entry is set
   * (Atomics.store), the worker stops the chain before its next evaluation and the call rejects.
   */
  runSliceChain(request: SliceChainRequest, stop?: Int32Array): Promise<SliceChainResult>;
}

/** Counters of one model of a pool. */
class ModelCounters {
  evaluations = 0;
  messages = 0;
  readonly occupancy = new BatchOccupancy();
  /** Rejections the workers reported (with one thread, the local likelihood holds them). */
  readonly rejections = noRejections();
}

/**
 * Evaluates batches of model vectors (row-major, one row per point, in the model's parameter
 * order) across worker threads. Every call's points are cut into runs and put on one queue shared
 * by all calls, so several callers (e.g. independent sampling chains) keep every worker busy; an
 * idle worker takes the next run, and every answer is stored at its point's index in its call's
 * result, so results never depend on the thread count or on timing. A pool may hold several
 * models (`start` with a list of tasks; every worker builds each model's likelihood when first
 * asked): runs of different models then share the workers through the one queue (`model(k)`),
 * and a worker freed by one run serves the other. With one thread everything runs in the calling
 * thread. The pool itself is the ModelPool of its first model.
 */
export class LikelihoodPool implements ModelPool {
  readonly threads: number;
  /** Length of a model vector of each model. */
  readonly widths: readonly number[];
  private readonly workers: WorkerPool<WorkerRequest, WorkerReply> | undefined;
  private readonly locals: PixelLikelihood[] | undefined;
  private readonly counters: ModelCounters[];

  private constructor(
    threads: number, widths: number[], workers: WorkerPool<WorkerRequest, WorkerReply> | undefined, locals: PixelLikelihood[] | undefined,
  ) {
    this.threads = threads;
    this.widths = widths;
    this.workers = workers;
    this.locals = locals;
    this.counters = widths.map(() => new ModelCounters());
  }

  get width(): number {
    return this.widths[0];
  }

  get evaluations(): number {
    return this.counters[0].evaluations;
  }

  get messages(): number {
    return this.counters[0].messages;
  }

  get occupancy(): BatchOccupancy {
    return this.counters[0].occupancy;
  }

  get rejections(): Readonly<InversionRejections> {
    return this.rejectionsOf(0);
  }

  private rejectionsOf(model: number): Readonly<InversionRejections> {
    return this.locals?.[model].inversion?.rejections ?? this.counters[model].rejections;
  }

  get inWorkers(): boolean {
    return this.locals === undefined;
  }

  get idleThreads(): number {
    return this.workers === undefined ? 0 : this.workers.idleThreads;
  }

  /** Queues one message for the workers (copied, not transferred: see likelihoodWorker.ts). */
  private submit(message: WorkerRequest, done: (reply: WorkerReply) => void, reject: (error: Error) => void): void {
    const counters = this.counters[message.model];
    counters.messages++;
    this.workers!.submit({
      message,
      done: (reply) => {
        if (reply.rejected !== undefined) addRejections(counters.rejections, reply.rejected);
        done(reply);
      },
      reject,
    });
  }

  /**
   * Starts `threads` workers for one model, or for several (a list of tasks; see the class
   * comment). One thread runs in the calling thread unless `inWorker` is set: runs that share the
   * process (vetting candidates side by side) each need a worker of their own.
   */
  static async start(
    task: LikelihoodTask | readonly LikelihoodTask[], threads = defaultThreadCount(), options: { inWorker?: boolean } = {},
  ): Promise<LikelihoodPool> {
    const tasks = Array.isArray(task) ? task as readonly LikelihoodTask[] : [task as LikelihoodTask];
    const count = Math.max(1, Math.floor(threads));
    if (count === 1 && options.inWorker !== true) {
      const locals = tasks.map((t) => new PixelLikelihood(t.config, t.data, t.perturberCount));
      return new LikelihoodPool(1, locals.map((local) => local.system.parameters.length), undefined, locals);
    }
    // What a worker would refuse, refused here, where an InputError reaches the user as one.
    for (const t of tasks) checkBrightShare(t.config, t.data);
    const widths = tasks.map((t) => buildLensSystem(t.config, { perturberCount: t.perturberCount }).parameters.length);
    const workers = await WorkerPool.start<WorkerRequest, WorkerReply>(workerScriptUrl(import.meta.url, './likelihoodWorker.js'), tasks, count);
    return new LikelihoodPool(count, widths, workers, undefined);
  }

  /** The ModelPool of model k (the k-th task given to `start`), with counters of its own. */
  model(k: number): ModelPool {
    if (!(k >= 0 && k < this.widths.length)) throw new RangeError(`no model ${k} in a pool of ${this.widths.length}`);
    const pool = this;
    const counters = this.counters[k];
    return {
      threads: this.threads,
      width: this.widths[k],
      inWorkers: this.inWorkers,
      get evaluations() {
        return counters.evaluations;
      },
      get messages() {
        return counters.messages;
      },
      occupancy: counters.occupancy,
      get rejections() {
        return pool.rejectionsOf(k);
      },
      get idleThreads() {
        return pool.idleThreads;
      },
      evaluate: (points, count) => pool.evaluateModel(k, points, count),
      runSliceChain: (request, stop) => pool.runModelSliceChain(k, request, stop),
    };
  }

  /**
   * ln L of `count` model vectors stored row-major in `points`. The points are copied before
   * this returns, so the caller may reuse `points` at once; calls may overlap.
   */
  evaluate(points: Float64Array, count: number): Promise<Float64Array> {
    return this.evaluateModel(0, points, count);
  }

  /** Runs one slice chain of a nested-sampling step in the next idle worker (see runModelSliceChain). */
  runSliceChain(request: SliceChainRequest, stop?: Int32Array): Promise<SliceChainResult> {
    return this.runModelSliceChain(0, request, stop);
  }

  private async evaluateModel(model: number, points: Float64Array, count: number): Promise<Float64Array> {
    if (this.workers?.failed !== undefined) throw this.workers.failed;
    const counters = this.counters[model];
    counters.evaluations += count;
    counters.occupancy.record(count);
    const width = this.widths[model];
    const out = new Float64Array(count);
    if (this.locals !== undefined) {
      const local = this.locals[model];
      for (let r = 0; r < count; r++) out[r] = local.logLikelihood(points.subarray(r * width, (r + 1) * width));
      return out;
    }
    if (count === 0) return out;
    // Runs of about count / (8 threads) points: an expensive point does not hold a whole
    // half-batch up, and small calls go out one point per run.
    const piece = Math.max(1, Math.floor(count / (8 * this.threads)));
    return new Promise<Float64Array>((resolve, reject) => {
      let outstanding = count;
      for (let from = 0; from < count; from += piece) {
        const size = Math.min(piece, count - from);
        this.submit({ model, points: points.slice(from * width, (from + size) * width), count: size }, (reply) => {
          if (!('values' in reply)) return reject(new Error('likelihood worker: expected values, got a chain'));
          out.set(reply.values, from);
          outstanding -= size;
          if (outstanding === 0) resolve(out);
        }, reject);
      }
    });
  }

  /**
   * Runs one slice chain of a nested-sampling step of model `model` in the next idle worker,
   * which holds the model's prior transform and likelihood, so the chain's points need no
   * message each. Workers only (inWorkers). See ModelPool.runSliceChain for `stop`.
   */
  private runModelSliceChain(model: number, request: SliceChainRequest, stop?: Int32Array): Promise<SliceChainResult> {
    if (this.locals !== undefined || this.workers === undefined) return Promise.reject(new Error('runSliceChain needs worker threads'));
    return new Promise<SliceChainResult>((resolve, reject) => {
      this.submit(stop === undefined ? { model, chain: request } : { model, chain: request, stop }, (reply) => {
        if ('stopped' in reply) return reject(new Error('slice chain stopped on request'));
        if (!('chain' in reply)) return reject(new Error('likelihood worker: expected a chain, got values'));
        this.counters[model].evaluations += reply.chain.evaluations;
        resolve(reply.chain);
      }, reject);
    });
  }

  async close(): Promise<void> {
    await this.workers?.close();
  }
}
