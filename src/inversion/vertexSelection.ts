import type { PixelGrid } from '../imaging/pixelGrid.js';
import { traceRays } from '../lensing/lensEquation.js';
import type { MassTerm } from '../lensing/massTerm.js';

/** Buckets of the ordering by local spacing (log-spaced); ties within a bucket keep image order. */
const ORDER_BUCKETS = 64;
/** Passes that rescale the accept radius towards the wanted vertex count (each ~sqrt of the miss). */
const COUNT_PASSES = 3;

/**
 * The vertices of the adaptive source mesh, chosen so their density follows the magnification
 * of the most magnified image of each source region (arcsift's own scheme, in the spirit of the
 * magnification-adapted grids of Vegetti & Koopmans 2009). Candidates are the traced centres of
 * the used pixels on a lattice; each gets the local source-plane size of a pixel,
 * delta = sqrt(|det J|) (pixel scale) from two extra rays half a pixel along x and y. Taking the
 * candidates from the smallest delta up, a candidate is kept unless a kept vertex lies within
 * `spacing` delta of it: an image's candidates keep the lattice of that image, and where several
 * images overlap in the source plane the most magnified one sets the density, instead of their
 * sum (which would crowd cells where a low-magnification image's pixels cover many of them).
 * The accept radius is rescaled by sqrt(kept / wanted) for a few passes, so the count comes
 * close to the one asked for at every call (each pass depends only on the lens, so the mesh is a
 * function of the parameters).
 */
export class VertexSelection {
  /** Source-plane positions of the kept vertices (count of them). */
  readonly x: Float64Array;
  readonly y: Float64Array;
  count = 0;
  private readonly candidates: number;
  private readonly rayX: Float64Array;
  private readonly rayY: Float64Array;
  private readonly betaX: Float64Array;
  private readonly betaY: Float64Array;
  private readonly alphaX: Float64Array;
  private readonly alphaY: Float64Array;
  private readonly delta: Float64Array;
  private readonly order: Int32Array;
  private readonly bucketStart = new Int32Array(ORDER_BUCKETS + 1);
  private readonly spacing: number;
  private readonly wanted: number;
  // Spatial hash of the kept vertices: cells of side `cellSize`, chained through `next`.
  private head = new Int32Array(0);
  private readonly next: Int32Array;
  private readonly keys: Float64Array;
  private readonly keptX: Float64Array;
  private readonly keptY: Float64Array;

  /**
   * `cells`: how many vertices are wanted; the accept radius starts at sqrt(used / cells) local
   * pixel sizes, and the lattice of candidates is a third of that (at least every pixel), dense
   * enough for the passes that shrink it.
   */
  constructor(grid: PixelGrid, used: Int32Array, cells: number) {
    this.wanted = cells;
    this.spacing = Math.max(1, Math.sqrt(used.length / cells));
    const k = Math.max(1, Math.floor(this.spacing / 3));
    const { columns, rows, pixelScaleArcsec: scale } = grid;
    const chosen = used.filter((p) => {
      const i = p % columns;
      const j = (p - i) / columns;
      return i % k === 0 && j % k === 0;
    });
    const n = chosen.length;
    this.candidates = n;
    this.rayX = new Float64Array(3 * n);
    this.rayY = new Float64Array(3 * n);
    for (let c = 0; c < n; c++) {
      const i = chosen[c] % columns;
      const j = (chosen[c] - i) / columns;
      const x = (i - (columns - 1) / 2) * scale;
      const y = (j - (rows - 1) / 2) * scale;
      this.rayX[3 * c] = this.rayX[3 * c + 2] = x;
      this.rayY[3 * c] = this.rayY[3 * c + 1] = y;
      this.rayX[3 * c + 1] = x + 0.5 * scale;
      this.rayY[3 * c + 2] = y + 0.5 * scale;
    }
    this.betaX = new Float64Array(3 * n);
    this.betaY = new Float64Array(3 * n);
    this.alphaX = new Float64Array(3 * n);
    this.alphaY = new Float64Array(3 * n);
    this.delta = new Float64Array(n);
    this.order = new Int32Array(n);
    this.next = new Int32Array(n);
    this.x = new Float64Array(n);
    this.y = new Float64Array(n);
    this.keys = new Float64Array(n);
    this.keptX = new Float64Array(n);
    this.keptY = new Float64Array(n);
  }

  /** Traces the candidates for the profile vector p and keeps the vertices. */
  select(massTerms: readonly MassTerm[], p: Float64Array): void {
    traceRays(massTerms, p, this.rayX, this.rayY, 3 * this.candidates, this.alphaX, this.alphaY, this.betaX, this.betaY);
    const range = this.localSizes();
    this.orderBySize(range[0], range[1]);
    let spacing = this.spacing;
    for (let pass = 0; ; pass++) {
      this.keep(spacing);
      if (pass + 1 >= COUNT_PASSES || this.count === 0 || this.count === this.wanted) break;
      spacing *= Math.sqrt(this.count / this.wanted);
    }
    this.zOrder();
  }

  /** delta of each candidate (2 |cross product| of the half-pixel steps, square-rooted); returns [min, max]. */
  private localSizes(): [number, number] {
    const { betaX, betaY, delta } = this;
    let least = Infinity, most = 0;
    for (let c = 0; c < this.candidates; c++) {
      const x0 = betaX[3 * c], y0 = betaY[3 * c];
      const ux = betaX[3 * c + 1] - x0, uy = betaY[3 * c + 1] - y0;
      const vx = betaX[3 * c + 2] - x0, vy = betaY[3 * c + 2] - y0;
      const d = 2 * Math.sqrt(Math.abs(ux * vy - uy * vx));
      delta[c] = d;
      if (d > 0 && d < least) least = d;
      if (d > most) most = d;
    }
    return [least, most];
  }

