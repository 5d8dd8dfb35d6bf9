// Test helper: deflection of any homoeoidal (elliptical) surface density by direct numerical
// integration, the reference the profile tests compare against.
import { gaussLegendre, integrateGraded, type GaussRule } from './gaussLegendre.js';

/**
 * Deflection of kappa(x', y') = kappaOfXi(xi) with xi^2 = q x'^2 + y'^2 / q (arcsift's
 * intermediate-axis elliptical radius), major axis at positionAngleDeg, centred at (cx, cy).
 * Implements the one-dimensional integrals for homoeoidal densities (Schramm 1990, A&A 231, 19;
 * in the form of Keeton 2001, astro-ph/0102341, sec. 2; the papers were not reachable here, so
 * the form is checked at q = 1 against the SIS and by the tests' agreement with closed forms):
 *   alpha_x = q x J0,  alpha_y = q y J1,
 *   Jn = int_0^1 kappa(xiK(u)) / (1 - (1 - q^2) u)^(n + 1/2) du,
 *   xiK(u)^2 = u (x^2 + y^2 / (1 - (1 - q^2) u)),
 * where Keeton's radius is xiK^2 = x^2 + y^2/q^2, i.e. xi = sqrt(q) xiK.
 * `centralSlope` t says kappa ~ xi^-t near the centre; the substitution u = w^(2/(2-t)) makes
 * the integrand bounded, and graded Gauss-Legendre panels resolve the rest.
 */
export function homoeoidDeflection(
  kappaOfXi: (xi: number) => number, q: number, positionAngleDeg: number,
  cx: number, cy: number, centralSlope: number, x: number, y: number,
  rule: GaussRule = defaultRule,
): [number, number] {
  const angle = positionAngleDeg * Math.PI / 180;
  const c = Math.cos(angle), s = Math.sin(angle);
  const dx = x - cx, dy = y - cy;
  const xr = c * dx + s * dy, yr = -s * dx + c * dy;
  const power = 2 / (2 - centralSlope);
  const e2 = 1 - q * q, rootQ = Math.sqrt(q);
  const integrand = (order: 0 | 1) => (w: number): number => {
    if (w === 0) return 0;
    const u = Math.pow(w, power);
    const du = power * u / w;
    const denominator = 1 - e2 * u;
    const xiK = Math.sqrt(u * (xr * xr + yr * yr / denominator));
    return du * kappaOfXi(rootQ * xiK) / Math.pow(denominator, order + 0.5);
  };
  const j0 = integrateGraded(integrand(0), rule);
  const j1 = integrateGraded(integrand(1), rule);
  const axr = q * xr * j0, ayr = q * yr * j1;
  return [c * axr - s * ayr, s * axr + c * ayr];
}

const defaultRule = gaussLegendre(24);
