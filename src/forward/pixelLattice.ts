import type { PixelGrid } from '../imaging/pixelGrid.js';

/**
 * The lattice of AdaptivePixelMeans: one ray through the centre of every listed pixel and of a
 * two-pixel ring around them, on a grid padded by two pixels on each side (pixel (i, j) at
 * (j + 2) * width + i + 2), so stencils and interpolation read neighbours without bounds tests.
 * Holds the rays, their source-plane positions and light, and those scattered onto padded planes.
 */
export class PixelLattice {
  /** Width of the padded grid (columns + 4). */
  readonly width: number;
  /** Padded index of each listed pixel. */
  readonly pixelsPadded: Int32Array;
  /** Padded index of each lattice ray, and its image-plane position. */
  readonly padded: Int32Array;
  readonly count: number;
  readonly x: Float64Array;
  readonly y: Float64Array;
  /** Deflections and source-plane positions of the lattice rays. */
  readonly ax: Float64Array;
  readonly ay: Float64Array;
  readonly bx: Float64Array;
  readonly by: Float64Array;
  /** Light of basis k at ray e: out[k * count + e]. */
  readonly out: Float64Array;
  /** Padded indices where the row (x) stencils are needed: the listed pixels' 5-row columns. */
  readonly rowPoints: Int32Array;
  /** Light of basis k on its padded plane: values[k * planeSize + q]. */
  readonly values: Float64Array;
  readonly planeSize: number;
  /** Source-plane positions on the padded plane. */
  readonly betaX: Float64Array;
  readonly betaY: Float64Array;
  /** listed[e] = 1 where lattice ray e is through a listed pixel. */
  readonly listed: Uint8Array;
  /**
   * After scatterValues: padded index of the listed pixel of largest |value| (the first in raster
   * order of equals), -1 if none.
   */
  brightest = -1;

  /** Points on a padded plane of `grid`: (columns + 4) x (rows + 4). */
  static planeSizeOf(grid: PixelGrid): number {
    return (grid.columns + 4) * (grid.rows + 4);
  }

  /**
   * `active`: false for a lattice that is never used (uniform S x S pixel means): no buffers.
   * `held`: the planes and the light as views made elsewhere (the stencil kernel's memory), each
   * of max(1, basisCount) * planeSize elements (the light takes what its rays need).
   */
  constructor(
    grid: PixelGrid, pixels: Int32Array, basisCount: number, active: boolean,
    held?: { readonly values: Float64Array; readonly out: Float64Array },
  ) {
    const { columns, rows } = grid;
    const width = columns + 4;
    const height = rows + 4;
    this.width = width;
    this.planeSize = PixelLattice.planeSizeOf(grid);
    this.pixelsPadded = pixels.map((p) => {
      const i = p % columns;
      return ((p - i) / columns + 2) * width + i + 2;
    });
    if (!active) {
      this.listed = new Uint8Array(0);
      this.count = 0;
      this.padded = this.rowPoints = new Int32Array(0);
      this.x = this.y = this.ax = this.ay = this.bx = this.by = this.out = this.values = this.betaX = this.betaY = new Float64Array(0);
      return;
    }
    const inLattice = new Uint8Array(width * height);
    const inRows = new Uint8Array(width * height);
    for (const q of this.pixelsPadded) {
      for (let b = -2; b <= 2; b++) {
        inRows[q + b * width] = 1;
        for (let a = -2; a <= 2; a++) inLattice[q + b * width + a] = 1;
      }
    }
    const latticeList: number[] = [];
    const rowList: number[] = [];
    for (let q = 0; q < inLattice.length; q++) {
      if (inLattice[q] === 1) latticeList.push(q);
      if (inRows[q] === 1) rowList.push(q);
    }
    this.padded = Int32Array.from(latticeList);
    const isListed = new Uint8Array(width * height);
    for (const q of this.pixelsPadded) isListed[q] = 1;
    this.listed = Uint8Array.from(latticeList, (q) => isListed[q]);
    this.rowPoints = Int32Array.from(rowList);
    const n = latticeList.length;
    this.count = n;
    this.x = new Float64Array(n);
    this.y = new Float64Array(n);
    const scale = grid.pixelScaleArcsec;
    for (let e = 0; e < n; e++) {
      const q = latticeList[e];
      this.x[e] = ((q % width) - 2 - (columns - 1) / 2) * scale;
      this.y[e] = (Math.floor(q / width) - 2 - (rows - 1) / 2) * scale;
    }
    this.ax = new Float64Array(n);
    this.ay = new Float64Array(n);
    this.bx = new Float64Array(n);
    this.by = new Float64Array(n);
    this.out = held?.out.subarray(0, Math.max(1, basisCount) * n) ?? new Float64Array(Math.max(1, basisCount) * n);
    this.values = held?.values ?? new Float64Array(Math.max(1, basisCount) * width * height);
    this.betaX = new Float64Array(width * height);
    this.betaY = new Float64Array(width * height);
  }

  /** Source-plane positions of the lattice rays onto the padded planes betaX, betaY. */
  scatterBeta(): void {
    const padded = this.padded;
    const betaX = this.betaX, betaY = this.betaY, bx = this.bx, by = this.by;
    for (let e = 0; e < padded.length; e++) {
      betaX[padded[e]] = bx[e];
      betaY[padded[e]] = by[e];
    }
  }

  /**
   * Lattice light of basis k onto its padded plane (at `base` = k * planeSize), and on the way the
   * listed pixel of largest |value| into `brightest` (BasisScale's reference pixel).
   */
  scatterValues(k: number, base: number): void {
    const padded = this.padded, listed = this.listed;
    const values = this.values, out = this.out;
    const from = k * padded.length;
    let brightest = -1;
    let peak = -1;
    for (let e = 0; e < padded.length; e++) {
      const value = out[from + e];
      values[base + padded[e]] = value;
      const size = Math.abs(value);
      if (size > peak && listed[e] === 1) {
        peak = size;
        brightest = padded[e];
      }
    }
    this.brightest = brightest;
  }
}
