import { zeroedDeflectionScratch } from '../deflectionScratch.js';
import type { MassProfile } from '../massProfile.js';

/**
 * Singular isothermal ellipsoid with an optional core.
 *
 * Normalisation (intermediate-axis convention): in the frame x' along the major axis,
 *   kappa = (thetaE / 2) / sqrt(xi^2 + s^2),   xi^2 = q x'^2 + y'^2 / q,   0 < q <= 1,
 * with thetaE = einsteinRadiusArcsec and s = coreRadiusArcsec. Without a core the tangential
 * critical curve is the ellipse xi = thetaE (semi-axes thetaE/sqrt(q) along the major axis and
 * thetaE*sqrt(q) along the minor axis, geometric mean thetaE); it encloses mean convergence 1.
 * With q = 1 and s = 0 this is the SIS, |alpha| = thetaE everywhere. The core radius is added to
 * xi in quadrature, so s is measured in the same geometric-mean sense as thetaE.
 * The major axis lies at positionAngleDeg, counter-clockwise from +x. axisRatio > 1 is invalid
 * (checked at config loading). At the centre of a coreless profile the deflection is set to 0
 * and kappa is +Infinity.
 *
 * Written as kappa = (b/2) / sqrt(q^2 (sK^2 + x'^2) + y'^2) with b = thetaE sqrt(q) and
 * sK = s / sqrt(q), the deflection in the major-axis frame is
 *   alpha_x' = (b/e) atan(e x' / (w + sK)),  alpha_y' = (b/e) atanh(e y' / (w + q^2 sK)),
 *   e = sqrt(1 - q^2),  w = sqrt(q^2 (sK^2 + x'^2) + y'^2).
 * Cost per point: one sqrt, one atan, one atanh (sin and cos of the angle are hoisted).
 * The reference formula; its fast twin, fastIsothermalEllipsoid.ts beside it, is what the forward model runs
 * (the two are compared in test/lens/isothermalEllipsoid/fastIsothermalEllipsoid.test.ts).
 */
