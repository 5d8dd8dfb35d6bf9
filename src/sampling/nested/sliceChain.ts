import type { SliceSettings, UnitBatchEvaluator } from './sliceSettings.js';
import { sliceChains } from './sliceChains.js';

export { sliceChainSeeds, type SliceSettings, type UnitBatchEvaluator } from './sliceSettings.js';

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
