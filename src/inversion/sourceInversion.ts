import type { PixelGrid } from '../imaging/pixelGrid.js';
import type { PsfKernel } from '../imaging/psfKernel.js';
import type { MassTerm } from '../lensing/massTerm.js';
import type { PixelatedSourceTerm } from '../model/pixelatedSourceTerm.js';
import { TriangulationStatus } from '../numeric/geometry/triangulationStatus.js';
import { ensureFloat64Capacity } from '../numeric/sparse/ensureCapacity.js';
import type { SymmetricCsr } from '../numeric/sparse/symmetricCsr.js';
import { AdaptiveMesh } from './adaptiveMesh.js';
import { BlurredMapping } from './blurredMapping.js';
import { noRejections, type InversionRejections } from './inversionRejections.js';
import { MappingMatrix } from './mappingMatrix.js';
import { LinearEvidence } from './linearEvidence.js';
import { NormalMatrix } from './normalMatrix.js';
import { RegularMesh } from './regularMesh.js';
import { RegularisationMatrix } from './regularisationMatrix.js';
import { CellBrightness } from './cellBrightness.js';
import { emptyDifferenceRows, type SourceMesh } from './sourceMesh.js';
import { SourceRays } from './sourceRays.js';
import { SparseRows } from './sparseRows.js';
import { VertexSelection } from './vertexSelection.js';

/** The stages of one evaluation, as SourceInversion.stageMilliseconds counts them. */
export const INVERSION_STAGES = Object.freeze([
  'rays', 'mesh', 'mapping', 'blur', 'regularisation', 'normalMatrix', 'factorSolve',
] as const);

/** What a pixelated-source inversion needs of the observation and the forward model. */
export interface InversionSetup {
  readonly grid: PixelGrid;
  /** Row-major indices of the pixels whose light reaches a used pixel through `kernel`. */
  readonly computed: Int32Array;
  /** Row-major indices of the used (fitted) pixels, a subset of `computed`. */
  readonly used: Int32Array;
  readonly kernel: PsfKernel;
  /** The kernel as the product alongX[a] alongY[b], when it is one (within the caller's tolerance). */
  readonly separable?: { readonly alongX: Float64Array; readonly alongY: Float64Array };
  /** Data and inverse variances at the used pixels. */
  readonly data: Float64Array;
  readonly inverseVariance: Float64Array;
  /** Mass terms as the forward model evaluates them (fast profiles). */
  readonly massTerms: readonly MassTerm[];
  readonly term: PixelatedSourceTerm;
  /** The further linear amplitudes (analytic light bases) and their prior width. */
  readonly extraCount: number;
  readonly amplitudePriorSigma: number;
  /** An adaptive mesh with a bright share: the used pixels it puts that share of its cells on. */
  readonly brightPixels?: Int32Array;
}

/** The source of the last successful evaluation, for reports. */
export interface SourceReconstruction {
  readonly mesh: 'regular' | 'adaptive';
  readonly cellX: Float64Array;
  readonly cellY: Float64Array;
  /** Posterior-mean cell values (surface brightness) and their posterior standard deviations. */
  readonly values: Float64Array;
  readonly standardDeviations: Float64Array;
  /** Adaptive mesh: its triangles (three cells each). */
  readonly triangles: Uint32Array | null;
  /** Regular mesh: cells per side. */
  readonly side: number | null;
}

