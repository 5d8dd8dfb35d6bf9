import { fastExp } from '../../numeric/elementary/fastExp.js';
import { fastLog } from '../../numeric/elementary/fastLog.js';
import { lagrangeWeights } from './lagrangeWeights.js';

/**
 * The deflection of a unit elliptical profile (amplitude 1, radius scale 1, major axis along x,
 * centred) of axis ratio q and shape s at n points X, Y >= 0, added into ax, ay.
 */
export type UnitDeflection = (
  q: number, shape: number, x: Float64Array, y: Float64Array, n: number, ax: Float64Array, ay: Float64Array,
) => void;

/** Nodes of an evenly spaced axis: first, step, count. */
export interface TableAxis {
  readonly first: number;
  readonly step: number;
  readonly count: number;
}

/**
 * Nodes per decade of the elliptical radius, and across the quadrant in w = sqrt(c) = cos of the
 * elliptical angle (ends included; uniform in w the nodes gather towards the minor axis, where
 * the interpolation errs most: 17 nodes uniform in c gave 1.7e-5, uniform in w 6.8e-6, 25 in w
 * 1.5e-6 for an NFW at q = 0.43; 24 rather than 16 radius nodes per decade took an n = 1 Sersic
 * from 1.9e-5 to 3.7e-6).
 */
const RADIUS_NODES_PER_DECADE = 24;
const ANGLE_NODES = 25;
/** Distance of the end angle nodes from c = 0 and 1. */
const ANGLE_END_OFFSET = 1e-8;
/** Axis-ratio nodes 1, 0.975, ..., 0.2. */
export const AXIS_RATIO_AXIS: TableAxis = Object.freeze({ first: 1, step: -0.025, count: 33 });

/**
 * The deflection of a homoeoidal profile tabulated for interpolation. In the major-axis frame,
 * with X = |x'|, Y = |y'| in units of the radius scale, rho^2 = q X^2 + Y^2 / q (the circularised
 * radius) and c = q X^2 / rho^2 in [0, 1], the deflection is alpha_x' = A x' exp(L0), alpha_y' =
 * A y' exp(L1), where L0 = ln(alpha_X / X) and L1 = ln(alpha_Y / Y) of the unit profile are smooth
 * functions of (ln rho^2, sqrt(c), q, s) (the homoeoid integrals of Schramm 1990 are analytic in
 * X^2 and Y^2, and power laws in rho become straight lines in ln rho^2). They are held on a grid of
 * 24 nodes per decade of rho over [minRadius, maxRadius], 25 nodes in sqrt(c) and the nodes of q
 * (AXIS_RATIO_AXIS) and s (`shapeAxis`). Each (q, s) node's slice over (ln rho^2, sqrt(c)) is
 * computed from the reference when first needed (about 3,600 reference evaluations, 50-100 ms). A call
 * combines the 4 x 4 node slices around its (q, s) by Lagrange weights into one slice (kept while
 * q and s repeat), then each point reads 4 x 4 nodes of that slice: piecewise cubic Lagrange
 * interpolation (Abramowitz & Stegun 1972, 25.2.13) in every direction, continuous across cells.
 * Outside the radius range the caller uses the reference.
 */
export class EllipticalDeflectionTable {
  readonly radiusCount: number;
  readonly lowestLogRadius2: number;
  readonly logRadius2Step: number;
  readonly minRadius2: number;
  readonly maxRadius2: number;
  /** The slice of the current (q, s): L0, L1 at (radius node i, angle node j) at 2 (i ANGLE_NODES + j). */
  readonly slice: Float64Array;
  private readonly nodeSlices = new Map<number, Float64Array>();
  private currentQ = Number.NaN;
  private currentShape = Number.NaN;
  private readonly weightsQ = new Float64Array(4);
  private readonly weightsShape = new Float64Array(4);

  constructor(
    private readonly unitDeflection: UnitDeflection,
    minRadius: number, maxRadius: number,
    private readonly shapeAxis: TableAxis = { first: 0, step: 1, count: 1 },
  ) {
    this.logRadius2Step = (2 * Math.LN10) / RADIUS_NODES_PER_DECADE;
    this.lowestLogRadius2 = 2 * Math.log(minRadius);
    this.radiusCount = Math.ceil((2 * Math.log(maxRadius) - this.lowestLogRadius2) / this.logRadius2Step) + 1;
    this.minRadius2 = minRadius * minRadius;
    this.maxRadius2 = Math.exp(this.lowestLogRadius2 + (this.radiusCount - 1) * this.logRadius2Step);
    this.slice = new Float64Array(this.radiusCount * ANGLE_NODES * 2);
  }

