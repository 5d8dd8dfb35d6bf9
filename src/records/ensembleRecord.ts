import type { ModelRecord } from './modelRecord.js';

/** Convergence diagnostics of one free parameter; null where the chain was too short to compute one. */
export interface EnsembleParameterDiagnostics {
  readonly name: string;
  readonly unit: string;
  /** Integrated autocorrelation time, in iterations. */
  readonly autocorrelationTime: number | null;
  /** Rank-normalised split R-hat, walkers as chains. */
  readonly rHat: number | null;
  readonly bulkEffectiveSampleSize: number | null;
  readonly tailEffectiveSampleSize: number | null;
}

/** What a summary says of one model's ensemble run. */
export interface EnsembleRecord {
  readonly label: string;
  readonly start: string;
  readonly walkers: number;
  /** Iterations run (each moves every walker once). */
  readonly iterations: number;
  readonly storedSteps: number;
  readonly thin: number;
  /** Stored steps left out as burn-in, before walker-paths.csv and every diagnostic. */
  readonly burnInSteps: number;
  /** Rows of walker-paths.csv: retained steps times walkers. */
  readonly retainedSamples: number;
  readonly evaluations: number;
  readonly nonFiniteProposals: number;
  /** True when the autocorrelation stopping rule was met before the step limit. */
  readonly converged: boolean;
  readonly stopped: boolean;
  readonly acceptanceFraction: { readonly mean: number; readonly min: number };
  /** False when some autocorrelation time came from a series too short for Sokal's window rule. */
  readonly autocorrelationReliable: boolean;
  /** Retained iterations over the largest autocorrelation time. */
  readonly chainLengthInAutocorrelationTimes: number | null;
  readonly maxRHat: number | null;
  readonly diagnostics: readonly EnsembleParameterDiagnostics[];
  /** Reasons not to trust the chain yet (R-hat, chain length); empty when none. */
  readonly warnings: readonly string[];
  readonly bestLnLikelihood: number;
  readonly bestFit: Record<string, number>;
  readonly bestFitAmplitudes: Record<string, number>;
  readonly seconds: number;
  readonly threads: number;
  readonly parameters: ModelRecord['parameters'];
  readonly files: Record<string, string>;
}
