import type { PixelGrid } from '../imaging/pixelGrid.js';
import { traceRays } from '../lensing/lensEquation.js';
import type { MassTerm } from '../lensing/massTerm.js';

/**
 * The vertices of the adaptive source mesh: the source-plane positions of a fixed set of image
 * pixels, traced at every call (Vegetti & Koopmans 2009: every n-th traced image pixel). Where an
 * image is magnified its pixels crowd in the source plane, so the vertices follow the
 * magnification; and since the set of pixels never changes, the vertices move continuously with
 * the lens parameters and their number is the same at every call, so the evidence has no jumps
 * from a changing selection (only the triangulation's edge flips remain). The pixels are those of
 * a lattice of spacing s (not necessarily whole) over the traced pixels, s chosen once so that the
 * lattice holds at least the cells asked for; the surplus is thinned in a spread-out order
 * (bit-reversed), so exactly `cells` vertices remain.
 *
 * With `bright` given, a share of the cells goes to a lattice of its own over the bright pixels
 * (where the data show the lensed source) and the rest to one over the other pixels: the arcs
 * then get a finer mesh than the empty parts of the mask, whose cells the regularisation ties to
 * the faint surroundings. Placing the source's cells after its brightness is the idea of
 * Nightingale, Dye & Massey (2018); here the brightness is read once from the data.
 */
export class VertexSelection {
  /** Source-plane positions of the vertices (count of them), in Z-order of the image pixels. */
  readonly x: Float64Array;
  readonly y: Float64Array;
  readonly count: number;
  /** How many of the vertices come from the bright pixels' lattice (0 without `bright`). */
  readonly brightCount: number;
  private readonly rayX: Float64Array;
  private readonly rayY: Float64Array;
  private readonly alphaX: Float64Array;
  private readonly alphaY: Float64Array;

  /**
   * `pixels`: the row-major indices of the pixels that may become vertices (e.g. every traced
   * pixel); `bright`: a subset of them and the share of the cells (0 to 1) its lattice gets
   * (fewer when it has fewer pixels; the other pixels' lattice gets the rest).
   */
  constructor(grid: PixelGrid, pixels: Int32Array, cells: number, bright?: { readonly pixels: Int32Array; readonly share: number }) {
    const { columns, rows, pixelScaleArcsec: scale } = grid;
    const { chosen, brightCount } = chosenPixels(pixels, columns, Math.max(1, Math.min(cells, pixels.length)), bright);
    this.brightCount = brightCount;
    const n = chosen.length;
    this.count = n;
    this.rayX = new Float64Array(n);
    this.rayY = new Float64Array(n);
    for (let v = 0; v < n; v++) {
      const i = chosen[v] % columns;
      const j = (chosen[v] - i) / columns;
      this.rayX[v] = (i - (columns - 1) / 2) * scale;
      this.rayY[v] = (j - (rows - 1) / 2) * scale;
    }
    this.alphaX = new Float64Array(n);
    this.alphaY = new Float64Array(n);
    this.x = new Float64Array(n);
    this.y = new Float64Array(n);
  }

  /** Traces the vertex pixels for the profile vector p. */
  select(massTerms: readonly MassTerm[], p: Float64Array): void {
    traceRays(massTerms, p, this.rayX, this.rayY, this.count, this.alphaX, this.alphaY, this.x, this.y);
  }
}

/**
 * The vertex pixels, in Z-order: one lattice over all pixels, or one over the bright ones (the
 * first brightCount chosen) and one over the others.
 */
function chosenPixels(
  pixels: Int32Array, columns: number, cells: number, bright?: { readonly pixels: Int32Array; readonly share: number },
): { chosen: Int32Array; brightCount: number } {
  if (bright === undefined || bright.share <= 0 || bright.pixels.length === 0) return { chosen: latticePixels(pixels, columns, cells), brightCount: 0 };
  const isBright = new Set(bright.pixels);
  const brightPixels = pixels.filter((p) => isBright.has(p));
  const others = pixels.filter((p) => !isBright.has(p));
  const brightCells = Math.min(brightPixels.length, Math.round(bright.share * cells));
  const otherCells = Math.min(others.length, cells - brightCells);
  const parts = [brightCells > 0 ? latticePixels(brightPixels, columns, brightCells) : [], otherCells > 0 ? latticePixels(others, columns, otherCells) : []];
  const merged = [...parts[0], ...parts[1]];
  merged.sort((a, b) => mortonOf(a, columns) - mortonOf(b, columns));
  return { chosen: Int32Array.from(merged), brightCount: parts[0].length };
}

/**
 * Exactly `cells` of the pixels, in Z-order of their (column, row): those on the lattice of the
 * largest spacing s (found by bisection) whose lines cross at least `cells` of them (pixel (i, j)
 * is on it when a multiple of s falls in [i, i + 1) and one in [j, j + 1)), thinned to `cells` by
 * dropping the last in bit-reversed order of their Z-order rank, which spreads the dropped ones
 * over the field.
 */
function latticePixels(pixels: Int32Array, columns: number, cells: number): Int32Array {
  const onLattice = (s: number): Int32Array => pixels.filter((p) => {
    const i = p % columns;
    const j = (p - i) / columns;
    return Math.ceil(i / s) * s < i + 1 && Math.ceil(j / s) * s < j + 1;
  });
  let low = 1, high = Math.sqrt(pixels.length);
  if (onLattice(high).length >= cells) low = high;
  for (let step = 0; step < 40 && high - low > 1e-6; step++) {
    const mid = 0.5 * (low + high);
    if (onLattice(mid).length >= cells) low = mid;
    else high = mid;
  }
  const kept = Array.from(onLattice(low));
  kept.sort((a, b) => mortonOf(a, columns) - mortonOf(b, columns));
  if (kept.length === cells) return Int32Array.from(kept);
  const bits = Math.ceil(Math.log2(kept.length));
  const rank = kept.map((_, r) => bitReverse(r, bits));
  const order = kept.map((_, r) => r).sort((a, b) => rank[a] - rank[b]).slice(0, cells).sort((a, b) => a - b);
  return Int32Array.from(order, (r) => kept[r]);
}

function mortonOf(pixel: number, columns: number): number {
  const i = pixel % columns;
  return interleave(i) * 2 + interleave((pixel - i) / columns);
}

/** The lowest `bits` bits of r in reverse order. */
function bitReverse(r: number, bits: number): number {
  let out = 0;
  for (let b = 0; b < bits; b++) out |= ((r >> b) & 1) << (bits - 1 - b);
  return out;
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
