import type { MassProfile } from '../../lens/massProfile.js';
import { truncatedNfw } from './truncatedNfw.js';
import { nfwProjectedMassShape, nfwProjectionF, nfwSmallestRadiusRatio } from '../../lens/darkHalo/nfwProjection.js';
import { fastAtan } from '../../numeric/elementary/fastAtan.js';
import { fastLog } from '../../numeric/elementary/fastLog.js';
import { passScratch } from '../../numeric/elementary/passScratch.js';
import { TruncatedNfwDeflectionTable } from './truncatedNfwDeflectionTable.js';

/** Calls with at least this many points build the table for a new truncation ratio (about 0.1 ms). */
const TABLE_MINIMUM_POINTS = 2048;
const table = new TruncatedNfwDeflectionTable();

/** As in nfwProjection.ts: |x^2 - 1| below which F comes from its series about x = 1. */
const SERIES_HALF_WIDTH = 0.02;

/**
 * The truncated NFW of src/perturber/truncatedNfw.ts (Baltz, Marshall & Oguri 2009, appendix),
 * same parameters. Its deflection is 4 kappa_s P G(u^2) (theta - centre) with G = bracket/u^2 a
 * function of the truncation ratio alone: for calls of at least TABLE_MINIMUM_POINTS points, or
 * when the table already holds this ratio, G comes from TruncatedNfwDeflectionTable
 * (interpolation of truncatedNfw.ts's own values; within theta_s/128 of the centre and beyond
 * 256 theta_s, where the table ends, the plain formula). Smaller calls with a new ratio use the
 * same formulas and branches as truncatedNfw.ts with its logarithms by fastLog (absolute error
 * < 4e-16 (1 + |ln|)) and, away from x = 1, F(x) of nfwProjection.ts (Bartelmann 1996) with
 * fastLog and fastAtan (relative error < 1e-15); from x = 1/2 on no term cancels, so the
 * deflection keeps a relative error of a few 1e-15 times (tau^2 + 1); below x = 1/2 the plain
 * h(x) and log1p are kept. Both paths are tested against truncatedNfw.ts to 1e-12 relative in
 * test/perturber/truncatedNfw/fastTruncatedNfw.test.ts (a 1e9 solar-mass subhalo deflects by < 0.1 arcsec, so
 * < 1e-13 arcsec). Convergence is the plain one.
 */
