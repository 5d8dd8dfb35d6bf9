import { ensureFloat64Capacity, ensureInt32Capacity } from '../numeric/sparse/ensureCapacity.js';

/**
 * A rectangular sparse matrix in compressed rows (row r's entries at rowStart[r] ..
 * rowStart[r + 1] - 1, columns in no particular order), filled row after row into buffers that
 * grow when needed and are reused across calls.
 */
export class SparseRows {
  rowCount = 0;
  rowStart: Int32Array<ArrayBuffer> = new Int32Array(1);
  column: Int32Array<ArrayBuffer> = new Int32Array(0);
  value: Float64Array<ArrayBuffer> = new Float64Array(0);

  /** Starts an empty matrix of `rows` rows with room for about `entries` entries. */
  reset(rows: number, entries: number): void {
    this.rowCount = 0;
    this.rowStart = ensureInt32Capacity(this.rowStart, rows + 1);
    this.rowStart[0] = 0;
    this.reserve(entries);
  }

  /** Makes room for `entries` entries in all. */
  reserve(entries: number): void {
    this.column = ensureInt32Capacity(this.column, entries);
    this.value = ensureFloat64Capacity(this.value, entries);
  }

  /** The first `rows` rows of the compressed rows (start, column, value), copied in (reset here to hold them). */
  copyFrom(start: Int32Array, column: Int32Array, value: Float64Array, rows: number): void {
    const entries = start[rows];
    this.reset(rows, entries);
    this.rowStart.set(start.subarray(0, rows + 1));
    this.column.set(column.subarray(0, entries));
    this.value.set(value.subarray(0, entries));
    this.rowCount = rows;
  }

  /**
   * Takes the compressed rows (start, column, value) as its arrays, without a copy: views of a
   * kernel's memory, valid until that kernel next writes them (a later reset may write into
   * them, or replace them when they are too short).
   */
  viewOf(start: Int32Array<ArrayBuffer>, column: Int32Array<ArrayBuffer>, value: Float64Array<ArrayBuffer>, rows: number): void {
    this.rowStart = start;
    this.column = column;
    this.value = value;
    this.rowCount = rows;
  }

  /** Stored entries. */
  get entries(): number {
    return this.rowStart[this.rowCount];
  }

  /** The transpose (columns become rows) of `source`, with `columns` columns, into this. */
  transposeOf(source: SparseRows, columns: number): void {
    const n = source.entries;
    this.reset(columns, n);
    const start = this.rowStart;
    start.fill(0, 0, columns + 1);
    countColumns(source.column, n, start);
    for (let c = 0; c < columns; c++) start[c + 1] += start[c];
    this.rowCount = columns;
    scatterTranspose(source, this.column, this.value, start);
    for (let c = columns; c > 0; c--) start[c] = start[c - 1];
    start[0] = 0;
  }
}

function countColumns(column: Int32Array, n: number, start: Int32Array): void {
  for (let k = 0; k < n; k++) start[column[k] + 1]++;
}

/** Scatters each entry (r, c) of `source` to row c of the transpose; `start` advances to each row's end. */
function scatterTranspose(source: SparseRows, column: Int32Array, value: Float64Array, start: Int32Array): void {
  const { rowStart, column: sourceColumn, value: sourceValue } = source;
  for (let r = 0; r < source.rowCount; r++) {
    for (let k = rowStart[r]; k < rowStart[r + 1]; k++) {
      const at = start[sourceColumn[k]]++;
      column[at] = r;
      value[at] = sourceValue[k];
    }
  }
}