/**
 * The evidence of a lens model with a pixelated source, the source cell values and the other
 * linear amplitudes integrated out (Suyu et al. 2006, the Bayesian evidence of a regularised
 * source inversion; their eq. 19, number from memory). With the data d and noise sigma_i at the
 * N used pixels (W = diag(1 / sigma_i^2)), the blurred mapping B (cells -> pixels) and the
 * analytic bases L, the Gaussian prior N(0, (lambda H)^-1) on the S cells and N(0, s^2 I) on the
 * K amplitudes (prior precision P), A = P + [B L]^T W [B L] and b = [B L]^T W d:
 *   ln Z = -1/2 sum_i ln(2 pi sigma_i^2) - 1/2 d^T W d + 1/2 b^T A^-1 b - 1/2 ln det A
 *          + 1/2 ln det P,     ln det P = S ln lambda + ln det H - K ln s^2
 * (the Gaussian integral over the unknowns; MacKay 2003, ch. 28). Both determinants come from
 * sparse Cholesky factors, so ln Z is a proper evidence that compares across meshes,
 * regularisation forms and parametric sources. The brightness form weighs each row of H by the
 * cells' strengths (cellBrightness.ts), and P's determinant is that matrix's.
 */
export class SourceInversion {
  readonly rejections: InversionRejections = noRejections();
  /** Rays of the last evaluation that fell outside the mesh (they see no source). */
  raysOutside = 0;
  private readonly setup: InversionSetup;
  private readonly mesh: SourceMesh;
  private readonly regular: RegularMesh | null;
  private readonly adaptive: AdaptiveMesh | null;
  private readonly rays: SourceRays;
  private readonly vertices: VertexSelection | null;
  /** Computed-row index of each used pixel, and the used pixels' rays' range for the regular grid's extent. */
  private readonly usedRows: Int32Array;
  private readonly mapping = new MappingMatrix();
  private readonly blurred: BlurredMapping;
  private readonly regularisation = new RegularisationMatrix();
  private readonly brightness = new CellBrightness();
  private readonly normal = new NormalMatrix();
  private readonly evidence: LinearEvidence;
  private readonly differences = emptyDifferenceRows();
  private readonly m = new SparseRows();
  private readonly b = new SparseRows();
  private readonly cells: Int32Array;
  private readonly weights: Float64Array;
  private rowWeights = new Float64Array(0);
  /** A regular mesh's unit H and ln det H, the same at every call. */
  private fixedH: { matrix: SymmetricCsr; logDet: number } | null = null;
  private readonly extraPrecision: number;
  private cellCount = 0;
  /** The cells' coordinates for the nested-dissection ordering, updated in place each call. */
  private readonly cellPoints: { x: Float64Array; y: Float64Array; count: number } = { x: new Float64Array(0), y: new Float64Array(0), count: 0 };

  constructor(setup: InversionSetup) {
    this.setup = setup;
    const { grid, computed, used, kernel, term } = setup;
    const settings = term.settings;
    this.rays = new SourceRays(grid, computed, settings.raysPerPixelSide);
    const rowOfPixel = new Int32Array(grid.columns * grid.rows).fill(-1);
    computed.forEach((p, q) => { rowOfPixel[p] = q; });
    this.usedRows = Int32Array.from(used, (p) => rowOfPixel[p]);
    this.blurred = new BlurredMapping(grid.columns, grid.rows, kernel, used, rowOfPixel, setup.separable);
    if (settings.mesh.kind === 'regular') {
      this.regular = new RegularMesh(settings.mesh.cellsPerSide);
      this.adaptive = null;
      this.vertices = null;
      this.mesh = this.regular;
    } else {
      this.regular = null;
      this.adaptive = new AdaptiveMesh();
      this.mesh = this.adaptive;
      const { cells, brightShare } = settings.mesh;
      let bright: { pixels: Int32Array; share: number } | undefined;
      if (brightShare > 0) {
        if (setup.brightPixels === undefined) throw new RangeError('SourceInversion: a bright share needs the bright pixels');
        bright = { pixels: setup.brightPixels, share: brightShare };
      }
      this.vertices = new VertexSelection(grid, computed, cells, bright);
    }
    const buffers = this.mesh.rayBuffers(this.rays.count, this.vertices === null ? this.mesh.cellCount : this.vertices.count);
    this.cells = buffers.cells;
    this.weights = buffers.weights;
    this.evidence = new LinearEvidence(setup.data, setup.inverseVariance);
    this.extraPrecision = 1 / (setup.amplitudePriorSigma * setup.amplitudePriorSigma);
  }