export const isothermalEllipsoid: MassProfile = {
  kind: 'isothermalEllipsoid',
  parameterNames: [
    'einsteinRadiusArcsec', 'axisRatio', 'positionAngleDeg',
    'centerXArcsec', 'centerYArcsec', 'coreRadiusArcsec',
  ],

  // Kormann, Schneider & Bartelmann 1994 (A&A 284, 285) deflection of the SIE; Keeton 2001
  // (astro-ph/0102341) eqs. for the softened isothermal ellipsoid.
  addDeflection(p, offset, x, y, n, alphaX, alphaY) {
    const g = readGeometry(p, offset);
    const { cos, sin, cx, cy, q, sK, qqsK, qs2 } = g;
    const scale = g.b;
    const e2 = (1 - q) * (1 + q);
    // Near q = 1 (e2 < SERIES_BELOW) the ratios atan(z)/z = 1 - w/3 + w^2/5 and
    // atanh(z)/z = 1 + w/3 + w^2/5, w = z^2 <= e2 / q^2 < 1.01e-6, replace the 0/0 form; the
    // first omitted term, w^3/7, is below 2e-19 relative. The choice is fixed per call.
    const nearRound = e2 < SERIES_BELOW;
    const e = Math.sqrt(e2);
    const scaleOverE = nearRound ? 0 : scale / e;
    for (let i = 0; i < n; i++) {
      const dx = x[i] - cx, dy = y[i] - cy;
      const xr = cos * dx + sin * dy, yr = cos * dy - sin * dx;
      const psi = Math.sqrt(q * q * xr * xr + yr * yr + qs2);
      const dnx = psi + sK;
      if (dnx === 0) continue;
      const ux = xr / dnx, uy = yr / (psi + qqsK);
      let ax: number, ay: number;
      if (nearRound) {
        const wx = e2 * ux * ux, wy = e2 * uy * uy;
        ax = scale * ux * (1 - wx * (1 / 3 - wx / 5));
        ay = scale * uy * (1 + wy * (1 / 3 + wy / 5));
      } else {
        ax = scaleOverE * Math.atan(e * ux);
        ay = scaleOverE * Math.atanh(e * uy);
      }
      alphaX[i] += cos * ax - sin * ay;
      alphaY[i] += sin * ax + cos * ay;
    }
  },

  // Definition above (Kormann, Schneider & Bartelmann 1994 eq. for the SIE surface density,
  // softened as in Keeton 2001).
  addConvergence(p, offset, x, y, n, kappa) {
    const { cos, sin, cx, cy, q, thetaE, s } = readGeometry(p, offset);
    const half = 0.5 * thetaE, s2 = s * s, invQ = 1 / q;
    for (let i = 0; i < n; i++) {
      const dx = x[i] - cx, dy = y[i] - cy;
      const xr = cos * dx + sin * dy, yr = cos * dy - sin * dx;
      kappa[i] += half / Math.sqrt(q * xr * xr + invQ * yr * yr + s2);
    }
  },

  // The cored isothermal sphere rho = A / (r^2 + s^2) projects to kappa = (thetaE/2) / sqrt(R^2 + s^2)
  // for A = Sigma_crit thetaE / (2 pi) (the line-of-sight integral of 1/(a^2 + z^2); at s = 0 the
  // singular isothermal sphere, Binney & Tremaine 2008, sec. 4.3.3(b)); its mass within r is
  // 4 pi A (r - s atan(r / s)) = 2 thetaE (r - s atan(r / s)) Sigma_crit arcsec^2, read on the
  // circularised radius (an ellipse of area pi R^2 holds the round profile's mass within R).
  sphericalMassWithin(p, offset, radiusArcsec) {
    const thetaE = p[offset], s = p[offset + 5];
    return 2 * thetaE * (s > 0 ? radiusArcsec - s * Math.atan(radiusArcsec / s) : radiusArcsec);
  },

  // Keeton 2001 potential of the softened isothermal ellipsoid:
  // psi = x alpha_x + y alpha_y - b sK ln sqrt((w + sK)^2 + (1 - q^2) x^2) + b sK ln((1 + q) sK),
  // w = sqrt(q^2 (sK^2 + x^2) + y^2); the constant makes psi(0) = 0 when sK > 0.
  addPotential(p, offset, x, y, n, psi) {
    const g = readGeometry(p, offset);
    const { cos, sin, cx, cy, q, sK, qs2 } = g;
    const e2 = (1 - q) * (1 + q);
    const { alphaX, alphaY } = zeroedDeflectionScratch(n);
    isothermalEllipsoid.addDeflection(p, offset, x, y, n, alphaX, alphaY);
    const bsK = g.b * sK;
    const constant = sK > 0 ? bsK * Math.log((1 + q) * sK) : 0;
    for (let i = 0; i < n; i++) {
      const dx = x[i] - cx, dy = y[i] - cy;
      let value = dx * alphaX[i] + dy * alphaY[i];
      if (sK > 0) {
        const xr = cos * dx + sin * dy, yr = cos * dy - sin * dx;
        const w = Math.sqrt(q * q * xr * xr + yr * yr + qs2) + sK;
        value += constant - 0.5 * bsK * Math.log(w * w + e2 * xr * xr);
      }
      psi[i] += value;
    }
  },
};

/** Below this value of 1 - q^2 the deflection uses the Taylor series of atan(z)/z, atanh(z)/z. */
const SERIES_BELOW = 1e-6;

const DEG = Math.PI / 180;

/** The parameters of one call, with the derived constants; filled in place (no allocation). */
const geometry = {
  thetaE: 0, q: 1, s: 0, cos: 1, sin: 0, cx: 0, cy: 0,
  /** b = thetaE sqrt(q). */
  b: 0,
  /** Core sK = s / sqrt(q), then q^2 sK, and q^2 sK^2 = q s^2. */
  sK: 0, qqsK: 0, qs2: 0,
};

function readGeometry(p: Float64Array, offset: number): typeof geometry {
  const g = geometry;
  const angle = p[offset + 2] * DEG;
  g.thetaE = p[offset];
  g.q = p[offset + 1];
  g.cos = Math.cos(angle);
  g.sin = Math.sin(angle);
  g.cx = p[offset + 3];
  g.cy = p[offset + 4];
  g.s = p[offset + 5];
  const rootQ = Math.sqrt(g.q);
  g.b = g.thetaE * rootQ;
  g.sK = g.s / rootQ;
  g.qqsK = g.q * g.q * g.sK;
  g.qs2 = g.q * g.s * g.s;
  return g;
}
