import { InputError, expectedFound } from '../errors.js';
import type { LightProfile } from './lightProfile.js';
import { hermiteFunctions } from './hermiteFunctions.js';

/** The (n1, n2) orders of basis function k of `shapelets(maxOrder)`, in basis order. */
export function shapeletOrders(maxOrder: number): Array<readonly [number, number]> {
  const orders: Array<readonly [number, number]> = [];
  for (let total = 0; total <= maxOrder; total++) {
    for (let n1 = total; n1 >= 0; n1--) orders.push([n1, total - n1]);
  }
  return orders;
}

/**
 * Cartesian shapelets (Refregier 2003, MNRAS 338, 35, eqs. 1-3):
 * B_(n1,n2)(x, y; beta) = beta^-1 phi_n1(x / beta) phi_n2(y / beta), phi_k the Hermite functions,
 * for all n1 + n2 <= maxOrder, ordered by n1 + n2 then by decreasing n1 (see shapeletOrders).
 * The basis is orthonormal over the plane, so an amplitude is the flux-weighted overlap with the
 * image. The axes are those of the sky (no rotation); `scaleArcsec` is beta.
 */
export function shapelets(maxOrder: number): LightProfile {
  if (!Number.isInteger(maxOrder) || maxOrder < 0) {
    throw new InputError(`shapelet maximum order: ${expectedFound('a whole number >= 0', maxOrder)}`);
  }
  const orders = shapeletOrders(maxOrder);
  const basisCount = orders.length;
  const firstOrders = Int32Array.from(orders, (order) => order[0]);
  const secondOrders = Int32Array.from(orders, (order) => order[1]);
  const alongX = new Float64Array(maxOrder + 1);
  const alongY = new Float64Array(maxOrder + 1);
  return {
    kind: 'shapelets',
    parameterNames: ['centerXArcsec', 'centerYArcsec', 'scaleArcsec'],
    basisCount,
    writeBasis(p, offset, x, y, n, out, outOffset, stride) {
      const centerX = p[offset];
      const centerY = p[offset + 1];
      const inverseScale = 1 / p[offset + 2];
      for (let i = 0; i < n; i++) {
        hermiteFunctions((x[i] - centerX) * inverseScale, maxOrder, alongX);
        hermiteFunctions((y[i] - centerY) * inverseScale, maxOrder, alongY);
        let index = outOffset + i;
        for (let k = 0; k < basisCount; k++) {
          out[index] = inverseScale * alongX[firstOrders[k]] * alongY[secondOrders[k]];
          index += stride;
        }
      }
    },
  };
}
