import type { SeededStream } from '../../numeric/random/seededStream.js';

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