  /**
   * Benchmarks: when set, each logEvidence adds the milliseconds of its stages here, in the order
   * of INVERSION_STAGES.
   */
  stageMilliseconds: Float64Array | null = null;
  private clock = 0;

  private startLaps(): void {
    if (this.stageMilliseconds !== null) this.clock = performance.now();
  }

  private lap(stage: number): void {
    if (this.stageMilliseconds === null) return;
    const now = performance.now();
    this.stageMilliseconds[stage] += now - this.clock;
    this.clock = now;
  }

  /** Adaptive mesh: the cells placed on the bright pixels' lattice and the ratio that made a pixel bright (null without a bright share). */
  get brightCells(): { count: number; signalToNoise: number } | null {
    const mesh = this.setup.term.settings.mesh;
    if (this.vertices === null || mesh.kind !== 'adaptive' || mesh.brightShare === 0) return null;
    return { count: this.vertices.brightCount, signalToNoise: mesh.brightSignalToNoise };
  }

  /** Source cells of the last build. */
  get sourceCellCount(): number {
    return this.cellCount;
  }

  /** The solution of the last successful evaluation: S cell values, then the K amplitudes. */
  get lastSolution(): Float64Array {
    return this.evidence.solution;
  }

  /**
   * ln Z for the profile vector p (log10 strengths at the term's offset), with the K analytic
   * bases packed at the used pixels in `extras`; -Infinity (with its reason counted) when the
   * mesh or a factorisation fails.
   */
  logEvidence(p: Float64Array, extras: Float64Array): number {
    const { setup } = this;
    this.startLaps();
    this.rays.trace(setup.massTerms, p);
    this.lap(0);
    if (!this.buildMesh(p)) {
      this.rejections.mesh++;
      return Number.NEGATIVE_INFINITY;
    }
    const cellCount = this.mesh.cellCount;
    this.cellCount = cellCount;
    const rays = this.rays;
    const perRay = this.mesh.entriesPerRay;
    this.lap(1);
    this.raysOutside = this.mesh.interpolate(rays.betaX, rays.betaY, rays.count, this.cells, this.weights);
    this.rejections.triangleFallbacks += this.mesh.interpolationFallbacks;
    const area = setup.grid.pixelScaleArcsec * setup.grid.pixelScaleArcsec;
    this.mapping.build(this.cells, this.weights, setup.computed.length, rays.raysPerPixel, perRay, cellCount, area, this.m, this.mesh);
    this.lap(2);
    this.blurred.build(this.m, cellCount, this.b, null);
    this.lap(3);
    this.cellPoints.x = this.mesh.cellX;
    this.cellPoints.y = this.mesh.cellY;
    this.cellPoints.count = cellCount;
    const prior = this.regularisationPrior(p, cellCount);
    this.lap(4);
    if (prior === null) {
      this.rejections.regularisation++;
      return Number.NEGATIVE_INFINITY;
    }
    const k = setup.extraCount;
    this.normal.build(this.b, null, cellCount, setup.inverseVariance, setup.data, prior.matrix, prior.scale, extras, k, this.extraPrecision);
    this.lap(5);
    const value = this.evidence.evaluate(this.normal, k, prior.logDet + k * Math.log(this.extraPrecision), this.cellPoints);
    this.lap(6);
    if (Number.isNaN(value)) {
      this.rejections.notPositiveDefinite++;
      return Number.NEGATIVE_INFINITY;
    }
    return value;
  }

