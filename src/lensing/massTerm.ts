import type { MassProfile } from '../lens/massProfile.js';

/** A mass profile placed in a profile vector: it reads its parameters from p[offset] on. */
export interface MassTerm {
  /** The reference formula (what reports and checks evaluate). */
  readonly profile: MassProfile;
  readonly offset: number;
  /** The evaluation the forward model runs (see MassProfilePair); the reference when absent. */
  readonly fast?: MassProfile;
}
