import type { PriorDescription } from '../priors/parameterSpace.js';
import type { DetectionClaim } from '../results/detectionClaim.js';
import type { MisfitRecord } from './misfitRecord.js';
import type { PerturberSummary } from './perturberSummary.js';
import type { RunProvenance } from './provenance.js';

/** What the robust verdict says: confirmed, not confirmed, or not evidence of a subhalo at all. */
export type RobustVerdictKind = 'confirmed' | 'not-confirmed' | 'not-evidence';

/** The robust verdict over the families and why. */
export interface RobustVerdict {
  readonly verdict: RobustVerdictKind;
  readonly thresholdLnB: number;
  readonly thresholdSource: string;
  /** Names of the families whose smooth model passes the misfit test (the verdict rests on them). */
  readonly acceptableFamilies: readonly string[];
  /** The family of highest smooth ln Z: the one the data prefer without a perturber. */
  readonly preferredFamily: string;
  /** The lowest ln B among the acceptable families; null when none is acceptable. */
  readonly leastFavourable: { readonly family: string; readonly lnBayesFactor: number; readonly lnBayesFactorError: number } | null;
  /** The verdict in one sentence. */
  readonly sentence: string;
  /** Further lines behind it (families set aside, warnings). */
  readonly reasons: readonly string[];
  /** Families to add (always given; the verdict's sentence cites them when it is not-evidence). */
  readonly suggestions: readonly string[];
}

/** One fit of a family, as verdict.json lists it. */
export interface VerdictFitRecord {
  readonly lnEvidence: number;
  readonly lnEvidenceError: number;
  readonly stopReason: string;
  readonly misfit: MisfitRecord;
}

/** One family's comparison, as verdict.json lists it (its whole record is `folder`/summary.json). */
export interface VerdictFamilyRecord {
  readonly name: string;
  /** Its key in the config, e.g. `smoothFamilies[1]`. */
  readonly key: string;
  /** Its compare folder, relative to the verdict's folder (e.g. `families/power-law-multipoles`). */
  readonly folder: string;
  /** The base config's parts it replaces. */
  readonly replaces: readonly string[];
  /** Its smooth model's components in words. */
  readonly components: { readonly lens: string; readonly source: string };
  readonly smooth: VerdictFitRecord;
  readonly perturbed: VerdictFitRecord;
  readonly lnBayesFactor: number;
  readonly lnBayesFactorError: number;
  /** Kass & Raftery 1995 reading of ln B. */
  readonly reading: string;
  /** compare's detection claim within this family alone. */
  readonly claim: DetectionClaim;
  /** True when its smooth model passes the misfit test. */
  readonly acceptable: boolean;
  readonly perturbers: readonly PerturberSummary[];
  /** The priors behind its two evidences. */
  readonly priors: { readonly smooth: readonly PriorDescription[]; readonly perturbed: readonly PriorDescription[] };
  /** Region priors on perturber positions, where given (they replace the box of the x and y priors). */
  readonly positionPriors: readonly { readonly key: string; readonly region: string }[];
}

/** verdict.json: written last, only for a finished verdict. */
export interface VerdictSummary extends RunProvenance {
  readonly kind: 'verdict';
  readonly settings: Record<string, unknown>;
  readonly families: readonly VerdictFamilyRecord[];
  readonly verdict: RobustVerdict;
  /** The rule, in words, as README states it. */
  readonly rule: string;
  /** What the verdict does not guarantee. */
  readonly limits: string;
  readonly amplitudePrior: string;
  readonly caution: string;
}