  /** Lays the mesh for this call; false when it cannot be built. */
  private buildMesh(p: Float64Array): boolean {
    if (this.regular !== null) {
      const rays = this.rays;
      const r2 = rays.raysPerPixel;
      let xMin = Infinity, xMax = -Infinity, yMin = Infinity, yMax = -Infinity;
      for (let e = 0; e < this.usedRows.length; e++) {
        const from = this.usedRows[e] * r2;
        for (let t = from; t < from + r2; t++) {
          const x = rays.betaX[t], y = rays.betaY[t];
          if (x < xMin) xMin = x;
          if (x > xMax) xMax = x;
          if (y < yMin) yMin = y;
          if (y > yMax) yMax = y;
        }
      }
      return this.regular.layOver(xMin, xMax, yMin, yMax);
    }
    const vertices = this.vertices!;
    vertices.select(this.setup.massTerms, p);
    const status = this.adaptive!.build(vertices.x, vertices.y, vertices.count);
    return status === TriangulationStatus.ok || status === TriangulationStatus.duplicatePoints;
  }

  /**
   * The prior precision of the cells as a matrix times a scale, and ln det of their product, or
   * null when it is not positive definite. Single-strength forms: lambda H with H of unit
   * strength (a regular mesh's H is built once). Brightness form: H weighted row by row.
   */
  private regularisationPrior(p: Float64Array, cellCount: number): { matrix: SymmetricCsr; scale: number; logDet: number } | null {
    const settings = this.setup.term.settings;
    const offset = this.setup.term.offset;
    const strength = Math.pow(10, p[offset]);
    if (settings.regularisation === 'brightness') {
      this.mesh.differenceRows('gradient', this.differences);
      this.rowWeights = ensureFloat64Capacity(this.rowWeights, this.differences.rowCount);
      this.brightness.rowWeights(this.m, this.usedRows, this.setup.data, cellCount, p[offset], p[offset + 1], this.differences, this.rowWeights);
      const matrix = this.regularisation.build(this.differences, cellCount, this.rowWeights);
      const logDet = this.regularisation.logDeterminant(this.cellPoints);
      return Number.isNaN(logDet) ? null : { matrix, scale: 1, logDet };
    }
    if (this.fixedH === null || this.mesh.topologyVaries) {
      this.mesh.differenceRows(settings.regularisation, this.differences);
      const matrix = this.regularisation.build(this.differences, cellCount);
      const logDet = this.regularisation.logDeterminant(this.cellPoints);
      if (Number.isNaN(logDet)) return null;
      if (!this.mesh.topologyVaries) this.fixedH = { matrix, logDet };
      return { matrix, scale: strength, logDet: cellCount * Math.log(strength) + logDet };
    }
    return { matrix: this.fixedH.matrix, scale: strength, logDet: cellCount * Math.log(strength) + this.fixedH.logDet };
  }

  /**
   * The source of the last successful evaluation with its posterior standard deviations (the
   * diagonal of A^-1, Takahashi recurrence), for reports. Call right after logEvidence.
   */
  reconstruction(): SourceReconstruction {
    const n = this.cellCount;
    const variance = new Float64Array(this.evidence.size);
    this.evidence.inverseDiagonal(variance);
    return {
      mesh: this.regular !== null ? 'regular' : 'adaptive',
      cellX: Float64Array.from(this.mesh.cellX.subarray(0, n)),
      cellY: Float64Array.from(this.mesh.cellY.subarray(0, n)),
      values: Float64Array.from(this.evidence.solution.subarray(0, n)),
      standardDeviations: Float64Array.from(variance.subarray(0, n), Math.sqrt),
      triangles: this.adaptive !== null ? Uint32Array.from(this.adaptive.triangulation.triangles.subarray(0, 3 * this.adaptive.triangulation.triangleCount)) : null,
      side: this.regular !== null ? this.regular.side : null,
    };
  }

  /** The lensed source of the last evaluation before the PSF (M s) added into `image` (whole grid, row-major). */
  addLensedSource(image: Float64Array): void {
    const { m } = this;
    const solution = this.evidence.solution;
    const computed = this.setup.computed;
    for (let q = 0; q < computed.length; q++) {
      let sum = 0;
      for (let k = m.rowStart[q]; k < m.rowStart[q + 1]; k++) sum += m.value[k] * solution[m.column[k]];
      image[computed[q]] += sum;
    }
  }
}
