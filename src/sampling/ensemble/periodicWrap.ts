import { wrapIntoPeriod } from '../../priors/periodic.js';
import type { EnsembleProblem } from './ensembleProblem.js';

/** The periodic dimensions of a problem, ready for wrapping rows of points. */
export interface PeriodicTable {
  readonly indices: Int32Array;
  readonly lower: Float64Array;
  readonly period: Float64Array;
}

export function periodicTable(problem: EnsembleProblem): PeriodicTable | null {
  const ranges = problem.periodic;
  if (ranges === undefined) return null;
  const indices: number[] = [];
  ranges.forEach((range, d) => {
    if (range) indices.push(d);
  });
  if (indices.length === 0) return null;
  return {
    indices: Int32Array.from(indices),
    lower: Float64Array.from(indices, (d) => ranges[d]!.lower),
    period: Float64Array.from(indices, (d) => ranges[d]!.upper - ranges[d]!.lower),
  };
}

/** Wraps the periodic coordinates of `count` rows of `dim` values into their periods, in place. */
export function wrapRows(points: Float64Array, count: number, dim: number, table: PeriodicTable | null): void {
  if (table === null) return;
  for (let i = 0; i < count; i++) {
    for (let k = 0; k < table.indices.length; k++) {
      const at = i * dim + table.indices[k];
      points[at] = wrapIntoPeriod(points[at], table.lower[k], table.period[k]);
    }
  }
}