  /** The candidates ordered by delta into log-spaced buckets (a counting sort; image order within a bucket). */
  private orderBySize(least: number, most: number): void {
    const { delta, order, bucketStart } = this;
    const span = most > least ? Math.log(most / least) : 1;
    const toBucket = (d: number): number => (d > 0 ? Math.min(ORDER_BUCKETS - 1, Math.floor((ORDER_BUCKETS * Math.log(d / least)) / span)) : 0);
    bucketStart.fill(0);
    for (let c = 0; c < this.candidates; c++) bucketStart[toBucket(delta[c]) + 1]++;
    for (let b = 0; b < ORDER_BUCKETS; b++) bucketStart[b + 1] += bucketStart[b];
    for (let c = 0; c < this.candidates; c++) order[bucketStart[toBucket(delta[c])]++] = c;
  }

  /** Greedy keeping in order with accept radius `spacing` delta, with a spatial hash of the kept vertices. */
  private keep(spacing: number): void {
    const { betaX, betaY, delta, order, next, x, y } = this;
    let xMin = Infinity, xMax = -Infinity, yMin = Infinity, yMax = -Infinity, sizeSum = 0;
    for (let c = 0; c < this.candidates; c++) {
      const bx = betaX[3 * c], by = betaY[3 * c];
      if (bx < xMin) xMin = bx;
      if (bx > xMax) xMax = bx;
      if (by < yMin) yMin = by;
      if (by > yMax) yMax = by;
      sizeSum += delta[c];
    }
    const cellSize = Math.max(1e-12, (spacing * sizeSum) / Math.max(1, this.candidates));
    const nx = Math.max(1, Math.min(512, Math.ceil((xMax - xMin) / cellSize) + 1));
    const ny = Math.max(1, Math.min(512, Math.ceil((yMax - yMin) / cellSize) + 1));
    const sx = (xMax - xMin) / nx || 1, sy = (yMax - yMin) / ny || 1;
    if (this.head.length < nx * ny) this.head = new Int32Array(nx * ny);
    this.head.fill(-1, 0, nx * ny);
    let kept = 0;
    for (let t = 0; t < this.candidates; t++) {
      const c = order[t];
      const bx = betaX[3 * c], by = betaY[3 * c];
      if (!Number.isFinite(bx) || !Number.isFinite(by)) continue;
      const radius = spacing * delta[c];
      const ci = Math.min(nx - 1, Math.floor((bx - xMin) / sx));
      const cj = Math.min(ny - 1, Math.floor((by - yMin) / sy));
      const ri = Math.ceil(radius / sx), rj = Math.ceil(radius / sy);
      if (this.anyWithin(bx, by, radius, ci, cj, ri, rj, nx, ny)) continue;
      x[kept] = bx;
      y[kept] = by;
      const cell = cj * nx + ci;
      next[kept] = this.head[cell];
      this.head[cell] = kept;
      kept++;
    }
    this.count = kept;
  }

  /**
   * Renumbers the kept vertices along the Z-order (Morton 1966) curve of their positions, so that
   * cells close in the source plane get close numbers: the cells of one pixel's footprint then
   * touch few rows of the normal matrix, and its ordering starts from a coherent labelling.
   */
  private zOrder(): void {
    const { x, y, keys, count } = this;
    let xMin = Infinity, xMax = -Infinity, yMin = Infinity, yMax = -Infinity;
    for (let v = 0; v < count; v++) {
      if (x[v] < xMin) xMin = x[v];
      if (x[v] > xMax) xMax = x[v];
      if (y[v] < yMin) yMin = y[v];
      if (y[v] > yMax) yMax = y[v];
    }
    const sx = 65535 / Math.max(1e-300, xMax - xMin), sy = 65535 / Math.max(1e-300, yMax - yMin);
    for (let v = 0; v < count; v++) {
      const code = interleave(Math.floor((x[v] - xMin) * sx)) * 2 + interleave(Math.floor((y[v] - yMin) * sy));
      keys[v] = code * 65536 + v;
    }
    const sorted = keys.subarray(0, count).sort();
    for (let v = 0; v < count; v++) {
      const from = sorted[v] % 65536;
      this.keptX[v] = x[from];
      this.keptY[v] = y[from];
    }
    x.set(this.keptX.subarray(0, count));
    y.set(this.keptY.subarray(0, count));
  }

  /** Whether a kept vertex lies within `radius` of (bx, by), searching the hash cells around (ci, cj). */
  private anyWithin(bx: number, by: number, radius: number, ci: number, cj: number, ri: number, rj: number, nx: number, ny: number): boolean {
    const r2 = radius * radius;
    for (let j = Math.max(0, cj - rj); j <= Math.min(ny - 1, cj + rj); j++) {
      for (let i = Math.max(0, ci - ri); i <= Math.min(nx - 1, ci + ri); i++) {
        for (let v = this.head[j * nx + i]; v >= 0; v = this.next[v]) {
          const dx = this.x[v] - bx, dy = this.y[v] - by;
          if (dx * dx + dy * dy < r2) return true;
        }
      }
    }
    return false;
  }
}

/** The 16 bits of v spread to the even bits of a 32-bit number (for Morton codes). */
function interleave(v: number): number {
  let s = v & 0xffff;
  s = (s | (s << 8)) & 0x00ff00ff;
  s = (s | (s << 4)) & 0x0f0f0f0f;
  s = (s | (s << 2)) & 0x33333333;
  s = (s | (s << 1)) & 0x55555555;
  return s >>> 0;
}
