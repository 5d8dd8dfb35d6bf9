import { Worker } from 'node:worker_threads';
import { availableParallelism } from 'node:os';

/** The default thread count: every available core. */
export function defaultThreadCount(): number {
  return availableParallelism();
}

/** One message for a worker, and what to do with its answer. */
export interface PoolJob<Message, Reply> {
  readonly message: Message;
  readonly done: (reply: Reply) => void;
  readonly reject: (error: Error) => void;
}

/**
 * Worker threads running one script, fed from one queue: an idle worker takes the next job, and
 * its reply goes to that job's `done`. Each worker is built with the same `workerData` and posts
 * one message (any) when it is ready; then it answers every message with exactly one reply.
 * A worker's error fails every queued and running job, and every later one. Messages are copied,
 * never transferred (see likelihoodWorker.ts for why).
 */
export class WorkerPool<Message, Reply> {
  readonly threads: number;
  private readonly workers: Worker[];
  private readonly queue: PoolJob<Message, Reply>[] = [];
  private readonly idle: Worker[];
  private readonly running = new Map<Worker, PoolJob<Message, Reply>>();
  private failure: Error | undefined;

  private constructor(workers: Worker[]) {
    this.threads = workers.length;
    this.workers = workers;
    this.idle = workers.slice();
    for (const worker of workers) {
      worker.on('message', (reply: Reply) => {
        const job = this.running.get(worker);
        this.running.delete(worker);
        this.idle.push(worker);
        this.dispatch();
        job?.done(reply);
      });
      worker.on('error', (error) => this.fail(error));
    }
  }

  /** Starts `threads` workers of `script` and resolves once each has said it is ready. */
  static async start<Message, Reply>(script: URL, workerData: unknown, threads: number): Promise<WorkerPool<Message, Reply>> {
    const count = Math.max(1, Math.floor(threads));
    const workers = await Promise.all(Array.from({ length: count }, () => new Promise<Worker>((resolve, reject) => {
      const worker = new Worker(script, { workerData });
      worker.once('error', reject);
      worker.once('message', () => {
        worker.off('error', reject);
        resolve(worker);
      });
    })));
    return new WorkerPool<Message, Reply>(workers);
  }

  /** Workers with nothing to do right now (0 while jobs wait in the queue). */
  get idleThreads(): number {
    return this.queue.length === 0 ? this.idle.length : 0;
  }

  /** Queues a job; rejects it at once when a worker has failed. */
  submit(job: PoolJob<Message, Reply>): void {
    if (this.failure !== undefined) {
      job.reject(this.failure);
      return;
    }
    this.queue.push(job);
    this.dispatch();
  }

  /** The error that failed the pool, if any. */
  get failed(): Error | undefined {
    return this.failure;
  }

  private fail(error: Error): void {
    this.failure = error;
    for (const job of this.running.values()) job.reject(error);
    for (const job of this.queue) job.reject(error);
    this.running.clear();
    this.queue.length = 0;
  }

  /** Hands queued jobs to idle workers. */
  private dispatch(): void {
    while (this.idle.length > 0 && this.queue.length > 0) {
      const worker = this.idle.shift()!;
      const job = this.queue.shift()!;
      this.running.set(worker, job);
      worker.postMessage(job.message);
    }
  }

  async close(): Promise<void> {
    await Promise.all(this.workers.map((worker) => worker.terminate()));
  }
}
