import { ensureFloat64Capacity, ensureInt32Capacity } from './ensureCapacity.js';
import { runningSum } from './runningSum.js';
import type { SymmetricCsr } from './symmetricCsr.js';

interface MutableCsr {
  size: number;
  rowStart: Int32Array<ArrayBuffer>;
  column: Int32Array<ArrayBuffer>;
  value: Float64Array<ArrayBuffer>;
}

/**
 * Collects (row, column, value) contributions to a symmetric n x n matrix and compresses them
 * into its lower triangle in compressed rows (SymmetricCsr), duplicates summed. A contribution
 * with row != column adds `value` to both A[row][column] and A[column][row]: add each
 * off-diagonal pair once. All buffers are kept and grown when needed, so a likelihood that
 * rebuilds its matrix at every call allocates nothing once they have reached their largest size.
 * The compressed matrix is a view of these buffers, valid until the next reset.
 */
export class SymmetricSparseAccumulator {
  private size = 0;
  private count = 0;
  private rows = new Int32Array(256);
  private columns = new Int32Array(256);
  private values = new Float64Array(256);
  private bucket = new Int32Array(1);
  private byColumn = new Int32Array(0);
  private byRow = new Int32Array(0);
  private readonly result: MutableCsr = { size: 0, rowStart: new Int32Array(1), column: new Int32Array(0), value: new Float64Array(0) };

  /** Starts a new n x n matrix with no contributions. */
  reset(size: number): void {
    if (!(Number.isInteger(size) && size >= 0)) throw new RangeError(`matrix size: expected a whole number >= 0, found ${size}`);
    this.size = size;
    this.count = 0;
  }

  /** Number of contributions added since the last reset. */
  get contributions(): number {
    return this.count;
  }

  /** Adds `value` to A[row][column] and, when they differ, to A[column][row]. */
  add(row: number, column: number, value: number): void {
    if (this.count === this.rows.length) this.grow();
    const k = this.count++;
    if (row >= column) {
      this.rows[k] = row;
      this.columns[k] = column;
    } else {
      this.rows[k] = column;
      this.columns[k] = row;
    }
    this.values[k] = value;
  }

  /**
   * The lower triangle of the sum of all contributions, rows and columns sorted, duplicates
   * summed (a two-pass counting sort, by column then stably by row: O(contributions + n)).
   * Throws RangeError when an index is outside 0 .. n - 1 (indices are stored as 32-bit integers).
   */
  compress(): SymmetricCsr {
    const { size, count } = this;
    const bad = firstBadIndex(this.rows, this.columns, count, size);
    if (bad >= 0) throw new RangeError(`sparse contribution ${bad}: index (${this.rows[bad]}, ${this.columns[bad]}) outside a ${size} x ${size} matrix`);
    this.bucket = ensureInt32Capacity(this.bucket, size + 1);
    this.byColumn = ensureInt32Capacity(this.byColumn, count);
    this.byRow = ensureInt32Capacity(this.byRow, count);
    bucketStarts(this.columns, count, this.bucket, size);
    scatterInOrder(this.columns, count, this.bucket, this.byColumn);
    bucketStarts(this.rows, count, this.bucket, size);
    scatterThrough(this.rows, this.byColumn, count, this.bucket, this.byRow);
    const out = this.result;
    out.size = size;
    out.rowStart = ensureInt32Capacity(out.rowStart, size + 1);
    out.column = ensureInt32Capacity(out.column, count);
    out.value = ensureFloat64Capacity(out.value, count);
    out.rowStart.fill(0, 0, size + 1);
    mergeDuplicates(this.rows, this.columns, this.values, this.byRow, count, out);
    runningSum(out.rowStart, size);
    return out;
  }

  private grow(): void {
    const capacity = 2 * this.rows.length;
    this.rows = ensureInt32Capacity(this.rows, capacity);
    this.columns = ensureInt32Capacity(this.columns, capacity);
    this.values = ensureFloat64Capacity(this.values, capacity);
  }
}

/** Index of the first contribution with an index outside 0 .. n - 1 (rows hold the larger one), or -1. */
function firstBadIndex(rows: Int32Array, columns: Int32Array, count: number, size: number): number {
  for (let k = 0; k < count; k++) if (columns[k] < 0 || rows[k] >= size) return k;
  return -1;
}

/** bucket[b] = number of keys below b, for b = 0 .. n - 1 (counting sort, first half). */
function bucketStarts(keys: Int32Array, count: number, bucket: Int32Array, size: number): void {
  bucket.fill(0, 0, size + 1);
  countKeys(keys, count, bucket);
  runningSum(bucket, size);
}

function countKeys(keys: Int32Array, count: number, bucket: Int32Array): void {
  for (let k = 0; k < count; k++) bucket[keys[k] + 1]++;
}

/** Stable counting-sort scatter of contributions 0 .. count - 1 by key. */
function scatterInOrder(keys: Int32Array, count: number, bucket: Int32Array, out: Int32Array): void {
  for (let k = 0; k < count; k++) out[bucket[keys[k]]++] = k;
}

/** Stable counting-sort scatter of the contributions listed in `order` by key. */
function scatterThrough(keys: Int32Array, order: Int32Array, count: number, bucket: Int32Array, out: Int32Array): void {
  for (let t = 0; t < count; t++) out[bucket[keys[order[t]]]++] = order[t];
}

/** Walks contributions sorted by (row, column), summing repeats; counts each row's entries in rowStart[row + 1]. */
function mergeDuplicates(
  rows: Int32Array, columns: Int32Array, values: Float64Array, sorted: Int32Array, count: number, out: MutableCsr,
): void {
  const { rowStart, column, value } = out;
  let last = -1;
  let lastRow = -1;
  let lastColumn = -1;
  for (let t = 0; t < count; t++) {
    const k = sorted[t];
    const r = rows[k];
    const c = columns[k];
    if (r === lastRow && c === lastColumn) {
      value[last] += values[k];
    } else {
      last++;
      column[last] = c;
      value[last] = values[k];
      rowStart[r + 1]++;
      lastRow = r;
      lastColumn = c;
    }
  }
}
