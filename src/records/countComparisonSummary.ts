import type { PriorDescription } from '../priors/parameterSpace.js';
import type { ModelRecord } from './modelRecord.js';
import type { PerturberSummary } from './perturberSummary.js';
import type { RunProvenance } from './provenance.js';

/** One perturber count's evidence in a count comparison. */
export interface CountRow {
  readonly perturbers: number;
  readonly lnEvidence: number;
  readonly lnEvidenceError: number;
  /** ln Z(k) - ln Z(k - 1); null for k = 0. */
  readonly lnBayesFactorToPrevious: number | null;
  readonly lnBayesFactorToSmooth: number;
  readonly reading: string;
  readonly relabelled: boolean;
}

/** The summary.json of `compare --max-perturbers`. */
export interface CountComparisonSummary extends RunProvenance {
  readonly kind: 'perturberCount';
  readonly rows: readonly CountRow[];
  readonly preferredCount: number;
  /**
   * The count the data claim: the largest k whose every step 1..k has ln B (k against k - 1)
   * above the detection threshold, and 0 (not evidence) when the smooth model fails the misfit test.
   */
  readonly detection: {
    readonly thresholdLnB: number;
    readonly thresholdSource: string;
    readonly detectedCount: number;
    readonly smoothMisfit: boolean;
    readonly sentence: string;
  };
  readonly models: readonly ModelRecord[];
  readonly perturbers: readonly PerturberSummary[];
  readonly priors: readonly PriorDescription[];
  readonly labelSwitching: string;
  readonly caution: string;
}
