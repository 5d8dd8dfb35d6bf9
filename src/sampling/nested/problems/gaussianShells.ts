import { gammaln } from '../../../numeric/special/stdlibSpecial.js';
import { gaussLegendre } from '../../../numeric/quadrature/gaussLegendre.js';
import type { NestedProblem } from '../nestedProblem.js';

/** Shell radius r, width w, centre offset and prior half-width of Feroz & Hobson 2008, Section 6.2. */
export const shellRadius = 2;
export const shellWidth = 0.1;
export const shellCenterOffset = 3.5;
export const shellPriorHalfWidth = 6;

/**
 * Two Gaussian shells (Feroz & Hobson 2008, Section 6.2, eq. 32-33): L = circ(x; c1) + circ(x; c2)
 * with circ(x; c) = exp(-(|x - c| - r)^2 / (2 w^2)) / sqrt(2 pi w^2), centres at +-3.5 on the first
 * axis, uniform prior on [-6, 6]^dim.
 */
export function gaussianShellsProblem(dim: number): NestedProblem {
  const lnNormalisation = -0.5 * Math.log(2 * Math.PI * shellWidth * shellWidth);
  const inverseTwoWidthSquared = 1 / (2 * shellWidth * shellWidth);
  return {
    dim,
    physicalDim: dim,
    transform(unit, out) {
      for (let i = 0; i < dim; i++) out[i] = (2 * unit[i] - 1) * shellPriorHalfWidth;
    },
    logLikelihood(points, count) {
      const lnL = new Float64Array(count);
      for (let n = 0; n < count; n++) {
        const row = n * dim;
        let rest = 0;
        for (let i = 1; i < dim; i++) rest += points[row + i] * points[row + i];
        const a = points[row] - shellCenterOffset;
        const b = points[row] + shellCenterOffset;
        const offsetA = Math.sqrt(a * a + rest) - shellRadius;
        const offsetB = Math.sqrt(b * b + rest) - shellRadius;
        const lnA = -offsetA * offsetA * inverseTwoWidthSquared;
        const lnB = -offsetB * offsetB * inverseTwoWidthSquared;
        const largest = Math.max(lnA, lnB);
        lnL[n] = lnNormalisation + largest + Math.log(Math.exp(lnA - largest) + Math.exp(lnB - largest));
      }
      return lnL;
    },
  };
}

/**
 * ln Z of the two shells by a radial quadrature, exact for separated shells well inside the box:
 * Z = 2 S_{D-1} integral_0^inf rho^{D-1} circ(rho) d rho / 12^D, S_{D-1} = 2 pi^{D/2} / Gamma(D/2)
 * the area of the unit sphere, the integral by 64-point Gauss-Legendre panels of width w/4 over
 * r +- 12 w (the Gaussian beyond 12 w is below e^{-72}). The truncation by the box (the shells'
 * outer edge is 5 w inside it) and the overlap of the two shells' tails are below 1e-6 in Z.
 */
export function gaussianShellsLnEvidence(dim: number): number {
  const { nodes, weights } = gaussLegendre(64);
  const lower = Math.max(0, shellRadius - 12 * shellWidth);
  const upper = shellRadius + 12 * shellWidth;
  const panels = Math.ceil((upper - lower) / (shellWidth / 4));
  const panelWidth = (upper - lower) / panels;
  // Integrand scaled by r^{-(D-1)} to avoid overflow in high dimensions.
  let integral = 0;
  for (let p = 0; p < panels; p++) {
    const middle = lower + (p + 0.5) * panelWidth;
    for (let q = 0; q < nodes.length; q++) {
      const rho = middle + 0.5 * panelWidth * nodes[q];
      const offset = rho - shellRadius;
      const value =
        Math.exp((dim - 1) * Math.log(rho / shellRadius) - (offset * offset) / (2 * shellWidth * shellWidth)) /
        Math.sqrt(2 * Math.PI * shellWidth * shellWidth);
      integral += 0.5 * panelWidth * weights[q] * value;
    }
  }
  const lnSphereArea = Math.log(2) + 0.5 * dim * Math.log(Math.PI) - gammaln(0.5 * dim);
  return Math.log(2) + lnSphereArea + Math.log(integral) + (dim - 1) * Math.log(shellRadius) - dim * Math.log(2 * shellPriorHalfWidth);
}
