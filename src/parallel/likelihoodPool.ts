import { Worker } from 'node:worker_threads';
import { availableParallelism } from 'node:os';
import { PixelLikelihood } from '../likelihood/pixelLikelihood.js';
import { buildLensSystem } from '../model/lensSystem.js';
import type { LikelihoodTask } from './likelihoodTask.js';
import { workerScriptUrl } from './workerScriptUrl.js';

interface PendingBatch {
  readonly resolve: (values: Float64Array) => void;
  readonly reject: (error: Error) => void;
}

/** The default thread count: every available core. */
export function defaultThreadCount(): number {
  return availableParallelism();
}

/**
 * Evaluates batches of model vectors (row-major, one row per point, in the model's parameter
 * order) across worker threads. Idle workers take the next points of a batch from a queue and
 * every answer is stored at its point's index, so results never depend on the thread count or
 * on timing.
 * With one thread everything runs in the calling thread.
 */
export class LikelihoodPool {
  readonly threads: number;
  readonly width: number;
  private readonly workers: Worker[];
  private readonly local: PixelLikelihood | undefined;
  private readonly pending = new Map<number, PendingBatch>();
  private nextId = 0;
  private failure: Error | undefined;
  /** Number of likelihood evaluations made so far. */
  evaluations = 0;

  private constructor(threads: number, width: number, workers: Worker[], local: PixelLikelihood | undefined) {
    this.threads = threads;
    this.width = width;
    this.workers = workers;
    this.local = local;
    for (const worker of workers) {
      worker.on('message', (message: { id?: number; values?: Float64Array }) => {
        if (message.id === undefined) return;
        const batch = this.pending.get(message.id);
        this.pending.delete(message.id);
        batch?.resolve(message.values!);
      });
      worker.on('error', (error) => this.fail(error));
    }
  }

  private fail(error: Error): void {
    this.failure = error;
    for (const batch of this.pending.values()) batch.reject(error);
    this.pending.clear();
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

  /** ln L of `count` model vectors stored row-major in `points`. */
  async evaluate(points: Float64Array, count: number): Promise<Float64Array> {
    if (this.failure !== undefined) throw this.failure;
    this.evaluations += count;
    const width = this.width;
    if (this.local !== undefined) {
      const out = new Float64Array(count);
      for (let r = 0; r < count; r++) out[r] = this.local.logLikelihood(points.subarray(r * width, (r + 1) * width));
      return out;
    }
    // A work queue: each idle worker takes the next few points, so an expensive point does not
    // hold the others up. Every value lands at its own index, so the result is the same
    // whatever worker computed it and in whatever order.
    const out = new Float64Array(count);
    const piece = Math.max(1, Math.floor(count / (8 * this.workers.length)));
    let next = 0;
    const runWorker = async (worker: Worker): Promise<void> => {
      while (next < count) {
        const from = next;
        const size = Math.min(piece, count - from);
        next += size;
        const chunk = points.slice(from * width, (from + size) * width);
        const id = this.nextId++;
        const values = await new Promise<Float64Array>((resolve, reject) => {
          this.pending.set(id, { resolve, reject });
          worker.postMessage({ id, points: chunk, count: size }, [chunk.buffer]);
        });
        out.set(values, from);
      }
    };
    await Promise.all(this.workers.map(runWorker));
    return out;
  }

  async close(): Promise<void> {
    await Promise.all(this.workers.map((worker) => worker.terminate()));
  }
}
