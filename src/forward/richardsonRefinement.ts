import { richardsonFactor } from './midpointStencil.js';
import { DONE, HOPELESS, REFINE, STRAIGHT_TO_FULL, type PixelMeanState } from './pixelMeanState.js';
import type { StencilMemory } from './stencilKernel.js';

/** Weight of the Richardson correction in the indicator of the intermediate levels. */
const RICHARDSON_GUARD = 0.03;
/**
 * From the second factor on, the change between two Richardson predictions measures the error of
 * the earlier one; the later one's error is taken as that change over this factor. For light
 * smooth on the sub-pixel scale the extrapolated midpoint error falls as m^-4 (the midpoint
 * rule's error runs in even powers of 1/m), 17-fold from m = 2 to 4 towards S = 8, so 4 leaves a
 * factor of four (test/forward/midpointStencil.test.ts; DEVELOPERS.md has the measurements).
 */
export const EXTRAPOLATED_CONVERGENCE = 4;

/**
 * The intermediate levels of the adaptive pixel means: pixels above their tolerance get m x m
 * sub-pixel rays, m = 2, 4, ... below S; the S-point mean is predicted by Richardson
 * extrapolation from the means at the last two factors (richardsonFactor); the indicator is the
 * change from the previous prediction (divided by EXTRAPOLATED_CONVERGENCE when that prediction
 * was itself extrapolated) and RICHARDSON_GUARD times the extrapolation step. At m = S the mean
 * is the model's value itself. A pixel more than HOPELESS tolerances off goes to S x S directly.
 */
export class RichardsonRefinement {
  /** Sub-pixel factors after the lattice, ending with S. */
  readonly factors: Int32Array;
  /** Pixels finished at the lattice (index 0) and at each factor (index l + 1), last evaluation. */
  readonly pixelsByLevel: Int32Array;
  private readonly richardsonByLevel: Float64Array;
  private readonly supersampling: number;
  private readonly state: PixelMeanState;
  /** Where the extrapolation runs in WebAssembly (the state's buffers are its views), else null. */
  private readonly memory: StencilMemory | null;

  constructor(state: PixelMeanState, supersampling: number, adaptive: boolean, memory?: StencilMemory) {
    this.state = state;
    this.memory = memory ?? null;
    this.supersampling = supersampling;
    const factors: number[] = [];
    if (adaptive) for (let m = 2; m < supersampling; m *= 2) factors.push(m);
    factors.push(supersampling);
    this.factors = Int32Array.from(factors);
    // Richardson factor of each level from the previous factor (1 for the lattice) to this one.
    this.richardsonByLevel = Float64Array.from(factors, (m, level) => richardsonFactor(level === 0 ? 1 : factors[level - 1], m, supersampling));
    this.pixelsByLevel = new Int32Array(factors.length + 1);
  }

  /** Accepts or keeps pending the pixels after factor m; returns how many stay pending. */
  refine(m: number, level: number, pendingCount: number): number {
    const state = this.state;
    if (m === this.supersampling) {
      // The S x S means, the model's values, are already in `means` (AdaptivePixelMeans).
      this.pixelsByLevel[level + 1] = pendingCount;
      return 0;
    }
    this.extrapolate(level, pendingCount);
    const directBefore = state.directCount;
    state.directCount = state.collectFlagged(STRAIGHT_TO_FULL, state.pending, pendingCount, state.direct, directBefore);
    const kept = state.collectFlagged(REFINE, state.pending, pendingCount, state.pending, 0);
    this.pixelsByLevel[level + 1] = pendingCount - kept - (state.directCount - directBefore);
    return kept;
  }

  /** Richardson extrapolation (the factor of `level`) of the pending pixels into `means`, each flagged. */
  private extrapolate(level: number, pendingCount: number): void {
    const factor = this.richardsonByLevel[level];
    const convergence = level === 0 ? 1 : 1 / EXTRAPOLATED_CONVERGENCE;
    if (this.memory !== null) {
      this.memory.extrapolate(pendingCount, factor, convergence, RICHARDSON_GUARD, HOPELESS);
      return;
    }
    const { count, basisCount, means, previous, current, pending, flags: flagged, scale, relativeTolerance } = this.state;
    for (let t = 0; t < pendingCount; t++) {
      const e = pending[t];
      let refineFurther = false;
      let hopeless = false;
      for (let k = 0; k < basisCount; k++) {
        const index = k * count + e;
        const now = current[index];
        const step = (now - previous[index]) * factor;
        const predicted = now + step;
        const indicator = Math.max(convergence * Math.abs(predicted - means[index]), RICHARDSON_GUARD * Math.abs(step));
        const tolerance = scale[k] * relativeTolerance[e];
        if (indicator > tolerance) refineFurther = true;
        if (indicator > HOPELESS * tolerance) hopeless = true;
        means[index] = predicted;
        previous[index] = now;
      }
      flagged[e] = hopeless ? STRAIGHT_TO_FULL : refineFurther ? REFINE : DONE;
    }
  }
}
