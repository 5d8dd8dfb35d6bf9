import type { SparseRows } from './sparseRows.js';

/** Why a mesh could not be built for a call (0: it was). */
export const MESH_OK = 0;

/**
 * The rows of a difference operator D on the source cells (one row: a few cells with
 * coefficients), from which a regularisation matrix H = D^T diag(w) D is built.
 */
export interface DifferenceRows {
  rowCount: number;
  rowStart: Int32Array;
  cell: Int32Array;
  coefficient: Float64Array;
}

/** A source-plane mesh rebuilt at every likelihood call, whose cell values interpolate the source. */
export interface SourceMesh {
  /** Cells (nodes) of the last build. */
  readonly cellCount: number;
  readonly cellX: Float64Array;
  readonly cellY: Float64Array;
  /** Interpolation entries per ray (4 bilinear; MAX_NATURAL_NEIGHBOURS natural-neighbour, unused ones -1). */
  readonly entriesPerRay: number;
  /** True when the cells' neighbourhoods (and so H for a given form) change from call to call. */
  readonly topologyVaries: boolean;
  /**
   * For n rays: each ray's cells (entriesPerRay each, the used first, -1 after them) and
   * weights. A ray outside the mesh gets none. Returns the number of rays outside.
   */
  interpolate(bx: Float64Array, by: Float64Array, n: number, cells: Int32Array, weights: Float64Array): number;
  /**
   * The `cells` and `weights` arrays for interpolate() of rayCount rays on at most cellCount
   * cells, made once per inversion: the adaptive mesh hands out views on its WebAssembly
   * kernel's memory, which its interpolation then fills in place; other arrays still work.
   */
  rayBuffers(rayCount: number, cellCount: number): { cells: Int32Array; weights: Float64Array };
  /**
   * Optional: the mapping matrix's rows (MappingMatrix.build's, to the bit) from the `cells` and
   * `weights` of the last interpolate(), made where they lie: the adaptive mesh merges them in
   * its kernel's memory and hands `out` views of it. False when it cannot (other arrays, a mesh
   * larger than the kernel); the caller then builds the rows itself.
   */
  mappingRows?(cells: Int32Array, weights: Float64Array, pixelCount: number, raysPerPixel: number, factor: number, out: SparseRows): boolean;
  /**
   * Rays of the last interpolate() that took a simpler rule than the mesh's own because their
   * neighbourhood was degenerate (the adaptive mesh: the holding triangle's barycentric weights
   * where the natural-neighbour ring was flat, folded or too crowded); 0 when there is none.
   */
  readonly interpolationFallbacks: number;
  /** The rows of the difference operator of a form into `rows` (grown as needed). */
  differenceRows(form: 'zeroth' | 'gradient' | 'curvature', rows: DifferenceRows): void;
}

/** An empty set of difference rows with room to grow. */
export function emptyDifferenceRows(): DifferenceRows {
  return { rowCount: 0, rowStart: new Int32Array(1), cell: new Int32Array(0), coefficient: new Float64Array(0) };
}

/** Appends one row to `rows` (cells and coefficients given in order), growing its buffers. */
export function addDifferenceRow(rows: DifferenceRows, cells: ArrayLike<number>, coefficients: ArrayLike<number>, length: number): void {
  const start = rows.rowStart[rows.rowCount];
  const end = start + length;
  if (rows.cell.length < end) {
    const size = Math.max(end, Math.ceil(rows.cell.length * 1.5) + 16);
    const cell = new Int32Array(size);
    cell.set(rows.cell);
    rows.cell = cell;
    const coefficient = new Float64Array(size);
    coefficient.set(rows.coefficient);
    rows.coefficient = coefficient;
  }
  if (rows.rowStart.length < rows.rowCount + 2) {
    const rowStart = new Int32Array(Math.ceil((rows.rowCount + 2) * 1.5) + 16);
    rowStart.set(rows.rowStart);
    rows.rowStart = rowStart;
  }
  for (let k = 0; k < length; k++) {
    rows.cell[start + k] = cells[k];
    rows.coefficient[start + k] = coefficients[k];
  }
  rows.rowCount++;
  rows.rowStart[rows.rowCount] = end;
}
