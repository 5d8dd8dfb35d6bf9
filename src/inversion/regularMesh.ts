import { addDifferenceRow, type DifferenceRows, type SourceMesh } from './sourceMesh.js';

/** Margin around the rays' bounding box, as a fraction of its larger side. */
const MARGIN = 0.02;

/**
 * A regular n x n grid of square cells (nodes) over the bounding box of given source-plane
 * positions, rebuilt at each call, with bilinear interpolation between the four nodes around a
 * ray (the regular source grid of Warren & Dye 2003). Node (a, b) is cell b * n + a. Beyond the
 * grid the source is taken to vanish, which makes every regularisation form positive definite.
 */
export class RegularMesh implements SourceMesh {
  readonly cellCount: number;
  readonly cellX: Float64Array;
  readonly cellY: Float64Array;
  readonly entriesPerRay = 4;
  readonly topologyVaries = false;
  /** Bilinear interpolation has no degenerate case. */
  readonly interpolationFallbacks = 0;
  readonly side: number;
  /** Lower-left node and node spacing of the last build, arcsec. */
  x0 = 0;
  y0 = 0;
  spacing = 1;

  constructor(side: number) {
    this.side = side;
    this.cellCount = side * side;
    this.cellX = new Float64Array(this.cellCount);
    this.cellY = new Float64Array(this.cellCount);
  }

  /** Lays the grid over a bounding box (with a margin); false when the box is empty or not finite. */
  layOver(xMin: number, xMax: number, yMin: number, yMax: number): boolean {
    const extent = Math.max(xMax - xMin, yMax - yMin) * (1 + 2 * MARGIN);
    if (!(extent > 0) || !Number.isFinite(extent)) return false;
    const n1 = this.side - 1;
    this.spacing = extent / n1;
    this.x0 = 0.5 * (xMin + xMax) - 0.5 * extent;
    this.y0 = 0.5 * (yMin + yMax) - 0.5 * extent;
    this.placeNodes();
    return true;
  }

  private placeNodes(): void {
    const { side, cellX, cellY, x0, y0, spacing } = this;
    for (let b = 0; b < side; b++) {
      for (let a = 0; a < side; a++) {
        cellX[b * side + a] = x0 + a * spacing;
        cellY[b * side + a] = y0 + b * spacing;
      }
    }
  }

  rayBuffers(rayCount: number): { cells: Int32Array; weights: Float64Array } {
    return { cells: new Int32Array(this.entriesPerRay * rayCount), weights: new Float64Array(this.entriesPerRay * rayCount) };
  }

  // Bilinear interpolation on the unit square of the four surrounding nodes (e.g. Press et al.
  // 2007, Numerical Recipes sec. 3.6).
  interpolate(bx: Float64Array, by: Float64Array, n: number, cells: Int32Array, weights: Float64Array): number {
    const { side, x0, y0 } = this;
    const inverse = 1 / this.spacing;
    const last = side - 1;
    let outside = 0;
    for (let i = 0; i < n; i++) {
      const u = (bx[i] - x0) * inverse;
      const v = (by[i] - y0) * inverse;
      const at = 4 * i;
      if (!(u >= 0 && u <= last && v >= 0 && v <= last)) {
        cells[at] = cells[at + 1] = cells[at + 2] = cells[at + 3] = -1;
        weights[at] = weights[at + 1] = weights[at + 2] = weights[at + 3] = 0;
        outside++;
        continue;
      }
      const a = Math.min(last - 1, Math.floor(u));
      const b = Math.min(last - 1, Math.floor(v));
      const fx = u - a, fy = v - b;
      const c = b * side + a;
      cells[at] = c;
      cells[at + 1] = c + 1;
      cells[at + 2] = c + side;
      cells[at + 3] = c + side + 1;
      weights[at] = (1 - fx) * (1 - fy);
      weights[at + 1] = fx * (1 - fy);
      weights[at + 2] = (1 - fx) * fy;
      weights[at + 3] = fx * fy;
    }
    return outside;
  }

  /**
   * Difference rows with the source vanishing beyond the grid (Suyu et al. 2006, sec. 2.4): the
   * cells themselves (zeroth order); the differences between neighbours along x and y, and at
   * each edge the difference with the zero beyond (gradient); the second differences along x
   * and y at every node, zero beyond (curvature).
   */
  differenceRows(form: 'zeroth' | 'gradient' | 'curvature', rows: DifferenceRows): void {
    const n = this.side;
    rows.rowCount = 0;
    rows.rowStart[0] = 0;
    const cells = [0, 0, 0];
    const coefficients = [0, 0, 0];
    for (let b = 0; b < n; b++) {
      for (let a = 0; a < n; a++) {
        const c = b * n + a;
        if (form === 'zeroth') {
          addDifferenceRow(rows, [c], [1], 1);
          continue;
        }
        for (const [step, index, size] of [[1, a, n], [n, b, n]] as const) {
          if (form === 'gradient') {
            if (index === 0) addDifferenceRow(rows, [c], [1], 1);
            if (index + 1 < size) addDifferenceRow(rows, [c, c + step], [-1, 1], 2);
            else addDifferenceRow(rows, [c], [-1], 1);
            continue;
          }
          let length = 0;
          if (index > 0) { cells[length] = c - step; coefficients[length++] = 1; }
          cells[length] = c; coefficients[length++] = -2;
          if (index + 1 < size) { cells[length] = c + step; coefficients[length++] = 1; }
          addDifferenceRow(rows, cells, coefficients, length);
        }
      }
    }
  }
}
