import type { MassTerm } from './massTerm.js';

/**
 * The deflection alpha(theta) of all mass terms at n image-plane points, written (not added)
 * into alphaX, alphaY: the sum of the terms' deflections (the deflection is linear in the surface
 * density; e.g. Schneider, Ehlers & Falco 1992, ch. 5).
 */
export function totalDeflection(
  massTerms: readonly MassTerm[], p: Float64Array,
  x: Float64Array, y: Float64Array, n: number, alphaX: Float64Array, alphaY: Float64Array,
): void {
  alphaX.fill(0, 0, n);
  alphaY.fill(0, 0, n);
  for (let t = 0; t < massTerms.length; t++) massTerms[t].profile.addDeflection(p, massTerms[t].offset, x, y, n, alphaX, alphaY);
}

/**
 * The lens equation beta = theta - alpha(theta) (e.g. Schneider, Ehlers & Falco 1992, ch. 5) for n
 * rays: deflections into alphaX, alphaY and source-plane positions into betaX, betaY. Each term
 * is evaluated by its `profile`; pass terms whose profile is the fast evaluation where wanted.
 */
export function traceRays(
  massTerms: readonly MassTerm[], p: Float64Array, x: Float64Array, y: Float64Array, n: number,
  alphaX: Float64Array, alphaY: Float64Array, betaX: Float64Array, betaY: Float64Array,
): void {
  totalDeflection(massTerms, p, x, y, n, alphaX, alphaY);
  for (let i = 0; i < n; i++) {
    betaX[i] = x[i] - alphaX[i];
    betaY[i] = y[i] - alphaY[i];
  }
}