export const fastTruncatedNfw: MassProfile = {
  kind: truncatedNfw.kind,
  parameterNames: truncatedNfw.parameterNames,
  addConvergence: truncatedNfw.addConvergence,
  addDeflection(p, offset, x, y, n, alphaX, alphaY) {
    const kappaS = p[offset], thetaS = p[offset + 1], tau = p[offset + 2];
    const cx = p[offset + 3], cy = p[offset + 4];
    const invThetaS = 1 / thetaS, tau2 = tau * tau, tau2m1 = (tau - 1) * (tau + 1), invTau = 1 / tau;
    const logTau = Math.log(tau), scale = (4 * kappaS * tau2) / ((tau2 + 1) * (tau2 + 1));
    if (table.truncationRatio === tau || n >= TABLE_MINIMUM_POINTS) {
      if (table.truncationRatio !== tau) table.build(tau);
      // Passes, each a function of its own (see latticeLevel in adaptivePixelMeans.ts).
      const factors = passScratch(0, n);
      writeScaledSquaredRadii(invThetaS * invThetaS, cx, cy, x, y, n, factors);
      table.lookupInPlace(factors, n);
      addRadialDeflection(scale, tau, invThetaS, cx, cy, x, y, n, factors, alphaX, alphaY);
      return;
    }
    // In passes (see passScratch.ts): u and 1/(tau + R); ln(u/(tau + R)); F(u); the sum.
    const radius = passScratch(0, n), inverse = passScratch(1, n);
    const logRatio = passScratch(2, n), projection = passScratch(3, n);
    for (let i = 0; i < n; i++) {
      const dx = x[i] - cx, dy = y[i] - cy;
      const u = Math.max(Math.sqrt(dx * dx + dy * dy) * invThetaS, nfwSmallestRadiusRatio);
      const inverseTauPlusR = 1 / (tau + Math.sqrt(tau2 + u * u));
      radius[i] = u;
      inverse[i] = inverseTauPlusR;
      logRatio[i] = u * inverseTauPlusR;
    }
    for (let i = 0; i < n; i++) logRatio[i] = fastLog(logRatio[i]);
    // F(u) as nfwProjectionF: ln((1 + s)/u)/s below 1, atan(t)/t above, the series near 1.
    for (let i = 0; i < n; i++) {
      const u = radius[i];
      const w = (u - 1) * (u + 1);
      if (w < -SERIES_HALF_WIDTH) {
        const s = Math.sqrt(-w);
        projection[i] = fastLog((1 + s) / u) / s;
      } else if (w > SERIES_HALF_WIDTH) {
        const t = Math.sqrt(w);
        projection[i] = fastAtan(t) / t;
      } else {
        projection[i] = nfwProjectionF(u);
      }
    }
    for (let i = 0; i < n; i++) {
      const u = radius[i], f = projection[i], l = logRatio[i], inverseTauPlusR = inverse[i];
      const u2 = u * u;
      const d = u2 * invTau * inverseTauPlusR;
      const logarithms = u < 0.5
        ? nfwProjectedMassShape(u) - Math.log1p(0.5 * d) + d * l
        : f + logTau + (1 + d) * l;
      const bracket = tau2m1 * logarithms + 2 * u2 * f - Math.PI * u2 * inverseTauPlusR;
      // alpha / |theta - centre| = 4 kappa_s P bracket / u^2
      const factor = (scale * bracket) / u2;
      alphaX[i] += factor * (x[i] - cx);
      alphaY[i] += factor * (y[i] - cy);
    }
  },
};

/** bracket(u)/u^2 of truncatedNfw.ts at one point, with Math functions (points outside the table). */
function radialFactor(radiusRatio: number, tau: number): number {
  const u = Math.max(radiusRatio, nfwSmallestRadiusRatio);
  const u2 = u * u, tau2 = tau * tau;
  const tauPlusR = tau + Math.sqrt(tau2 + u2);
  const d = u2 / tau / tauPlusR;
  const logRatio = Math.log(u / tauPlusR);
  const f = nfwProjectionF(u);
  const logarithms = u < 0.5
    ? nfwProjectedMassShape(u) - Math.log1p(0.5 * d) + d * logRatio
    : f + Math.log(tau) + (1 + d) * logRatio;
  return ((tau - 1) * (tau + 1) * logarithms + 2 * u2 * f - (Math.PI * u2) / tauPlusR) / u2;
}

/** v_i = |theta_i - centre|^2 / theta_s^2 for i < n (invThetaS2 = 1/theta_s^2). */
function writeScaledSquaredRadii(
  invThetaS2: number, cx: number, cy: number, x: Float64Array, y: Float64Array, n: number, v: Float64Array,
): void {
  for (let i = 0; i < n; i++) {
    const dx = x[i] - cx, dy = y[i] - cy;
    v[i] = (dx * dx + dy * dy) * invThetaS2;
  }
}

/**
 * alpha += 4 kappa_s P G (theta - centre) (scale = 4 kappa_s P) with G from the table
 * (`factors`), or directly where the table gave NaN (outside it).
 */
function addRadialDeflection(
  scale: number, tau: number, invThetaS: number, cx: number, cy: number, x: Float64Array, y: Float64Array, n: number,
  factors: Float64Array, alphaX: Float64Array, alphaY: Float64Array,
): void {
  for (let i = 0; i < n; i++) {
    const dx = x[i] - cx, dy = y[i] - cy;
    let g = factors[i];
    // Outside the table (within theta_s/128 of the centre or beyond 256 theta_s): directly.
    if (g !== g) g = radialFactor(Math.sqrt(dx * dx + dy * dy) * invThetaS, tau);
    alphaX[i] += scale * g * dx;
    alphaY[i] += scale * g * dy;
  }
}
