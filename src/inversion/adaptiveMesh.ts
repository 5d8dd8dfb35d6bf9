import { cotangentWeights } from '../numeric/geometry/cotangentWeights.js';
import { DelaunayTriangulation } from '../numeric/geometry/delaunayTriangulation.js';
import { NaturalNeighbourKernel } from '../numeric/geometry/naturalNeighbourKernel.js';
import { MAX_NATURAL_NEIGHBOURS, NaturalNeighbourWeights } from '../numeric/geometry/naturalNeighbourWeights.js';
import { TriangulationStatus, type TriangulationStatusCode } from '../numeric/geometry/triangulationStatus.js';
import { VertexAdjacency } from '../numeric/geometry/vertexAdjacency.js';
import { ensureFloat64Capacity } from '../numeric/sparse/ensureCapacity.js';
import { addDifferenceRow, type DifferenceRows, type SourceMesh } from './sourceMesh.js';
import type { SparseRows } from './sparseRows.js';

/**
 * A source mesh whose vertices are the traced source-plane positions of fixed image pixels, so its
 * cells follow the magnification (Vegetti & Koopmans 2009), on their Delaunay triangulation. A
 * ray's value is the Laplace natural-neighbour interpolation of the vertices
 * (naturalNeighbourWeights.ts), and the gradient regularisation is the piecewise-linear Dirichlet
 * energy with cotangent edge weights: both are continuous in the vertex positions, so the
 * evidence changes smoothly with the lens parameters instead of jumping at every edge flip (as
 * barycentric interpolation and unweighted edge differences do). Beyond the hull the source is
 * taken to vanish: rays there see no source, and the regularisation ties the hull vertices to
 * zero, which makes every form positive definite. `engine` 'auto' weighs the rays in
 * WebAssembly (naturalNeighbourKernel.ts) when they are the arrays of rayBuffers(), 'javaScript'
 * always with NaturalNeighbourWeights, the twin it is tested against; both give the same bits.
 */
export class AdaptiveMesh implements SourceMesh {
  readonly entriesPerRay = MAX_NATURAL_NEIGHBOURS;
  readonly topologyVaries = true;
  readonly triangulation = new DelaunayTriangulation();
  private readonly adjacency = new VertexAdjacency();
  private readonly natural = new NaturalNeighbourWeights();
  private readonly engine: 'auto' | 'javaScript';
  /** The kernel whose memory holds the arrays of rayBuffers() (null: none, or no WebAssembly). */
  private kernel: NaturalNeighbourKernel | null = null;
  /** Whichever weighed the last interpolate(). */
  private lastWeigher: { readonly fallbacks: number } = this.natural;
  private edgeWeights = new Float64Array(0);
  cellX = new Float64Array(0);
  cellY = new Float64Array(0);
  cellCount = 0;
  private neighbourCells = new Int32Array(64);
  private neighbourCoefficients = new Float64Array(64);
  private readonly secondRow = new Float64Array(3);

