import { InputError, expectedFound } from '../../errors.js';
import type { LightProfile } from '../lightProfile.js';
import { exactGaussianRow, hermiteOrders, HERMITE_BLOCK, scaledPositions, type GaussianRow } from './hermiteBlock.js';
import { hermiteRecurrence } from './hermiteFunctions.js';
import { ShapeletKernel } from './shapeletKernel.js';
import { shapeletOrders } from './shapeletOrders.js';
import { shapeletRunMeans } from './shapeletRunMeans.js';

export { shapeletOrders };

/**
 * Where the per-block work runs: 'auto' takes the WebAssembly kernel (shapeletKernel.ts) where the
 * engine has SIMD, 'javaScript' the twin it is tested against. Both give the same bits.
 */
export type ShapeletEngine = 'auto' | 'javaScript';

/**
 * Cartesian shapelets (Refregier 2003, MNRAS 338, 35, eqs. 1-3):
 * B_(n1,n2)(x, y; beta) = beta^-1 phi_n1(x / beta) phi_n2(y / beta), phi_k the Hermite functions,
 * for all n1 + n2 <= maxOrder, ordered by n1 + n2 then by decreasing n1 (see shapeletOrders).
 * The basis is orthonormal over the plane, so an amplitude is the flux-weighted overlap with the
 * image. The axes are those of the sky (no rotation); `scaleArcsec` is beta. One pass over each
 * block of points evaluates every order by recurrence (hermiteOrders), then each basis image is
 * a product of two rows of that block. `gaussianRow` gives phi_0 with Math.exp for the reference;
 * the fast twin passes one with a table-driven exp.
 */
export function shapelets(maxOrder: number, gaussianRow: GaussianRow = exactGaussianRow, engine: ShapeletEngine = 'auto'): LightProfile {
  if (!Number.isInteger(maxOrder) || maxOrder < 0) {
    throw new InputError(`shapelet maximum order: ${expectedFound('a whole number >= 0', maxOrder)}`);
  }
  const orders = shapeletOrders(maxOrder);
  const basisCount = orders.length;
  const firstOrders = Int32Array.from(orders, (order) => order[0]);
  const secondOrders = Int32Array.from(orders, (order) => order[1]);
  const orderCount = maxOrder + 1;
  const kernel = engine === 'auto' ? ShapeletKernel.create(maxOrder) : null;
  // Hermite functions of a block of points, order-major: alongX[k * HERMITE_BLOCK + i]. With the
  // kernel these are views on its memory, and only row 0 (phi_0) is written here.
  const alongX = kernel?.alongX ?? new Float64Array(orderCount * HERMITE_BLOCK);
  const alongY = kernel?.alongY ?? new Float64Array(orderCount * HERMITE_BLOCK);
  const u = kernel?.u ?? new Float64Array(HERMITE_BLOCK);
  const { raising, lowering } = hermiteRecurrence(maxOrder);
  // basisOf[n1 * orderCount + n2]: the basis index of (n1, n2).
  const basisOf = new Int32Array(orderCount * orderCount).fill(-1);
  orders.forEach(([n1, n2], k) => { basisOf[n1 * orderCount + n2] = k; });
  // Hermite functions of points from..from+size of (x, y) for the parameters at p[offset..].
  const hermite = (x: Float64Array, y: Float64Array, from: number, size: number, p: Float64Array, offset: number): void => {
    scaledPositions(x, from, size, p, offset, offset + 2, u);
    gaussianRow(u, size, alongX);
    if (kernel !== null) kernel.orders(0, size);
    else hermiteOrders(u, size, maxOrder, raising, lowering, alongX);
    scaledPositions(y, from, size, p, offset + 1, offset + 2, u);
    gaussianRow(u, size, alongY);
    if (kernel !== null) kernel.orders(1, size);
    else hermiteOrders(u, size, maxOrder, raising, lowering, alongY);
  };
  let runScratch = new Float64Array(0);
  // [1 / beta] for writeProducts, [1 / beta, 1 / run] for shapeletRunMeans: numbers in arrays,
  // not arguments, since V8 boxes a double passed to a call it does not inline.
  const basisFactor = new Float64Array(1);
  const runFactors = new Float64Array(2);
  const profile: LightProfile = {
    kind: 'shapelets',
    parameterNames: ['centerXArcsec', 'centerYArcsec', 'scaleArcsec'],
    basisCount,
    writeBasis(p, offset, x, y, n, out, outOffset, stride) {
      basisFactor[0] = 1 / p[offset + 2];
      for (let from = 0; from < n; from += HERMITE_BLOCK) {
        const size = Math.min(HERMITE_BLOCK, n - from);
        hermite(x, y, from, size, p, offset);
        if (kernel !== null) {
          kernel.scale[0] = basisFactor[0];
          kernel.writeProducts(size);
          copyProducts(kernel, basisCount, size, out, outOffset + from, stride);
          continue;
        }
        for (let k = 0; k < basisCount; k++) {
          writeProducts(alongX, firstOrders[k] * HERMITE_BLOCK, alongY, secondOrders[k] * HERMITE_BLOCK, basisFactor, size, out, outOffset + k * stride + from);
        }
      }
    },
    writeRunMeans(p, offset, x, y, runs, run, target, out, outOffset, stride) {
      if (run > HERMITE_BLOCK) {
        // Runs longer than a block: through writeBasis, one run at a time.
        if (runScratch.length < basisCount * run) runScratch = new Float64Array(basisCount * run);
        for (let t = 0; t < runs; t++) {
          profile.writeBasis(p, offset, x.subarray(t * run), y.subarray(t * run), run, runScratch, 0, run);
          for (let k = 0; k < basisCount; k++) {
            let sum = 0;
            for (let i = k * run; i < (k + 1) * run; i++) sum += runScratch[i];
            out[outOffset + k * stride + target[t]] = sum * (1 / run);
          }
        }
        return;
      }
      runFactors[0] = 1 / p[offset + 2];
      runFactors[1] = 1 / run;
      const perBlock = Math.floor(HERMITE_BLOCK / run);
      for (let first = 0; first < runs; first += perBlock) {
        const count = Math.min(perBlock, runs - first);
        hermite(x, y, first * run, count * run, p, offset);
        if (kernel !== null) {
          kernel.scale[0] = runFactors[0];
          kernel.runMeans(count, run);
          scatterSums(kernel.sums, basisCount, count, runFactors, target, first, out, outOffset, stride);
          continue;
        }
        for (let t = 0; t < count; t++) {
          shapeletRunMeans(alongX, t * run, alongY, t * run, maxOrder, basisOf, runFactors, run, out, outOffset + target[first + t], stride);
        }
      }
    },
  };
  return profile;
}