  /** Whether (q, s) lies inside the table's node range (otherwise the caller uses the reference). */
  covers(q: number, shape: number): boolean {
    return axisPosition(AXIS_RATIO_AXIS, q) !== undefined && axisPosition(this.shapeAxis, shape) !== undefined;
  }

  /** Whether every node slice (q, s) needs is already computed. */
  isReady(q: number, shape: number): boolean {
    if (q === this.currentQ && shape === this.currentShape) return true;
    const kq = stencilStart(AXIS_RATIO_AXIS, q), ks = stencilStart(this.shapeAxis, shape);
    for (let a = 0; a < Math.min(4, AXIS_RATIO_AXIS.count); a++) {
      for (let b = 0; b < Math.min(4, this.shapeAxis.count); b++) if (!this.nodeSlices.has((kq + a) * 1024 + ks + b)) return false;
    }
    return true;
  }

  /** Makes `slice` that of (q, s), computing missing node slices. (q, s) must be covered. */
  prepare(q: number, shape: number): void {
    if (q === this.currentQ && shape === this.currentShape) return;
    const kq = stencilStart(AXIS_RATIO_AXIS, q), ks = stencilStart(this.shapeAxis, shape);
    const countQ = Math.min(4, AXIS_RATIO_AXIS.count), countShape = Math.min(4, this.shapeAxis.count);
    lagrangeWeights((q - AXIS_RATIO_AXIS.first) / AXIS_RATIO_AXIS.step - kq, countQ, this.weightsQ);
    lagrangeWeights((shape - this.shapeAxis.first) / this.shapeAxis.step - ks, countShape, this.weightsShape);
    this.slice.fill(0);
    for (let a = 0; a < countQ; a++) {
      for (let b = 0; b < countShape; b++) {
        const node = this.nodeSlice(kq + a, ks + b);
        addScaled(this.slice, node, this.weightsQ[a] * this.weightsShape[b]);
      }
    }
    this.currentQ = q;
    this.currentShape = shape;
  }

  private nodeSlice(indexQ: number, indexShape: number): Float64Array {
    const key = indexQ * 1024 + indexShape;
    let node = this.nodeSlices.get(key);
    if (node === undefined) {
      node = this.computeNodeSlice(AXIS_RATIO_AXIS.first + indexQ * AXIS_RATIO_AXIS.step, this.shapeAxis.first + indexShape * this.shapeAxis.step);
      this.nodeSlices.set(key, node);
    }
    return node;
  }

  // L0 = ln(alpha_X / X), L1 = ln(alpha_Y / Y) of the unit profile at the slice's nodes.
  private computeNodeSlice(q: number, shape: number): Float64Array {
    const count = this.radiusCount * ANGLE_NODES;
    const x = new Float64Array(count), y = new Float64Array(count), ax = new Float64Array(count), ay = new Float64Array(count);
    for (let i = 0; i < this.radiusCount; i++) {
      const rho = Math.exp(0.5 * (this.lowestLogRadius2 + i * this.logRadius2Step));
      for (let j = 0; j < ANGLE_NODES; j++) {
        // The end nodes c = 0 and 1 are taken 1e-8 inside, where alpha_X / X and alpha_Y / Y are
        // still well defined and within ~1e-8 of their limits.
        const w = j / (ANGLE_NODES - 1), c = Math.min(Math.max(w * w, ANGLE_END_OFFSET), 1 - ANGLE_END_OFFSET);
        x[i * ANGLE_NODES + j] = rho * Math.sqrt(c / q);
        y[i * ANGLE_NODES + j] = rho * Math.sqrt((1 - c) * q);
      }
    }
    this.unitDeflection(q, shape, x, y, count, ax, ay);
    const node = new Float64Array(2 * count);
    for (let k = 0; k < count; k++) {
      node[2 * k] = Math.log(ax[k] / x[k]);
      node[2 * k + 1] = Math.log(ay[k] / y[k]);
      if (!(Number.isFinite(node[2 * k]) && Number.isFinite(node[2 * k + 1]))) {
        throw new Error(`deflection table: the unit profile's deflection is not inward-positive at X = ${x[k]}, Y = ${y[k]}, q = ${q}`);
      }
    }
    return node;
  }
}

/** Index of the first of the 4 nodes around v on the axis (clamped to the ends), for v inside the axis. */
function stencilStart(axis: TableAxis, v: number): number {
  if (axis.count <= 4) return 0;
  const u = (v - axis.first) / axis.step;
  return Math.min(Math.max(Math.floor(u) - 1, 0), axis.count - 4);
}

/** Position of v in node units when it lies within the axis (a one-node axis covers only its node). */
function axisPosition(axis: TableAxis, v: number): number | undefined {
  const u = (v - axis.first) / axis.step;
  return u >= 0 && u <= axis.count - 1 ? u : undefined;
}

