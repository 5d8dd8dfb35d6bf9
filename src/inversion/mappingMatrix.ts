import { ensureInt32Capacity } from '../numeric/sparse/ensureCapacity.js';
import type { SourceMesh } from './sourceMesh.js';
import type { SparseRows } from './sparseRows.js';

/**
 * The mapping matrix of a pixelated source (Warren & Dye 2003, eq. 2): row q holds what each
 * cell contributes to pixel q before the PSF, the mean over the pixel's rays of the cell's
 * interpolation weight at each ray, times `scale` (the pixel area, so that cell values are
 * surface brightnesses and pixels hold brightness times area). Rays are raysPerPixel per pixel,
 * with entriesPerRay (cell, weight) pairs each, its cells first (cell -1: no more). Duplicate
 * cells within a pixel are merged through `slot` (one entry per cell, -1 when free, left all -1).
 */
export class MappingMatrix {
  private slot = new Int32Array(0);

  build(
    cells: Int32Array, weights: Float64Array, pixelCount: number, raysPerPixel: number, entriesPerRay: number,
    cellCount: number, scale: number, out: SparseRows, mesh?: Pick<SourceMesh, 'mappingRows'>,
  ): void {
    // The mesh's own merge where it has one for these arrays (the same rows); here otherwise.
    if (mesh?.mappingRows?.(cells, weights, pixelCount, raysPerPixel, scale / raysPerPixel, out) === true) return;
    if (this.slot.length < cellCount) {
      this.slot = ensureInt32Capacity(this.slot, cellCount);
      this.slot.fill(-1);
    }
    out.reset(pixelCount, pixelCount * raysPerPixel * entriesPerRay);
    this.fillRows(cells, weights, pixelCount, raysPerPixel, entriesPerRay, scale / raysPerPixel, out);
  }

  private fillRows(
    cells: Int32Array, weights: Float64Array, pixelCount: number, raysPerPixel: number, perRay: number, factor: number,
    out: SparseRows,
  ): void {
    const slot = this.slot;
    const column = out.column, value = out.value, rowStart = out.rowStart;
    let end = 0;
    for (let q = 0; q < pixelCount; q++) {
      const start = end;
      for (let ray = q * raysPerPixel; ray < (q + 1) * raysPerPixel; ray++) {
        // A ray's cells come first; its first -1 ends them.
        for (let k = ray * perRay; k < (ray + 1) * perRay; k++) {
          const c = cells[k];
          if (c < 0) break;
          const w = weights[k] * factor;
          const at = slot[c];
          if (at >= 0) value[at] += w;
          else {
            slot[c] = end;
            column[end] = c;
            value[end++] = w;
          }
        }
      }
      for (let k = start; k < end; k++) slot[column[k]] = -1;
      rowStart[q + 1] = end;
    }
    out.rowCount = pixelCount;
  }
}
