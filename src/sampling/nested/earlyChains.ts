import { lowestSlots } from './lowestSlots.js';
import { chooseChainStarts, shrinkClusterVolumes } from './liveClusters.js';
import { SeededStream } from '../../numeric/random/seededStream.js';
import { sliceChainSeeds, type SliceChainRequest, type SliceChainResult, type SliceSettings } from './sliceChain.js';

/** A slice step as it stands while its chains run: what the next step's chains are made from. */
export interface RunningSliceStep {
  /** ln L of the live points, -Infinity at the slots this step frees. */
  readonly liveLnL: Float64Array;
  readonly liveUnit: Float64Array;
  readonly livePhysical: Float64Array;
  /** The freed slots: chain j's end point goes to slots[j]. */
  readonly slots: Int32Array;
  /** The stream after this step's draws. */
  readonly stream: SeededStream;
  /** Cluster labels of the live points as the next step will have them, except the freed slots; */
  readonly liveCluster: Int32Array;
  /** the clusters of the points this step puts into the freed slots; */
  readonly newLabels: Int32Array;
  /** the clusters' ln X after this step's removal, and their whitenings as the next step will use them. */
  readonly clusterLnX: Float64Array;
  readonly whitenings: readonly Float64Array[];
  readonly settings: SliceSettings;
}

/**
 * The chains of the next step as they will be if chain `pending`, still running, does not end
 * among the k lowest live points (so the next threshold and start points are known without it):
 * the next step's removal, threshold, start slots and seeds exactly as runNested's slice step
 * will draw them, from a copy of the stream. A chain whose start point would be the pending
 * chain's end point is left out.
 */
export function nextStepChains(
  step: RunningSliceStep, results: readonly (SliceChainResult | undefined)[], pending: number,
): { chain: number; request: SliceChainRequest }[] {
  const { slots, settings } = step;
  const { dim, physicalDim } = settings;
  const k = slots.length;
  const lnL = Float64Array.from(step.liveLnL);
  const labels = Int32Array.from(step.liveCluster);
  for (let j = 0; j < k; j++) {
    lnL[slots[j]] = j === pending ? Infinity : results[j]!.lnL;
    labels[slots[j]] = step.newLabels[j];
  }
  const removed = lowestSlots(lnL, k);
  const threshold = lnL[removed[k - 1]];
  for (let j = 0; j < k; j++) lnL[removed[j]] = -Infinity;
  const clusterLnX = Float64Array.from(step.clusterLnX);
  shrinkClusterVolumes(labels, lnL, removed, clusterLnX);
  const stream = SeededStream.fromState(step.stream.stateWords());
  const starts = chooseChainStarts(lnL, labels, clusterLnX, k, stream);
  const seeds = sliceChainSeeds(stream, k);
  const chains: { chain: number; request: SliceChainRequest }[] = [];
  for (let chain = 0; chain < k; chain++) {
    const slot = starts[chain];
    if (slot === slots[pending]) continue;
    const from = slots.indexOf(slot);
    const result = from >= 0 ? results[from]! : undefined;
    chains.push({
      chain,
      request: {
        seed: seeds[chain],
        startUnit: result?.unit.slice() ?? step.liveUnit.slice(slot * dim, slot * dim + dim),
        startPhysical: result?.physical.slice() ?? step.livePhysical.slice(slot * physicalDim, slot * physicalDim + physicalDim),
        startLnL: lnL[slot],
        threshold,
        whitening: step.whitenings[labels[slot]],
        settings,
      },
    });
  }
  return chains;
}

/** Whether two chain requests would run the same chain (the settings are those of one run). */
function sameRequest(a: SliceChainRequest, b: SliceChainRequest): boolean {
  if (a.seed !== b.seed || a.threshold !== b.threshold || a.startLnL !== b.startLnL || a.whitening !== b.whitening) return false;
  return sameValues(a.startUnit, b.startUnit) && sameValues(a.startPhysical, b.startPhysical);
}