  constructor(engine: 'auto' | 'javaScript' = 'auto') {
    this.engine = engine;
  }

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
    if (status === TriangulationStatus.ok || status === TriangulationStatus.duplicatePoints) {
      this.adjacency.rebuild(this.triangulation);
      this.edgeWeights = ensureFloat64Capacity(this.edgeWeights, this.adjacency.offsets[n]);
      cotangentWeights(this.triangulation, this.adjacency, this.edgeWeights);
    }
    return status;
  }

  rayBuffers(rayCount: number, cellCount: number): { cells: Int32Array; weights: Float64Array } {
    this.kernel = this.engine === 'auto' ? NaturalNeighbourKernel.create(rayCount, cellCount) : null;
    if (this.kernel !== null) return { cells: this.kernel.vertices, weights: this.kernel.weights };
    return { cells: new Int32Array(this.entriesPerRay * rayCount), weights: new Float64Array(this.entriesPerRay * rayCount) };
  }

  /**
   * The kernel weighs into its own memory only; other arrays, or a triangulation larger than
   * the kernel was sized for, take the JavaScript twin (the same results, more slowly).
   */
  interpolate(bx: Float64Array, by: Float64Array, n: number, cells: Int32Array, weights: Float64Array): number {
    const kernel = this.kernel;
    if (kernel !== null && cells === kernel.vertices && weights === kernel.weights && kernel.holds(this.triangulation, n)) {
      this.lastWeigher = kernel;
      return kernel.weigh(this.triangulation, bx, by, n);
    }
    this.lastWeigher = this.natural;
    return this.natural.weigh(this.triangulation, bx, by, n, cells, weights);
  }

  /**
   * The kernel merges the weights in its memory (NaturalNeighbourKernel.mappingRows) when they
   * are its own and every cell and ray fits it; `out` then views its rows.
   */
  mappingRows(cells: Int32Array, weights: Float64Array, pixelCount: number, raysPerPixel: number, factor: number, out: SparseRows): boolean {
    const kernel = this.kernel;
    if (kernel === null || cells !== kernel.vertices || weights !== kernel.weights) return false;
    if (this.cellCount > kernel.vertexCapacity || pixelCount * raysPerPixel > kernel.queryCapacity) return false;
    kernel.mappingRows(pixelCount, raysPerPixel, factor);
    out.viewOf(kernel.rowStart, kernel.rowColumn, kernel.rowValue, pixelCount);
    return true;
  }

  get interpolationFallbacks(): number {
    return this.lastWeigher.fallbacks;
  }

  /**
   * Difference rows on the triangulation: the vertices themselves (zeroth order); per triangle,
   * its area's square root times the two components of the gradient of the linear interpolant
   * (gradient: the rows' sum of squares is the Dirichlet energy of the piecewise-linear source,
   * whose matrix is the cotangent stiffness matrix); at every vertex its value less the
   * cotangent-weighted mean of its neighbours, negative weights (obtuse angles at the hull) as 0
   * (curvature: the normalised discrete Laplacian). Gradient and curvature add a row s_i at each
   * hull vertex: the source vanishes beyond the hull.
   */
  differenceRows(form: 'zeroth' | 'gradient' | 'curvature', rows: DifferenceRows): void {
    rows.rowCount = 0;
    rows.rowStart[0] = 0;
    const { offsets, neighbours, onHull } = this.adjacency;
    const w = this.edgeWeights;
    for (let i = 0; i < this.cellCount; i++) {
      if (form === 'zeroth') {
        addDifferenceRow(rows, [i], [1], 1);
        continue;
      }
      const from = offsets[i], to = offsets[i + 1];
      // A vertex in no triangle (a duplicate of another) has no neighbours: tied to zero alone.
      if (onHull[i] === 1 || to === from) addDifferenceRow(rows, [i], [1], 1);
      if (form === 'curvature') this.laplacianRow(i, from, to, rows);
    }
    if (form === 'gradient') this.gradientRows(rows);
  }

  // Each triangle's linear interpolant has gradient sum_v s_v grad(phi_v), grad(phi_a) =
  // perp(c - b) / (2 area) for the vertex a opposite the edge b -> c (the standard linear
  // element, e.g. Zienkiewicz & Taylor 2000, sec. 4.2); times sqrt(area) the two components
  // are two rows whose squares sum to the triangle's share of the Dirichlet energy.
  private gradientRows(rows: DifferenceRows): void {
    const { triangles, coords, triangleCount } = this.triangulation;
    const cells = this.neighbourCells, xRow = this.neighbourCoefficients, yRow = this.secondRow;
    for (let t = 0; t < triangleCount; t++) {
      const a = triangles[3 * t], b = triangles[3 * t + 1], c = triangles[3 * t + 2];
      const ax = coords[2 * a], ay = coords[2 * a + 1], bx = coords[2 * b], by = coords[2 * b + 1], cx = coords[2 * c], cy = coords[2 * c + 1];
      const twiceArea = (bx - ax) * (cy - ay) - (by - ay) * (cx - ax);
      const scale = 1 / (Math.sign(twiceArea) * Math.sqrt(2 * Math.abs(twiceArea)));
      cells[0] = a; cells[1] = b; cells[2] = c;
      xRow[0] = (by - cy) * scale; xRow[1] = (cy - ay) * scale; xRow[2] = (ay - by) * scale;
      yRow[0] = (cx - bx) * scale; yRow[1] = (ax - cx) * scale; yRow[2] = (bx - ax) * scale;
      addDifferenceRow(rows, cells, xRow, 3);
      addDifferenceRow(rows, cells, yRow, 3);
    }
  }

  /** s_i - sum_j w_ij s_j / sum_j w_ij over the neighbours with positive weight. */
  private laplacianRow(i: number, from: number, to: number, rows: DifferenceRows): void {
    const { neighbours } = this.adjacency;
    const w = this.edgeWeights;
    let total = 0;
    for (let k = from; k < to; k++) total += Math.max(0, w[k]);
    if (!(total > 0)) return;
    if (this.neighbourCells.length < to - from + 1) {
      this.neighbourCells = new Int32Array(2 * (to - from) + 2);
      this.neighbourCoefficients = new Float64Array(2 * (to - from) + 2);
    }
    this.neighbourCells[0] = i;
    this.neighbourCoefficients[0] = 1;
    for (let k = from; k < to; k++) {
      this.neighbourCells[k - from + 1] = neighbours[k];
      this.neighbourCoefficients[k - from + 1] = -Math.max(0, w[k]) / total;
    }
    addDifferenceRow(rows, this.neighbourCells, this.neighbourCoefficients, to - from + 1);
  }
}
