import { InputError } from '../../errors.js';
import { insertionRankTest, type InsertionRankCheck } from './insertionRank.js';
import type { EvidenceMethod, NestedResult } from './nestedProblem.js';

/** Independent runs of one model merged into one evidence and one weighted posterior. */
export interface MergedEvidence {
  readonly runs: number;
  readonly evidenceMethod: EvidenceMethod;
  readonly lnZ: number;
  readonly lnZError: number;
  /** likelihood evaluations of all runs. */
  readonly evaluations: number;
  /** each run's ln Z and error, in the order given. */
  readonly parts: readonly { readonly lnZ: number; readonly lnZError: number }[];
  /** all runs' weighted points (physical rows of physicalDim), log weights normalised to sum 1. */
  readonly physicalDim: number;
  readonly count: number;
  readonly points: Float64Array;
  readonly lnL: Float64Array;
  readonly lnWeight: Float64Array;
  /** the insertion-rank check over the ranks of all runs together. */
  readonly insertionRank: InsertionRankCheck;
}

/**
 * Merges independent runs of one model (different seeds, perhaps on different machines).
 * Importance evidence: Z = sum_i n_i Z_i / sum_i n_i, n_i each run's final draws, the pooled mean
 * of all runs' weights (every weight is an unbiased estimate of Z whatever its proposal; Owen 2013,
 * Section 9.1), with Var Z = sum_i n_i^2 Var Z_i / (sum n_i)^2 and Var Z_i = (Z_i err_i)^2 (err_i
 * the relative error each run quotes). Nested evidence: the inverse-variance mean of the ln Z_i,
 * error (sum_i 1 / err_i^2)^{-1/2}, which for runs of equal live points N matches Skilling's
 * sqrt(H / (R N)) of one run with R N live points (Skilling 2006, Section 5; merging runs into
 * one with more live points, Higson et al. 2019, Statistics and Computing 29, 891, Section 2).
 * Posterior points: each run's normalised weights times 1 / R. All runs must have one method and
 * the same dimensions; an InputError names the first that differs.
 */
export function mergeEvidenceRuns(results: readonly NestedResult[], seed = 1): MergedEvidence {
  if (results.length === 0) throw new InputError('merging runs: expected at least one run, found none');
  const first = results[0];
  const physicalDim = first.points.length / Math.max(1, first.count);
  results.forEach((result, i) => {
    if (result.evidenceMethod !== first.evidenceMethod) {
      throw new InputError(`merging runs: run ${i + 1} estimated ln Z by ${result.evidenceMethod}, run 1 by ${first.evidenceMethod}; merge runs of one method`);
    }
    if (result.points.length / Math.max(1, result.count) !== physicalDim) {
      throw new InputError(`merging runs: run ${i + 1} has ${result.points.length / Math.max(1, result.count)} parameters, run 1 has ${physicalDim}; merge runs of one model`);
    }
  });
  const { lnZ, lnZError } = first.evidenceMethod === 'importance' ? importanceMerge(results) : nestedMerge(results);
  let count = 0;
  for (const result of results) count += result.count;
  const points = new Float64Array(count * physicalDim);
  const lnL = new Float64Array(count);
  const lnWeight = new Float64Array(count);
  const lnShare = -Math.log(results.length);
  let row = 0;
  for (const result of results) {
    points.set(result.points.subarray(0, result.count * physicalDim), row * physicalDim);
    for (let i = 0; i < result.count; i++) {
      lnL[row + i] = result.lnL[i];
      lnWeight[row + i] = result.lnWeight[i] + lnShare;
    }
    row += result.count;
  }
  const rank = concatenate(results.map((r) => r.insertionRanks.rank));
  const others = concatenate(results.map((r) => r.insertionRanks.others));
  return {
    runs: results.length,
    evidenceMethod: first.evidenceMethod,
    lnZ,
    lnZError,
    evaluations: results.reduce((sum, r) => sum + r.evaluations, 0),
    parts: results.map((r) => ({ lnZ: r.lnZ, lnZError: r.lnZError })),
    physicalDim,
    count,
    points,
    lnL,
    lnWeight,
    insertionRank: insertionRankTest(rank, others, rank.length, seed),
  };
}

function importanceMerge(results: readonly NestedResult[]): { lnZ: number; lnZError: number } {
  let draws = 0;
  let largest = -Infinity;
  for (const result of results) {
    draws += result.importance!.final.draws;
    largest = Math.max(largest, result.lnZ);
  }
  let z = 0;
  let variance = 0;
  for (const result of results) {
    const share = result.importance!.final.draws / draws;
    const zi = Math.exp(result.lnZ - largest);
    z += share * zi;
    variance += (share * zi * result.lnZError) ** 2;
  }
  return { lnZ: largest + Math.log(z), lnZError: Math.sqrt(variance) / z };
}

function nestedMerge(results: readonly NestedResult[]): { lnZ: number; lnZError: number } {
  let precision = 0;
  let weighted = 0;
  for (const result of results) {
    precision += 1 / result.lnZError ** 2;
    weighted += result.lnZ / result.lnZError ** 2;
  }
  return { lnZ: weighted / precision, lnZError: 1 / Math.sqrt(precision) };
}

function concatenate(parts: readonly Float64Array[]): Float64Array {
  const out = new Float64Array(parts.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const part of parts) {
    out.set(part, at);
    at += part.length;
  }
  return out;
}
