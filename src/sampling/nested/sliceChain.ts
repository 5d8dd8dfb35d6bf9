import type { SeededStream } from '../../numeric/random/seededStream.js';
import { sliceChains } from './sliceChains.js';

/** Evaluates unit-cube rows: writes their physical rows and returns sanitised ln L (-Infinity if impossible). */
export type UnitBatchEvaluator = (unit: Float64Array, count: number, physicalOut: Float64Array) => Promise<Float64Array>;

export interface SliceSettings {
  readonly dim: number;
  readonly physicalDim: number;
  /** slice moves per chain. */
  readonly steps: number;
  /** 1 where the unit coordinate wraps, else 0; null when none wraps. */
  readonly periodic: Uint8Array | null;
  /** initial bracket width in units of the whitened direction's length. */
  readonly widthScale: number;
  /** Neal's cap m on stepping-out expansions per move. */
  readonly maxExpansions: number;
  /**
   * Points each chain puts into one round (s >= 1; default 1): bracket ends of both sides and the
   * next expansions while stepping out, s candidates at once while shrinking. Only the number of
   * evaluations and rounds depends on it, never the law of the draws.
   */
  readonly pointsPerChain?: number;
}

/** Seeds of k slice chains' own streams, drawn from `stream` in chain order (as sliceChains does). */
export function sliceChainSeeds(stream: SeededStream, chains: number): number[] {
  const seeds: number[] = [];
  for (let chain = 0; chain < chains; chain++) seeds.push(1 + Math.floor(stream.uniform() * 0xfffffffe));
  return seeds;
}

/** One slice chain, as plain data that can be posted to a worker thread. */
export interface SliceChainRequest {
  readonly seed: number;
  readonly startUnit: Float64Array;
  readonly startPhysical: Float64Array;
  readonly startLnL: number;
  readonly threshold: number;
  readonly whitening: Float64Array;
  readonly settings: SliceSettings;
}

/** Where a slice chain ended, and what it cost. */
export interface SliceChainResult {
  readonly unit: Float64Array;
  readonly physical: Float64Array;
  readonly lnL: number;
  readonly evaluations: number;
  /** Evaluations whose ln L was NaN or infinite (counted by the evaluator that ran the chain). */
  readonly nonFinite: number;
}

/** The chain of `request` run alone, exactly as it would run among others in sliceChains. */
export async function runSliceChain(
  request: SliceChainRequest, evaluate: UnitBatchEvaluator,
): Promise<Omit<SliceChainResult, 'nonFinite'>> {
  const { dim, physicalDim } = request.settings;
  const unit = new Float64Array(dim);
  const physical = new Float64Array(physicalDim);
  const lnL = new Float64Array(1);
  const evaluations = await sliceChains({
    chains: 1,
    start: { unit: request.startUnit, physical: request.startPhysical, lnL: Float64Array.of(request.startLnL) },
    threshold: request.threshold,
    whitening: request.whitening,
    settings: request.settings,
    seeds: [request.seed],
    evaluate,
    out: { unit, physical, lnL },
  });
  return { unit, physical, lnL: lnL[0], evaluations };
}
