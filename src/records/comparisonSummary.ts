import type { PriorDescription } from '../priors/parameterSpace.js';
import type { DetectionClaim } from '../results/detectionClaim.js';
import type { ModelRecord } from './modelRecord.js';
import type { PerturberSummary } from './perturberSummary.js';
import type { RunProvenance } from './provenance.js';

/** The summary.json of a comparison run. */
export interface ComparisonSummary extends RunProvenance {
  readonly kind: 'comparison';
  readonly settings: Record<string, unknown>;
  readonly models: { readonly smooth: ModelRecord; readonly perturbed: ModelRecord };
  readonly bayesFactor: {
    readonly lnBayesFactor: number;
    readonly lnBayesFactorError: number;
    readonly reading: string;
    readonly kassRafteryGrade: string;
    readonly significance: string;
    readonly pValueBound: number | null;
    readonly sigmaBound: number | null;
    readonly perturberFavoured: boolean;
    readonly favouredAbove: number;
  };
  /** The detection claim: ln B against the threshold, and the models' misfit alarms. */
  readonly detection: ComparisonDetection;
  readonly perturbers: readonly PerturberSummary[];
  readonly priors: { readonly smooth: readonly PriorDescription[]; readonly perturbed: readonly PriorDescription[] };
  /** Region priors on perturber positions, where given (they replace the box of the x and y priors). */
  readonly positionPriors: readonly { readonly key: string; readonly region: string }[];
  readonly amplitudePrior: string;
  readonly caution: string;
}

/** What summary.json says of the detection (results/detectionClaim.ts). */
export interface ComparisonDetection extends DetectionClaim {
  readonly smoothMisfit: boolean;
  readonly perturbedMisfit: boolean;
}
