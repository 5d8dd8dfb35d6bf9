import type { PriorDescription } from '../priors/parameterSpace.js';
import type { EnsembleRecord } from './ensembleRecord.js';
import type { ModelRecord } from './modelRecord.js';
import type { PerturberSummary } from './perturberSummary.js';
import type { RunProvenance } from './provenance.js';

/** What every fit summary holds, whichever the sampler. */
interface FitSummaryBase extends RunProvenance {
  readonly kind: 'fit';
  readonly perturberCount: number;
  readonly settings: Record<string, unknown>;
  /** The priors of every parameter (fixed ones included): every posterior and ln Z depends on them. */
  readonly priors: readonly PriorDescription[];
  readonly amplitudePrior: string;
  readonly caution: string;
}

/** The summary.json of a nested-sampling fit. */
export interface NestedFitSummary extends FitSummaryBase {
  readonly sampler: 'nested';
  readonly evidence: { readonly lnEvidence: number; readonly lnEvidenceError: number; readonly lnEvidenceErrorSimulated: number };
  readonly model: ModelRecord;
  readonly perturbers: readonly PerturberSummary[];
}

/** The summary.json of an ensemble-MCMC fit (no evidence). */
export interface EnsembleFitSummary extends FitSummaryBase {
  readonly sampler: 'ensemble';
  readonly model: EnsembleRecord;
}

export type FitSummary = NestedFitSummary | EnsembleFitSummary;