function sameValues(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/** A chain of a later step, started before its step, and what it was started on. */
interface EarlyChain {
  readonly step: number;
  readonly chain: number;
  readonly request: SliceChainRequest;
  readonly result: Promise<SliceChainResult>;
  /** Set to stop the chain where it runs (see NestedProblem.runSliceChain). */
  readonly stop: Int32Array;
}

/**
 * Runs the slice chains of nested-sampling steps in worker threads, starting the next step's
 * chains early when a thread falls idle (speculative execution): while the last chain of a step
 * still runs, a free thread runs the next step's chains as they will be unless that last chain
 * ends among the lowest live points (nextStepChains; about k/N of the time). When the next step
 * comes, an early chain whose request is exactly the step's own is used, any other is dropped
 * (stopped where it runs) and the chain run afresh. A chain's path depends only on its request, so the run's result is
 * the same with or without early chains, on any number of threads; only the time changes.
 * Without it the two chains of a step wait for the longer one (1.83 of 2 threads busy at best in
 * the demo); with it a freed thread goes on at once.
 */
export class EarlyChains {
  /** Early chains used, and dropped because their step turned out otherwise. */
  used = 0;
  discarded = 0;
  private entries: EarlyChain[] = [];
  private readonly run: (request: SliceChainRequest, stop?: Int32Array) => Promise<SliceChainResult>;
  private readonly idleThreads: () => number;

  constructor(run: (request: SliceChainRequest, stop?: Int32Array) => Promise<SliceChainResult>, idleThreads: () => number) {
    this.run = run;
    this.idleThreads = idleThreads;
  }

  /**
   * Runs the chains of step `step` (its requests in chain order) and returns their results; once
   * all but one have ended and a thread is idle, starts the chains `next(results, pending)` of
   * step + 1 while the last one runs.
   */
  runStep(
    step: number, requests: readonly SliceChainRequest[],
    next: (results: readonly (SliceChainResult | undefined)[], pending: number) => { chain: number; request: SliceChainRequest }[],
  ): Promise<SliceChainResult[]> {
    this.dropBefore(step);
    const results: (SliceChainResult | undefined)[] = new Array<SliceChainResult | undefined>(requests.length).fill(undefined);
    let pending = requests.length;
    let startedNext = false;
    return new Promise<SliceChainResult[]>((resolve, reject) => {
      const startNext = (): void => {
        if (startedNext || pending !== 1 || this.idleThreads() === 0) return;
        startedNext = true;
        for (const { chain, request } of next(results, results.indexOf(undefined))) {
          if (this.idleThreads() === 0) break;
          const stop = new Int32Array(new SharedArrayBuffer(Int32Array.BYTES_PER_ELEMENT));
          const result = this.run(request, stop);
          // An early chain nobody takes (stopped, the run ended, the pool closed) must not fail the process.
          result.catch(() => undefined);
          this.entries.push({ step: step + 1, chain, request, result, stop });
        }
      };
      requests.forEach((request, chain) => {
        this.take(step, chain, request).then((result) => {
          results[chain] = result;
          pending--;
          if (pending === 0) resolve(results as SliceChainResult[]);
          else startNext();
        }, reject);
      });
      startNext();
    });
  }

  /** The early chain of (step, chain) if it was started on exactly `request`, else a fresh one. */
  private take(step: number, chain: number, request: SliceChainRequest): Promise<SliceChainResult> {
    const index = this.entries.findIndex((entry) => entry.step === step && entry.chain === chain);
    if (index >= 0) {
      const [early] = this.entries.splice(index, 1);
      if (sameRequest(early.request, request)) {
        this.used++;
        return early.result;
      }
      this.drop(early);
    }
    return this.run(request);
  }

  private dropBefore(step: number): void {
    for (const entry of this.entries) if (entry.step < step) this.drop(entry);
    this.entries = this.entries.filter((entry) => entry.step >= step);
  }

  /** Counts an early chain as dropped and stops it where it runs, freeing its thread. */
  private drop(entry: EarlyChain): void {
    Atomics.store(entry.stop, 0, 1);
    this.discarded++;
  }
}
