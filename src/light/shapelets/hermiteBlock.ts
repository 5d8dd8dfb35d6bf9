/** Points per block: a block's Hermite values stay in cache while every basis image is written. */
export const HERMITE_BLOCK = 256;

const PI_TO_MINUS_QUARTER = Math.pow(Math.PI, -0.25);

/** Writes phi_0(u_i) = pi^-1/4 exp(-u_i^2 / 2) for i < size into out[0..size) (one row of a block). */
export type GaussianRow = (u: Float64Array, size: number, out: Float64Array) => void;

/** phi_0 with Math.exp (the reference). */
export function exactGaussianRow(u: Float64Array, size: number, out: Float64Array): void {
  for (let i = 0; i < size; i++) out[i] = PI_TO_MINUS_QUARTER * Math.exp(-0.5 * u[i] * u[i]);
}

/**
 * (v[from + i] - centre) * (1 / beta) into u[0..size), centre = p[centreAt], beta = p[scaleAt]
 * (read here: V8 boxes a double passed to a call it does not inline).
 */
export function scaledPositions(v: Float64Array, from: number, size: number, p: Float64Array, centreAt: number, scaleAt: number, u: Float64Array): void {
  const centre = p[centreAt], inverseScale = 1 / p[scaleAt];
  for (let i = 0; i < size; i++) u[i] = (v[from + i] - centre) * inverseScale;
}

/**
 * Orders 1..maxOrder of the Hermite functions over a block, from phi_0 in block[0..size) and the
 * scaled positions u: phi_1 = sqrt(2) u phi_0, phi_(k+1) = raising[k] u phi_k - lowering[k]
 * phi_(k-1) (hermiteFunctions.ts: Refregier 2003, eq. 1, with the Hermite polynomials'
 * three-term recurrence), order k at block[k * HERMITE_BLOCK + i]. Order by order over the block,
 * each step one pass over contiguous values; per point the same arithmetic as hermiteFunctions.
 */
export function hermiteOrders(
  u: Float64Array, size: number, maxOrder: number, raising: Float64Array, lowering: Float64Array, block: Float64Array,
): void {
  if (maxOrder < 1) return;
  for (let i = 0; i < size; i++) block[HERMITE_BLOCK + i] = Math.SQRT2 * u[i] * block[i];
  let k = 1;
  for (; k + 1 < maxOrder; k += 2) stepTwoOrders(block, u, k, raising, lowering, size);
  if (k < maxOrder) stepOrder(block, u, k, raising, lowering, size);
}

/**
 * Order k + 1 from orders k and k - 1 over the block. The coefficients are read here, not passed:
 * V8 boxes a double passed to a call it does not inline.
 */
function stepOrder(block: Float64Array, u: Float64Array, k: number, raising: Float64Array, lowering: Float64Array, size: number): void {
  const raise = raising[k], lower = lowering[k];
  const current = k * HERMITE_BLOCK, previous = current - HERMITE_BLOCK, next = current + HERMITE_BLOCK;
  for (let i = 0; i < size; i++) block[next + i] = raise * u[i] * block[current + i] - lower * block[previous + i];
}

/**
 * Orders k + 1 and k + 2 in one pass (the arithmetic of two stepOrder calls, so the same values,
 * with order k + 1 kept in a register instead of stored and loaded again).
 */
function stepTwoOrders(block: Float64Array, u: Float64Array, k: number, raising: Float64Array, lowering: Float64Array, size: number): void {
  const raise0 = raising[k], lower0 = lowering[k], raise1 = raising[k + 1], lower1 = lowering[k + 1];
  const current = k * HERMITE_BLOCK, previous = current - HERMITE_BLOCK, next = current + HERMITE_BLOCK, after = next + HERMITE_BLOCK;
  for (let i = 0; i < size; i++) {
    const ui = u[i];
    const c = block[current + i];
    const n = raise0 * ui * c - lower0 * block[previous + i];
    block[next + i] = n;
    block[after + i] = raise1 * ui * n - lower1 * c;
  }
}
