import type { SeededStream } from '../../numeric/random/seededStream.js';
import type { GrowableChain } from './growableChain.js';

/** Everything a run carries from one iteration to the next (and so everything a checkpoint holds). */
export interface EnsembleState {
  iteration: number;
  /** Current walker positions, walkers x dim. */
  readonly positions: Float64Array;
  /** Current log density of each walker. */
  readonly logDensities: Float64Array;
  /** Accepted proposals per walker. */
  readonly accepted: Float64Array;
  evaluations: number;
  nonFiniteProposals: number;
  /** Autocorrelation times of the last convergence check (stored-step units), or null. */
  previousTau: Float64Array | null;
  autocorrelationTimeMax: number;
  converged: boolean;
  readonly chain: GrowableChain;
  readonly random: SeededStream;
}
