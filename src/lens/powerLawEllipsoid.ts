import { gamma as gammaFunction } from '../numeric/special/stdlibSpecial.js';
import { zeroedDeflectionScratch } from './deflectionScratch.js';
import type { MassProfile } from './massProfile.js';

/**
 * Elliptical power law with free slope.
 *
 * Normalisation (the same intermediate-axis convention as isothermalEllipsoid): in the frame
 * x' along the major axis,
 *   kappa = ((3 - gamma) / 2) (thetaE / xi)^(gamma - 1),   xi^2 = q x'^2 + y'^2 / q,
 * with thetaE = einsteinRadiusArcsec, gamma = slope (the 3-D density slope; 2 is isothermal,
 * valid 1 < gamma < 3) and 0 < q <= 1. The ellipse xi = thetaE (area pi thetaE^2) encloses mean
 * convergence 1 for every slope and axis ratio; at gamma = 2 the profile is the coreless
 * isothermalEllipsoid. The major axis lies at positionAngleDeg, counter-clockwise from +x.
 * At the centre the deflection is set to 0 (it is 0 or divergent there) and kappa is +Infinity.
 *
 * Deflection (Tessore & Metcalf 2015, A&A 580, A79), with t = gamma - 1,
 * b = thetaE sqrt(q), R = sqrt(q^2 x'^2 + y'^2) and the elliptical angle e^(i phi) = (q x' + i y')/R:
 *   alpha_x' + i alpha_y' = (2 b / (1 + q)) (b / R)^(t - 1) Omega(phi),
 *   Omega = sum_n Omega_n,  Omega_0 = e^(i phi),
 *   Omega_n = -f (2n - (2 - t)) / (2n + (2 - t)) e^(2 i phi) Omega_(n-1),  f = (1 - q)/(1 + q).
 * Every ratio has modulus below f, so the tail after Omega_n is at most |Omega_n| f / (1 - f);
 * the sum stops once that bound is below SERIES_RELATIVE_ACCURACY = 1e-12 times |partial sum|.
 * Cost per point: one sqrt, one exp and one log, and a few complex multiplications per series term
 * (about 13 terms at q = 0.7, 22 at q = 0.5).
 */
