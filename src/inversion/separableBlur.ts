import type { SparseRows } from './sparseRows.js';

/** Stamps restart from zero before the generation count could overflow an Int32. */
export const GENERATION_LIMIT = 2 ** 30;

/**
 * The rows of B^T (each cell's lensed image convolved with the PSF, at the used pixels) for a
 * separable kernel K(a, b) = alongX[a] alongY[b], in two one-dimensional passes instead of one
 * pass over every tap: the cell's entries of M are spread along x into an intermediate image,
 * whose touched pixels are then spread along y onto the used pixels. The convolution and zero
 * boundary are those of directConvolution, on an image padded by the kernel's half-sizes so no
 * pass tests an edge. A 7 x 7 kernel costs 14 multiply-adds per entry of M and per intermediate
 * pixel instead of 49 per entry. Each pass lists the pixels it touches in order of first touch
 * (stamps), and leaves its work image all zero.
 */
export class SeparableBlur {
  private readonly width: number;
  private readonly alongX: Float64Array;
  private readonly alongY: Float64Array;
  /** Padded index of the first pixel of each M row's x-window in the intermediate image. */
  private readonly xStart: Int32Array;
  /** Used-pixel index of each padded pixel, -1 for the others. */
  private readonly usedAt: Int32Array;
  private readonly across: Float64Array;
  private readonly down: Float64Array;
  private readonly acrossStamp: Int32Array;
  private readonly downStamp: Int32Array;
  private acrossList: Int32Array;
  private downList: Int32Array;
  private generation = 0;

  constructor(
    columns: number, rows: number, alongX: Float64Array, alongY: Float64Array,
    used: Int32Array, computedIndex: Int32Array, computedCount: number,
  ) {
    const halfX = (alongX.length - 1) / 2, halfY = (alongY.length - 1) / 2;
    const width = columns + 2 * halfX;
    const size = width * (rows + 2 * halfY);
    this.width = width;
    this.alongX = Float64Array.from(alongX);
    this.alongY = Float64Array.from(alongY);
    // Tap a carries pixel (i, j) to (i + a - halfX, j) of the intermediate image, padded index
    // (j + halfY) width + i + a; tap b carries an intermediate pixel at padded t to the output
    // pixel t + (b - halfY) width.
    this.xStart = new Int32Array(computedCount);
    for (let p = 0; p < computedIndex.length; p++) {
      const q = computedIndex[p];
      if (q < 0) continue;
      const i = p % columns;
      this.xStart[q] = ((p - i) / columns + halfY) * width + i;
    }
    this.usedAt = new Int32Array(size).fill(-1);
    used.forEach((p, e) => {
      const i = p % columns;
      this.usedAt[((p - i) / columns + halfY) * width + i + halfX] = e;
    });
    this.across = new Float64Array(size);
    this.down = new Float64Array(size);
    this.acrossStamp = new Int32Array(size);
    this.downStamp = new Int32Array(size);
    this.acrossList = new Int32Array(1024);
    this.downList = new Int32Array(1024);
  }

  /** The rows of B^T into `out` (reset by the caller), for M^T `mt` of `cellCount` rows. */
  fillTransposeRows(mt: SparseRows, out: SparseRows, cellCount: number): void {
    if (this.generation > GENERATION_LIMIT) {
      this.acrossStamp.fill(0);
      this.downStamp.fill(0);
      this.generation = 0;
    }
    const kx = this.alongX.length, ky = this.alongY.length;
    let end = 0;
    for (let c = 0; c < cellCount; c++) {
      const generation = ++this.generation;
      const first = mt.rowStart[c], last = mt.rowStart[c + 1];
      if (this.acrossList.length < (last - first) * kx) this.acrossList = new Int32Array(2 * (last - first) * kx);
      const touched = this.spreadAcross(mt, first, last, generation);
      if (this.downList.length < touched * ky) this.downList = new Int32Array(2 * touched * ky);
      const reached = this.spreadDown(touched, generation);
      if (out.column.length < end + reached) out.reserve(2 * (end + reached));
      end = this.harvest(reached, out, end);
      out.rowStart[c + 1] = end;
    }
    out.rowCount = cellCount;
  }

  /** Entries first .. last - 1 of M^T spread along x; returns how many intermediate pixels they touched. */
  private spreadAcross(mt: SparseRows, first: number, last: number, generation: number): number {
    const { xStart, alongX, across, acrossStamp, acrossList } = this;
    const pixel = mt.column, value = mt.value;
    const kx = alongX.length;
    let touched = 0;
    for (let k = first; k < last; k++) {
      const v = value[k];
      const start = xStart[pixel[k]];
      for (let a = 0; a < kx; a++) {
        const t = start + a;
        acrossList[touched] = t;
        touched += acrossStamp[t] === generation ? 0 : 1;
        acrossStamp[t] = generation;
        across[t] += alongX[a] * v;
      }
    }
    return touched;
  }

  /** The touched intermediate pixels spread along y (and cleared); returns how many output pixels they reached. */
  private spreadDown(touched: number, generation: number): number {
    const { alongY, across, down, downStamp, downList, acrossList, width } = this;
    const ky = alongY.length;
    const back = ((ky - 1) / 2) * width;
    let reached = 0;
    for (let n = 0; n < touched; n++) {
      const t = acrossList[n];
      const u = across[t];
      across[t] = 0;
      let p = t - back;
      for (let b = 0; b < ky; b++, p += width) {
        downList[reached] = p;
        reached += downStamp[p] === generation ? 0 : 1;
        downStamp[p] = generation;
        down[p] += alongY[b] * u;
      }
    }
    return reached;
  }

  /** The reached output pixels that are used go into row entries from `end` (and all are cleared); returns the new end. */
  private harvest(reached: number, out: SparseRows, end: number): number {
    const { down, downList, usedAt } = this;
    const column = out.column, value = out.value;
    for (let n = 0; n < reached; n++) {
      const p = downList[n];
      const e = usedAt[p];
      const v = down[p];
      down[p] = 0;
      if (e < 0) continue;
      column[end] = e;
      value[end++] = v;
    }
    return end;
  }
}