/** The kernel's basis images of a block (size points) into out[at + k * stride + i]. */
function copyProducts(kernel: ShapeletKernel, basisCount: number, size: number, out: Float64Array, at: number, stride: number): void {
  if (size === HERMITE_BLOCK) {
    for (let k = 0; k < basisCount; k++) out.set(kernel.productRows[k], at + k * stride);
    return;
  }
  const products = kernel.products;
  for (let k = 0; k < basisCount; k++) {
    const from = k * HERMITE_BLOCK, into = at + k * stride;
    for (let i = 0; i < size; i++) out[into + i] = products[from + i];
  }
}

/**
 * out[outOffset + k * stride + target[first + t]] = sums[t * basisCount + k] * inverseRun for the
 * count runs of a block (inverseRun = factors[1]): the kernel's run sums into the means.
 */
function scatterSums(
  sums: Float64Array, basisCount: number, count: number, factors: Float64Array, target: Int32Array, first: number,
  out: Float64Array, outOffset: number, stride: number,
): void {
  const inverseRun = factors[1];
  for (let t = 0; t < count; t++) {
    const into = outOffset + target[first + t];
    const from = t * basisCount;
    for (let k = 0; k < basisCount; k++) out[into + k * stride] = sums[from + k] * inverseRun;
  }
}

/** out[at + i] = scale * a[aAt + i] * b[bAt + i] for i < size, scale = factor[0]: one basis image over a block. */
function writeProducts(
  a: Float64Array, aAt: number, b: Float64Array, bAt: number, factor: Float64Array, size: number, out: Float64Array, at: number,
): void {
  const scale = factor[0];
  for (let i = 0; i < size; i++) out[at + i] = scale * a[aAt + i] * b[bAt + i];
}