export const powerLawEllipsoid: MassProfile = {
  kind: 'powerLawEllipsoid',
  parameterNames: [
    'einsteinRadiusArcsec', 'slope', 'axisRatio', 'positionAngleDeg',
    'centerXArcsec', 'centerYArcsec',
  ],

  // Tessore & Metcalf 2015 (A&A 580, A79): hypergeometric deflection summed by its recurrence.
  addDeflection(p, offset, x, y, n, alphaX, alphaY) {
    const g = readGeometry(p, offset);
    const { cos, sin, cx, cy, q, b, t } = g;
    const f = (1 - q) / (1 + q);
    const termCount = fillRecurrence(f, t, q);
    const ratios = recurrence;
    // Stop when |term|^2 * stopFactor <= |sum|^2, i.e. |term| f/(1-f) <= accuracy |sum|.
    const bound = f / ((1 - f) * SERIES_RELATIVE_ACCURACY);
    const stopFactor = bound * bound;
    const amplitude = 2 * b / (1 + q), exponent = t - 1;
    for (let i = 0; i < n; i++) {
      const dx = x[i] - cx, dy = y[i] - cy;
      const xr = cos * dx + sin * dy, yr = cos * dy - sin * dx;
      const R = Math.sqrt(q * q * xr * xr + yr * yr);
      if (R === 0) continue;
      const c = q * xr / R, s = yr / R;
      const twiceR = c * c - s * s, twiceI = 2 * c * s;
      let termR = c, termI = s, sumR = c, sumI = s;
      for (let k = 1; k < termCount && (termR * termR + termI * termI) * stopFactor > sumR * sumR + sumI * sumI; k++) {
        const ratio = ratios[k];
        const nextR = ratio * (termR * twiceR - termI * twiceI);
        termI = ratio * (termR * twiceI + termI * twiceR);
        termR = nextR;
        sumR += termR;
        sumI += termI;
      }
      // exp(e ln x) instead of Math.pow: same accuracy (~1e-16 |e ln x| relative), faster in V8.
      const scale = amplitude * Math.exp(exponent * Math.log(b / R));
      const ax = scale * sumR, ay = scale * sumI;
      alphaX[i] += cos * ax - sin * ay;
      alphaY[i] += sin * ax + cos * ay;
    }
  },

  // Tessore & Metcalf 2015 convergence kappa = ((2 - t)/2) (b/R)^t, the definition above.
  addConvergence(p, offset, x, y, n, kappa) {
    const { cos, sin, cx, cy, q, b, t } = readGeometry(p, offset);
    const amplitude = 0.5 * (2 - t), halfT = 0.5 * t, b2 = b * b;
    for (let i = 0; i < n; i++) {
      const dx = x[i] - cx, dy = y[i] - cy;
      const xr = cos * dx + sin * dy, yr = cos * dy - sin * dx;
      kappa[i] += amplitude * Math.exp(halfT * Math.log(b2 / (q * q * xr * xr + yr * yr)));
    }
  },

  // The sphere rho = rho_0 r^-gamma projects to Sigma = rho_0 B(1/2, (gamma - 1)/2) R^(1 - gamma) (the
  // line-of-sight integral; B the beta function), so with M_2D(<R) = pi thetaE^(gamma - 1) R^(3 - gamma)
  // (the convergence above) its mass within r is M_2D(<r) 2 / B(1/2, (gamma - 1)/2)
  // = pi thetaE^(gamma - 1) r^(3 - gamma) 2 Gamma(gamma/2) / (sqrt(pi) Gamma((gamma - 1)/2)) in
  // Sigma_crit arcsec^2 (2/pi of M_2D at gamma = 2, the isothermal sphere), read on the circularised radius.
  sphericalMassWithin(p, offset, radiusArcsec) {
    const thetaE = p[offset], gamma = p[offset + 1];
    const ratio = (2 * gammaFunction(0.5 * gamma)) / (Math.sqrt(Math.PI) * gammaFunction(0.5 * (gamma - 1)));
    return Math.PI * Math.pow(thetaE, gamma - 1) * Math.pow(radiusArcsec, 3 - gamma) * ratio;
  },

  // Tessore & Metcalf 2015 potential: psi = (x alpha_x + y alpha_y) / (2 - t), the potential being
  // homogeneous of degree 2 - t (Euler's theorem).
  addPotential(p, offset, x, y, n, psi) {
    const { cx, cy, t } = readGeometry(p, offset);
    const { alphaX, alphaY } = zeroedDeflectionScratch(n);
    powerLawEllipsoid.addDeflection(p, offset, x, y, n, alphaX, alphaY);
    const inverse = 1 / (2 - t);
    for (let i = 0; i < n; i++) {
      psi[i] += inverse * ((x[i] - cx) * alphaX[i] + (y[i] - cy) * alphaY[i]);
    }
  },
};

/** Relative accuracy at which the series for Omega is truncated (bound on the dropped tail). */
const SERIES_RELATIVE_ACCURACY = 1e-12;

/**
 * The recurrence ratios -f (2k - 2 + t)/(2k + 2 - t), k >= 1, of the last call; grown on demand.
 * Entry 0 is unused.
 */
let recurrence = new Float64Array(64);

/**
 * Fills the recurrence ratios and returns how many terms a point may use at most: enough that
 * f^count < 1e-3 * accuracy * q, far beyond where the per-point stopping rule ends the sum
 * (|Omega| is of order q or more), so the cap only guards against a runaway loop.
 */
function fillRecurrence(f: number, t: number, q: number): number {
  const count = f > 0
    ? Math.ceil(Math.log(1e-3 * SERIES_RELATIVE_ACCURACY * q) / Math.log(f)) + 1
    : 1;
  if (recurrence.length < count) recurrence = new Float64Array(count);
  for (let k = 1; k < count; k++) recurrence[k] = -f * (2 * k - 2 + t) / (2 * k + 2 - t);
  return count;
}

const DEG = Math.PI / 180;

/** The parameters of one call, with the derived constants; filled in place (no allocation). */
const geometry = { t: 1, q: 1, cos: 1, sin: 0, cx: 0, cy: 0, b: 0 };

function readGeometry(p: Float64Array, offset: number): typeof geometry {
  const g = geometry;
  const angle = p[offset + 3] * DEG;
  g.t = p[offset + 1] - 1;
  g.q = p[offset + 2];
  g.cos = Math.cos(angle);
  g.sin = Math.sin(angle);
  g.cx = p[offset + 4];
  g.cy = p[offset + 5];
  g.b = p[offset] * Math.sqrt(g.q);
  return g;
}
