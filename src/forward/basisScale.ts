import type { PixelGrid } from '../imaging/pixelGrid.js';
import type { PsfKernel } from '../imaging/psfKernel.js';
import type { PixelLattice } from './pixelLattice.js';

/**
 * The scale each basis's tolerance refers to: the PSF-convolved lattice image at the listed pixel
 * of largest |lattice value| (a lower bound of the convolved peak for light >= 0, the same up to
 * the lattice's own error), so the criterion is scale-free and refers to what is compared with
 * data, the convolved image.
 */
export class BasisScale {
  private readonly lattice: PixelLattice;
  private readonly grid: PixelGrid;
  private readonly kernel: PsfKernel;
  private readonly scale: Float64Array;

  constructor(lattice: PixelLattice, grid: PixelGrid, kernel: PsfKernel, scale: Float64Array) {
    this.lattice = lattice;
    this.grid = grid;
    this.kernel = kernel;
    this.scale = scale;
  }

  /**
   * scale[k] for the basis on the plane at `base`, after the lattice's scatterValues of that basis
   * (which finds its brightest listed pixel). Written, not returned: a double returned from a call
   * V8 does not inline is boxed, one allocation per evaluation.
   */
  write(k: number, base: number): void {
    const brightest = this.lattice.brightest;
    if (brightest < 0) {
      this.scale[k] = 0;
      return;
    }
    const values = this.lattice.values;
    const { columns, rows, values: weights } = this.kernel;
    const width = this.lattice.width;
    const i = (brightest % width) - 2;
    const j = Math.floor(brightest / width) - 2;
    const halfX = (columns - 1) / 2, halfY = (rows - 1) / 2;
    let sum = 0;
    for (let b = 0; b < rows; b++) {
      const jj = j - (b - halfY);
      if (jj < -2 || jj >= this.grid.rows + 2) continue;
      for (let a = 0; a < columns; a++) {
        const ii = i - (a - halfX);
        if (ii < -2 || ii >= this.grid.columns + 2) continue;
        sum += weights[b * columns + a] * values[base + (jj + 2) * width + ii + 2];
      }
    }
    this.scale[k] = Math.abs(sum);
  }
}
