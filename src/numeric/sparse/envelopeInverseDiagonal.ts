import type { EnvelopeCholesky } from './envelopeCholesky.js';
import { runningSum } from './runningSum.js';

/**
 * The diagonal of A^-1, in the original ordering, from the factor A = L L^T last computed by
 * `cholesky` (the posterior variance of each unknown when A is a posterior precision), by the
 * recurrence of Takahashi, Fagan & Chin (1973) for the entries Z of A^-1 = L^-T L^-1:
 *   Z_ji = delta_ji / L_jj^2 - (1 / L_jj) sum_{k > j} L_kj Z_ki   (j <= i),
 * run from the last column to the first over the envelope only. The envelope is closed under
 * it: if i and k both lie in column j's envelope, so does Z_ki (first[k] <= j < i, or the
 * reverse), so every Z entry it needs was computed before. Cost ~ sum over columns of (column
 * envelope length)^2, the order of the factorisation; n solves with unit vectors would cost n
 * times the envelope, far more for n in the thousands. It allocates envelope-sized work
 * arrays: it is meant for a report, once per run, not for the likelihood.
 */
export function envelopeInverseDiagonal(cholesky: EnvelopeCholesky, out: Float64Array): void {
  const n = cholesky.size;
  if (!cholesky.isFactored) throw new Error('inverse diagonal: needs a successful factor first');
  if (out.length < n) throw new RangeError(`inverse diagonal: expected room for ${n} values, found ${out.length}`);
  const columns = envelopeColumns(cholesky);
  const z = new Float64Array(cholesky.envelopeSize);
  takahashiColumns(cholesky, columns, z);
  copyDiagonal(z, cholesky.order, cholesky.rowStart, n, out);
}

/** For each column j of the envelope, the rows k > j with first[k] <= j, in increasing order. */
interface EnvelopeColumns {
  readonly start: Int32Array;
  readonly row: Int32Array;
}

function envelopeColumns(cholesky: EnvelopeCholesky): EnvelopeColumns {
  const n = cholesky.size;
  const start = new Int32Array(n + 1);
  const row = new Int32Array(cholesky.envelopeSize - n);
  countColumnEntries(cholesky.first, n, start);
  runningSum(start, n);
  const next = start.slice(0, n);
  fillColumnRows(cholesky.first, n, next, row);
  return { start, row };
}

/** start[j + 1] = number of rows k > j reaching column j. */
function countColumnEntries(first: Int32Array, n: number, start: Int32Array): void {
  for (let k = 0; k < n; k++) {
    for (let j = first[k]; j < k; j++) start[j + 1]++;
  }
}

function fillColumnRows(first: Int32Array, n: number, next: Int32Array, row: Int32Array): void {
  for (let k = 0; k < n; k++) {
    for (let j = first[k]; j < k; j++) row[next[j]++] = k;
  }
}

/** Z in the envelope layout of L, columns from last to first (Takahashi, Fagan & Chin 1973). */
function takahashiColumns(cholesky: EnvelopeCholesky, columns: EnvelopeColumns, z: Float64Array): void {
  for (let j = cholesky.size - 1; j >= 0; j--) takahashiColumn(cholesky, columns, j, z);
}

/** Z_ij for the rows i > j of column j's envelope, then Z_jj (they use Z_ij). */
function takahashiColumn(cholesky: EnvelopeCholesky, columns: EnvelopeColumns, j: number, z: Float64Array): void {
  const { rowStart, lower } = cholesky;
  const diagonalJ = rowStart[j + 1] - 1;
  const ljj = lower[diagonalJ];
  offDiagonalColumn(cholesky, columns, j, ljj, z);
  const sum = columnSum(cholesky, columns.row, columns.start[j], columns.start[j + 1], j, j, z);
  z[diagonalJ] = (1 / ljj - sum) / ljj;
}

function offDiagonalColumn(cholesky: EnvelopeCholesky, columns: EnvelopeColumns, j: number, ljj: number, z: Float64Array): void {
  const { first, rowStart } = cholesky;
  const from = columns.start[j];
  const to = columns.start[j + 1];
  for (let t = from; t < to; t++) {
    const i = columns.row[t];
    z[rowStart[i] + j - first[i]] = -columnSum(cholesky, columns.row, from, to, j, i, z) / ljj;
  }
}

/** sum over rows k of column j's envelope of L_kj Z_ki (Z symmetric, stored lower). */
function columnSum(
  cholesky: EnvelopeCholesky, rows: Int32Array, from: number, to: number, j: number, i: number, z: Float64Array,
): number {
  const { first, rowStart, lower } = cholesky;
  let s = 0;
  for (let t = from; t < to; t++) {
    const k = rows[t];
    const zki = k >= i ? z[rowStart[k] + i - first[k]] : z[rowStart[i] + k - first[i]];
    s += lower[rowStart[k] + j - first[k]] * zki;
  }
  return s;
}

function copyDiagonal(z: Float64Array, order: Int32Array, rowStart: Int32Array, n: number, out: Float64Array): void {
  for (let i = 0; i < n; i++) out[order[i]] = z[rowStart[i + 1] - 1];
}
