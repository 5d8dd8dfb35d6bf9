import { totalDeflection } from './lensEquation.js';
import type { MassTerm } from './massTerm.js';
import { contourRegion } from '../numeric/contour/contourRegion.js';

/** Critical curves and caustics of a lens, as polylines of flat (x0, y0, x1, y1, ...) arcsec. */
export interface LensCurves {
  /** Image plane: where det A = 0. */
  readonly critical: Float64Array[];
  /** Source plane: each critical polyline mapped through beta = theta - alpha(theta). */
  readonly caustics: Float64Array[];
  /** Spacing of the grid the curves were traced on, arcsec (their accuracy is of this order). */
  readonly spacingArcsec: number;
}

/**
 * Finite-difference step of the Jacobian, as a fraction of the grid spacing. Near a singular
 * centre the differences' error in det A grows like h^2 / r^4 against a true |det A| ~ 1 / r
 * (isothermal), flipping its sign within r ~ h^(2/3) of the centre: at 1/100 of the spacing that
 * disc stays inside one cell, while rounding (1e-16 |alpha| / h) stays negligible.
 */
const STEP_FRACTION = 1 / 100;

/**
 * Critical curves of the lens mapping beta = theta - alpha(theta) where det A = 0, A its Jacobian
 * (Schneider, Ehlers & Falco 1992, ch. 5 and 6), on the regular grid of node centres
 * xCentres x yCentres (equal spacing on both axes). A is taken by central differences of alpha
 * with a step of 1/100 of the spacing; the zero level of -det A is traced by marching squares with
 * linear interpolation along the cell edges (contourRegion), so a vertex lies within one spacing
 * of the true curve. Curves are cut where they leave the grid or meet a non-finite deflection
 * (e.g. the centre of a point mass); closed curves repeat their first point at the end. Closed
 * loops spanning less than two spacings on both axes are dropped as unresolved: around a singular
 * centre (SIS, point mass), where the radial critical curve shrinks to a point, the differences
 * straddle the singularity and trace such a spurious loop. Each
 * vertex is then mapped through the lens equation with the exact deflection to give the caustics.
 */
export function criticalCurves(
  massTerms: readonly MassTerm[], profile: Float64Array, xCentres: Float64Array, yCentres: Float64Array,
): LensCurves {
  const nx = xCentres.length;
  const ny = yCentres.length;
  const spacing = Math.abs(xCentres[1] - xCentres[0]);
  const h = STEP_FRACTION * spacing;
  const n = nx * ny;
  // Four displaced copies of the grid: +x, -x, +y, -y.
  const x = new Float64Array(4 * n);
  const y = new Float64Array(4 * n);
  const dx = [h, -h, 0, 0];
  const dy = [0, 0, h, -h];
  for (let c = 0; c < 4; c++) {
    for (let j = 0; j < ny; j++) {
      for (let i = 0; i < nx; i++) {
        const p = c * n + j * nx + i;
        x[p] = xCentres[i] + dx[c];
        y[p] = yCentres[j] + dy[c];
      }
    }
  }
  const ax = new Float64Array(4 * n);
  const ay = new Float64Array(4 * n);
  totalDeflection(massTerms, profile, x, y, 4 * n, ax, ay);
  const negativeDet = new Float64Array(n);
  const inv2h = 1 / (2 * h);
  for (let p = 0; p < n; p++) {
    const a11 = 1 - (ax[p] - ax[n + p]) * inv2h;
    const a12 = -(ax[2 * n + p] - ax[3 * n + p]) * inv2h;
    const a21 = -(ay[p] - ay[n + p]) * inv2h;
    const a22 = 1 - (ay[2 * n + p] - ay[3 * n + p]) * inv2h;
    negativeDet[p] = -(a11 * a22 - a12 * a21);
  }
  // The region {-det A >= 0} lies between the tangential and radial curves; the padding ring
  // (-1, outside the region) closes loops that leave the grid, and those parts are cut below.
  const region = contourRegion({ xCentres, yCentres, values: negativeDet }, 0, -1);
  const inside = (u: number, v: number): boolean => Number.isFinite(u) && Number.isFinite(v)
    && u >= xCentres[0] && u <= xCentres[nx - 1] && v >= yCentres[0] && v <= yCentres[ny - 1];
  const critical: Float64Array[] = [];
  for (const loop of region.loops) {
    const count = loop.length / 2;
    let start = -1;
    for (let k = 0; k < count; k++) if (!inside(loop[2 * k], loop[2 * k + 1])) { start = k; break; }
    if (start < 0) {
      if (resolved(loop, spacing)) critical.push(Float64Array.from([...loop, loop[0], loop[1]]));
      continue;
    }
    // Walk once round from an outside vertex, collecting the runs of inside vertices.
    let run: number[] = [];
    for (let s = 1; s <= count; s++) {
      const k = (start + s) % count;
      if (inside(loop[2 * k], loop[2 * k + 1])) {
        run.push(loop[2 * k], loop[2 * k + 1]);
      } else {
        if (run.length >= 4) critical.push(Float64Array.from(run));
        run = [];
      }
    }
  }
  const caustics = critical.map((curve) => {
    const m = curve.length / 2;
    const cx = new Float64Array(m);
    const cy = new Float64Array(m);
    for (let k = 0; k < m; k++) {
      cx[k] = curve[2 * k];
      cy[k] = curve[2 * k + 1];
    }
    const bx = new Float64Array(m);
    const by = new Float64Array(m);
    totalDeflection(massTerms, profile, cx, cy, m, bx, by);
    const out = new Float64Array(2 * m);
    for (let k = 0; k < m; k++) {
      out[2 * k] = cx[k] - bx[k];
      out[2 * k + 1] = cy[k] - by[k];
    }
    return out;
  });
  return { critical, caustics, spacingArcsec: spacing };
}

/** Whether a closed loop spans at least two grid spacings along x or y. */
function resolved(loop: Float64Array, spacing: number): boolean {
  let xMin = Infinity, xMax = -Infinity, yMin = Infinity, yMax = -Infinity;
  for (let k = 0; k < loop.length; k += 2) {
    xMin = Math.min(xMin, loop[k]);
    xMax = Math.max(xMax, loop[k]);
    yMin = Math.min(yMin, loop[k + 1]);
    yMax = Math.max(yMax, loop[k + 1]);
  }
  return xMax - xMin >= 2 * spacing || yMax - yMin >= 2 * spacing;
}
