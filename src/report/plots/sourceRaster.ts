import { AdaptiveMesh } from '../../inversion/adaptiveMesh.js';
import { RegularMesh } from '../../inversion/regularMesh.js';
import type { SourceFile } from '../../records/sourceFile.js';

/** A square window of the source plane: centre and half-side, arcsec. */
export interface SourceWindow {
  readonly centreX: number;
  readonly centreY: number;
  readonly half: number;
}

/** A reconstructed source sampled on a square raster (row 0 at the bottom). */
export interface SourceRaster {
  readonly cells: number;
  readonly window: SourceWindow;
  readonly values: Float64Array;
  readonly standardDeviations: Float64Array;
  /** 1 where the raster cell's centre lies off the mesh (the source there is taken to vanish). */
  readonly outside: Uint8Array;
}

/** Margin around the mesh's cells, as a fraction of their extent. */
const WINDOW_MARGIN = 0.06;

/** The smallest square holding every cell of the reconstruction, with a small margin. */
export function sourceWindowOf(source: SourceFile): SourceWindow {
  let xMin = Infinity, xMax = -Infinity, yMin = Infinity, yMax = -Infinity;
  for (let k = 0; k < source.cellXArcsec.length; k++) {
    xMin = Math.min(xMin, source.cellXArcsec[k]);
    xMax = Math.max(xMax, source.cellXArcsec[k]);
    yMin = Math.min(yMin, source.cellYArcsec[k]);
    yMax = Math.max(yMax, source.cellYArcsec[k]);
  }
  const half = 0.5 * Math.max(xMax - xMin, yMax - yMin) * (1 + 2 * WINDOW_MARGIN);
  return { centreX: 0.5 * (xMin + xMax), centreY: 0.5 * (yMin + yMax), half: half > 0 ? half : 0.1 };
}

/** Half-side of a zoomed window, at least this fraction of the whole mesh's. */
const ZOOM_FLOOR = 0.2;

/**
 * A square about the cells whose value is at least `threshold` standard deviations from zero
 * (the part of the source the data hold), widened by half its size and kept inside the mesh's
 * window; the mesh's window when no cell passes.
 */
export function significantWindowOf(source: SourceFile, threshold: number): SourceWindow {
  const whole = sourceWindowOf(source);
  let xMin = Infinity, xMax = -Infinity, yMin = Infinity, yMax = -Infinity;
  for (let k = 0; k < source.values.length; k++) {
    if (!(Math.abs(source.values[k]) >= threshold * source.standardDeviations[k])) continue;
    xMin = Math.min(xMin, source.cellXArcsec[k]);
    xMax = Math.max(xMax, source.cellXArcsec[k]);
    yMin = Math.min(yMin, source.cellYArcsec[k]);
    yMax = Math.max(yMax, source.cellYArcsec[k]);
  }
  if (!(xMax >= xMin)) return whole;
  const half = Math.min(whole.half, Math.max(ZOOM_FLOOR * whole.half, 0.75 * Math.max(xMax - xMin, yMax - yMin)));
  const clamp = (c: number, centre: number): number => Math.min(centre + whole.half - half, Math.max(centre - whole.half + half, c));
  return { centreX: clamp(0.5 * (xMin + xMax), whole.centreX), centreY: clamp(0.5 * (yMin + yMax), whole.centreY), half };
}

/**
 * Samples a reconstruction at the centres of a cells x cells raster over `window`, interpolated
 * as the fit interpolated it: natural-neighbour weights on the Delaunay triangulation of an
 * adaptive mesh (rebuilt from the cell positions, which gives the same triangles), bilinear
 * between the nodes of a regular one. The standard deviations are interpolated the same way, which is a display
 * device only: the error of an interpolated value also depends on the cells' covariances.
 */
export function rasterizeSource(source: SourceFile, window: SourceWindow, cells: number): SourceRaster {
  const n = cells * cells;
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  const size = (2 * window.half) / cells;
  for (let j = 0; j < cells; j++) {
    for (let i = 0; i < cells; i++) {
      x[j * cells + i] = window.centreX - window.half + (i + 0.5) * size;
      y[j * cells + i] = window.centreY - window.half + (j + 0.5) * size;
    }
  }
  const cellX = Float64Array.from(source.cellXArcsec);
  const cellY = Float64Array.from(source.cellYArcsec);
  let per: number;
  let interpolate: (bx: Float64Array, by: Float64Array, count: number, c: Int32Array, w: Float64Array) => number;
  if (source.mesh === 'regular') {
    const mesh = new RegularMesh(source.side as number);
    mesh.x0 = cellX[0];
    mesh.y0 = cellY[0];
    mesh.spacing = cellX.length > 1 ? cellX[1] - cellX[0] : 1;
    per = mesh.entriesPerRay;
    interpolate = (bx, by, count, c, w) => mesh.interpolate(bx, by, count, c, w);
  } else {
    const mesh = new AdaptiveMesh();
    mesh.build(cellX, cellY, cellX.length);
    per = mesh.entriesPerRay;
    interpolate = (bx, by, count, c, w) => mesh.interpolate(bx, by, count, c, w);
  }
  const cellIndex = new Int32Array(per * n);
  const weight = new Float64Array(per * n);
  interpolate(x, y, n, cellIndex, weight);
  const values = new Float64Array(n);
  const standardDeviations = new Float64Array(n);
  const outside = new Uint8Array(n);
  for (let p = 0; p < n; p++) {
    let v = 0, s = 0, any = false;
    for (let k = per * p; k < per * (p + 1); k++) {
      const c = cellIndex[k];
      if (c < 0) continue;
      any = true;
      v += weight[k] * source.values[c];
      s += weight[k] * source.standardDeviations[c];
    }
    values[p] = v;
    standardDeviations[p] = s;
    outside[p] = any ? 0 : 1;
  }
  return { cells, window, values, standardDeviations, outside };
}

/** The mesh's edges as flat segments x0, y0, x1, y1, ... (arcsec): triangle sides, or the regular grid's lines. */
export function meshEdges(source: SourceFile): Float64Array {
  const { cellXArcsec: cx, cellYArcsec: cy } = source;
  const out: number[] = [];
  if (source.mesh === 'regular') {
    const side = source.side as number;
    for (let b = 0; b < side; b++) {
      out.push(cx[b * side], cy[b * side], cx[b * side + side - 1], cy[b * side + side - 1]);
      out.push(cx[b], cy[b], cx[(side - 1) * side + b], cy[(side - 1) * side + b]);
    }
    return Float64Array.from(out);
  }
  const t = source.triangles ?? [];
  const seen = new Set<number>();
  const count = cx.length;
  for (let k = 0; k + 2 < t.length; k += 3) {
    for (const [a, b] of [[t[k], t[k + 1]], [t[k + 1], t[k + 2]], [t[k + 2], t[k]]]) {
      const key = Math.min(a, b) * count + Math.max(a, b);
      if (seen.has(key)) continue;
      seen.add(key);
      out.push(cx[a], cy[a], cx[b], cy[b]);
    }
  }
  return Float64Array.from(out);
}