// target += weight * source (one node slice's share of the combined slice).
function addScaled(target: Float64Array, source: Float64Array, weight: number): void {
  for (let k = 0; k < target.length; k++) target[k] += weight * source[k];
}

const SIXTH = 1 / 6;

/** The table's reading of one call: amplitude, radius scale, axis ratio, rotation and centre. */
export interface TableCall {
  amplitude: number;
  inverseRadius: number;
  q: number;
  cos: number;
  sin: number;
  cx: number;
  cy: number;
}

/**
 * Adds the interpolated deflection at n points; writes the indices of points outside the radius
 * range into `outside` and returns how many there are (the caller deflects those otherwise).
 */
export function addTabulatedDeflection(
  table: EllipticalDeflectionTable, call: TableCall, x: Float64Array, y: Float64Array, n: number,
  alphaX: Float64Array, alphaY: Float64Array, outside: Int32Array,
): number {
  const { amplitude, inverseRadius, q, cos, sin, cx, cy } = call;
  const slice = table.slice, inverseQ = 1 / q, last = table.radiusCount - 4;
  const minRadius2 = table.minRadius2, maxRadius2 = table.maxRadius2;
  const lowest = table.lowestLogRadius2, inverseStep = 1 / table.logRadius2Step;
  let outsideCount = 0;
  for (let i = 0; i < n; i++) {
    const dx = x[i] - cx, dy = y[i] - cy;
    const xr = cos * dx + sin * dy, yr = cos * dy - sin * dx;
    const bigX2 = xr * xr * inverseRadius * inverseRadius, bigY2 = yr * yr * inverseRadius * inverseRadius;
    const rho2 = q * bigX2 + inverseQ * bigY2;
    if (!(rho2 >= minRadius2 && rho2 <= maxRadius2)) {
      outside[outsideCount++] = i;
      continue;
    }
    const u = (fastLog(rho2) - lowest) * inverseStep;
    const i0 = Math.min(Math.max(Math.floor(u) - 1, 0), last);
    const t = u - i0;
    const v = Math.sqrt((q * bigX2) / rho2) * (ANGLE_NODES - 1);
    const j0 = Math.min(Math.max(Math.floor(v) - 1, 0), ANGLE_NODES - 4);
    const s = v - j0;
    // Cubic Lagrange weights at t, s for nodes 0..3 (A&S 25.2.13).
    const t1 = t - 1, t2 = t - 2, t3 = t - 3, s1 = s - 1, s2 = s - 2, s3 = s - 3;
    const r0 = -SIXTH * t1 * t2 * t3, r1 = 0.5 * t * t2 * t3, r2 = -0.5 * t * t1 * t3, r3 = SIXTH * t * t1 * t2;
    const c0 = -SIXTH * s1 * s2 * s3, c1 = 0.5 * s * s2 * s3, c2 = -0.5 * s * s1 * s3, c3 = SIXTH * s * s1 * s2;
    const b0 = 2 * (i0 * ANGLE_NODES + j0), b1 = b0 + 2 * ANGLE_NODES, b2 = b1 + 2 * ANGLE_NODES, b3 = b2 + 2 * ANGLE_NODES;
    const l0 =
      r0 * (c0 * slice[b0] + c1 * slice[b0 + 2] + c2 * slice[b0 + 4] + c3 * slice[b0 + 6]) +
      r1 * (c0 * slice[b1] + c1 * slice[b1 + 2] + c2 * slice[b1 + 4] + c3 * slice[b1 + 6]) +
      r2 * (c0 * slice[b2] + c1 * slice[b2 + 2] + c2 * slice[b2 + 4] + c3 * slice[b2 + 6]) +
      r3 * (c0 * slice[b3] + c1 * slice[b3 + 2] + c2 * slice[b3 + 4] + c3 * slice[b3 + 6]);
    const l1 =
      r0 * (c0 * slice[b0 + 1] + c1 * slice[b0 + 3] + c2 * slice[b0 + 5] + c3 * slice[b0 + 7]) +
      r1 * (c0 * slice[b1 + 1] + c1 * slice[b1 + 3] + c2 * slice[b1 + 5] + c3 * slice[b1 + 7]) +
      r2 * (c0 * slice[b2 + 1] + c1 * slice[b2 + 3] + c2 * slice[b2 + 5] + c3 * slice[b2 + 7]) +
      r3 * (c0 * slice[b3 + 1] + c1 * slice[b3 + 3] + c2 * slice[b3 + 5] + c3 * slice[b3 + 7]);
    const ax = amplitude * xr * fastExp(l0), ay = amplitude * yr * fastExp(l1);
    alphaX[i] += cos * ax - sin * ay;
    alphaY[i] += sin * ax + cos * ay;
  }
  return outsideCount;
}
