import type { SeededStream } from '../../numeric/random/seededStream.js';
import type { GrowableChain } from './growableChain.js';
import type { MixingCheck } from './mixingCheck.js';

/** Everything a run carries from one sweep to the next (and so everything a checkpoint holds). */
export interface EnsembleState {
  sweep: number;
  /** Current walker positions, walkers x dim. */
  readonly positions: Float64Array;
  /** Current log density of each walker. */
  readonly logDensities: Float64Array;
  /** Accepted proposals per walker. */
  readonly accepted: Float64Array;
  evaluations: number;
  nonFiniteProposals: number;
  /** The last check of the stop rule (a pure function of the chain, so recomputed on resume), or null. */
  lastCheck: MixingCheck | null;
  readonly chain: GrowableChain;
  readonly random: SeededStream;
  /** The problem's RunTallies read back from a checkpoint (absent otherwise). */
  readonly tallies?: Record<string, number>;
}
