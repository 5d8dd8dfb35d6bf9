import type { MisfitRecord } from './misfitRecord.js';
import type { ModelRecord, RejectionCountsRecord } from './modelRecord.js';

/** Convergence diagnostics of one free parameter; null where the chain was too short to compute one. */
export interface EnsembleParameterDiagnostics {
  readonly name: string;
  readonly unit: string;
  /** Integrated autocorrelation time (Sokal's window), in sweeps. */
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
  /** Sweeps run (each proposes a move to every walker once). */
  readonly sweeps: number;
  /** Sweeps stored (every thin-th). */
  readonly storedSweeps: number;
  readonly thin: number;
  /** Sweeps left out as burn-in, before walker-paths.csv and every diagnostic. */
  readonly burnInSweeps: number;
  /** Rows of walker-paths.csv: retained stored sweeps times walkers. */
  readonly retainedSamples: number;
  readonly evaluations: number;
  readonly nonFiniteProposals: number;
  /** With a pixelated source: its likelihoods of minus infinity by reason (absent otherwise, and in older records). */
  readonly likelihoodRejections?: RejectionCountsRecord;
  /** When the run counts as mixed: every free parameter's R-hat at most maxRHat, bulk and tail ESS at least minEffectiveSampleSize. */
  readonly stopRule: { readonly minEffectiveSampleSize: number; readonly maxRHat: number };
  /** True when the stop rule was met before the sweep limit. */
  readonly converged: boolean;
  readonly stopped: boolean;
  readonly acceptanceFraction: { readonly mean: number; readonly min: number };
  /** False when some autocorrelation time came from a series too short for Sokal's window rule. */
  readonly autocorrelationReliable: boolean;
  /** The smallest bulk or tail ESS and the largest R-hat over the free parameters. */
  readonly smallestEffectiveSampleSize: number | null;
  readonly maxRHat: number | null;
  readonly diagnostics: readonly EnsembleParameterDiagnostics[];
  /** Reasons not to trust the chain yet (stop rule not met, R-hat, autocorrelation times); empty when none. */
  readonly warnings: readonly string[];
  readonly bestLnLikelihood: number;
  readonly bestFit: Record<string, number>;
  readonly bestFitAmplitudes: Record<string, number>;
  /** The misfit alarm at the best sample after burn-in. */
  readonly misfit: MisfitRecord;
  readonly seconds: number;
  readonly threads: number;
  readonly parameters: ModelRecord['parameters'];
  readonly files: Record<string, string>;
}
