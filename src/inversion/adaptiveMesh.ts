import { barycentricWeights } from '../numeric/geometry/barycentricWeights.js';
import { DelaunayTriangulation } from '../numeric/geometry/delaunayTriangulation.js';
import { TriangulationStatus, type TriangulationStatusCode } from '../numeric/geometry/triangulationStatus.js';
import { VertexAdjacency } from '../numeric/geometry/vertexAdjacency.js';
import { addDifferenceRow, type DifferenceRows, type SourceMesh } from './sourceMesh.js';

/**
 * A source mesh whose vertices are the source-plane positions of a subset of image pixels, so its
 * cells follow the magnification (Vegetti & Koopmans 2009): their Delaunay triangulation, with
 * barycentric interpolation inside each triangle. Beyond the hull the source is taken to vanish:
 * rays there see no source, and the regularisation ties the hull vertices to zero, which makes
 * every form positive definite.
 */
export class AdaptiveMesh implements SourceMesh {
  readonly entriesPerRay = 3;
  readonly topologyVaries = true;
  readonly triangulation = new DelaunayTriangulation();
  private readonly adjacency = new VertexAdjacency();
  cellX = new Float64Array(0);
  cellY = new Float64Array(0);
  cellCount = 0;
  private neighbourCells = new Int32Array(64);
  private neighbourCoefficients = new Float64Array(64);

  /** Triangulates the n vertices (copied); the status says why not when it fails. */
  build(vx: Float64Array, vy: Float64Array, n: number): TriangulationStatusCode {
    if (this.cellX.length < n) {
      this.cellX = new Float64Array(n);
      this.cellY = new Float64Array(n);
    }
    this.cellX.set(vx.subarray(0, n));
    this.cellY.set(vy.subarray(0, n));
    this.cellCount = n;
    const status = this.triangulation.rebuild(this.cellX, this.cellY, n);
    if (status === TriangulationStatus.ok) this.adjacency.rebuild(this.triangulation);
    return status;
  }

  interpolate(bx: Float64Array, by: Float64Array, n: number, cells: Int32Array, weights: Float64Array): number {
    return barycentricWeights(this.triangulation, bx, by, n, cells, weights);
  }

  /**
   * Difference rows on the triangulation: the vertices themselves (zeroth order); one row per
   * edge, s_i - s_j (gradient); at every vertex its value less the mean of its neighbours, the
   * discrete Laplacian of the graph (curvature). Gradient and curvature add a row s_i at each
   * hull vertex: the source vanishes beyond the hull.
   */
  differenceRows(form: 'zeroth' | 'gradient' | 'curvature', rows: DifferenceRows): void {
    rows.rowCount = 0;
    rows.rowStart[0] = 0;
    const { offsets, neighbours, onHull } = this.adjacency;
    for (let i = 0; i < this.cellCount; i++) {
      if (form === 'zeroth') {
        addDifferenceRow(rows, [i], [1], 1);
        continue;
      }
      const from = offsets[i], to = offsets[i + 1];
      // A vertex in no triangle (a duplicate of another) has no neighbours: tied to zero alone.
      if (onHull[i] === 1 || to === from) addDifferenceRow(rows, [i], [1], 1);
      if (form === 'gradient') {
        for (let k = from; k < to; k++) if (neighbours[k] > i) addDifferenceRow(rows, [i, neighbours[k]], [1, -1], 2);
        continue;
      }
      const degree = to - from;
      if (degree === 0) continue;
      if (this.neighbourCells.length < degree + 1) {
        this.neighbourCells = new Int32Array(2 * degree + 2);
        this.neighbourCoefficients = new Float64Array(2 * degree + 2);
      }
      this.neighbourCells[0] = i;
      this.neighbourCoefficients[0] = 1;
      for (let k = from; k < to; k++) {
        this.neighbourCells[k - from + 1] = neighbours[k];
        this.neighbourCoefficients[k - from + 1] = -1 / degree;
      }
      addDifferenceRow(rows, this.neighbourCells, this.neighbourCoefficients, degree + 1);
    }
  }
}
