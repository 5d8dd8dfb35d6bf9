import type { MassProfile } from '../massProfile.js';
import { isothermalEllipsoid } from './isothermalEllipsoid.js';
import { fastAtanhInPlace, fastAtanInPlace } from '../../numeric/elementary/fastAtan.js';
import { passScratch } from '../../numeric/elementary/passScratch.js';

const DEG = Math.PI / 180;
/** As in isothermalEllipsoid.ts: below this 1 - q^2 the deflection uses the series of atan(z)/z, atanh(z)/z. */
const SERIES_BELOW = 1e-6;

/**
 * The singular isothermal ellipsoid of src/lens/isothermalEllipsoid.ts (Kormann, Schneider &
 * Bartelmann 1994; Keeton 2001 for the core), same parameters, same formulas, with the
 * deflection's atan and atanh from fastAtan.ts. The atanh argument z = e u_y has |z| <= e: for
 * e <= 7/8 fastAtanh errs below 1e-15 relative, so the deflection below (b/e) 1e-15 artanh e
 * < 1.6e-15 b; beyond (by fastLog) below 2e-16 (1 + 2 artanh e) plus a rounding absolute, the
 * deflection below 2 b 2e-16 (2 + 2 artanh e) < 3e-15 b for q >= 0.1: under 1e-12 arcsec for
 * any Einstein radius below 300 arcsec (tested against isothermalEllipsoid.ts in
 * test/lens/isothermalEllipsoid/fastIsothermalEllipsoid.test.ts). Convergence and potential are the plain ones.
 */
export const fastIsothermalEllipsoid: MassProfile = {
  kind: isothermalEllipsoid.kind,
  parameterNames: isothermalEllipsoid.parameterNames,
  addConvergence: isothermalEllipsoid.addConvergence,
  addPotential: isothermalEllipsoid.addPotential,
  sphericalMassWithin: isothermalEllipsoid.sphericalMassWithin,
  addDeflection(p, offset, x, y, n, alphaX, alphaY) {
    const angle = p[offset + 2] * DEG;
    const thetaE = p[offset], q = p[offset + 1];
    const cos = Math.cos(angle), sin = Math.sin(angle);
    const cx = p[offset + 3], cy = p[offset + 4], s = p[offset + 5];
    const rootQ = Math.sqrt(q);
    const scale = thetaE * rootQ;
    const sK = s / rootQ, qqsK = q * q * sK, qs2 = q * s * s;
    const e2 = (1 - q) * (1 + q);
    const nearRound = e2 < SERIES_BELOW;
    const e = Math.sqrt(e2);
    const scaleOverE = nearRound ? 0 : scale / e;
    if (nearRound) {
      // Without a core both denominators are psi: one division per point instead of two.
      const coreless = sK === 0;
      for (let i = 0; i < n; i++) {
        const dx = x[i] - cx, dy = y[i] - cy;
        const xr = cos * dx + sin * dy, yr = cos * dy - sin * dx;
        const psi = Math.sqrt(q * q * xr * xr + yr * yr + qs2);
        const dnx = psi + sK;
        if (dnx === 0) continue;
        const inverse = 1 / dnx;
        const ux = xr * inverse, uy = coreless ? yr * inverse : yr / (psi + qqsK);
        const wx = e2 * ux * ux, wy = e2 * uy * uy;
        const ax = scale * ux * (1 - wx * (1 / 3 - wx / 5));
        const ay = scale * uy * (1 + wy * (1 / 3 + wy / 5));
        alphaX[i] += cos * ax - sin * ay;
        alphaY[i] += sin * ax + cos * ay;
      }
      return;
    }
    // In passes (see passScratch.ts), each a function of its own (a loop compiled on first use
    // must have nothing not yet run after it; see latticeLevel in adaptivePixelMeans.ts): the
    // arguments e ux, e uy; atan; atanh; the rotation back.
    const argumentX = passScratch(0, n), argumentY = passScratch(1, n);
    const shape = SHAPE;
    shape[0] = cos; shape[1] = sin; shape[2] = cx; shape[3] = cy; shape[4] = q; shape[5] = qs2;
    shape[6] = sK; shape[7] = qqsK; shape[8] = e;
    writeArguments(shape, x, y, n, argumentX, argumentY);
    fastAtanInPlace(argumentX, n);
    fastAtanhInPlace(argumentY, n);
    addRotated(scaleOverE, cos, sin, argumentX, argumentY, n, alphaX, alphaY);
  },
};

/** cos, sin, centre x, y, q, q s^2, s/sqrt(q), q^2 s/sqrt(q), e of the pass below. */
const SHAPE = new Float64Array(9);

/**
 * The atan and atanh arguments e ux, e uy of the deflection (Kormann, Schneider & Bartelmann
 * 1994) at n points; a point at the centre of a coreless profile gets 0, i.e. no deflection.
 * The rotation and psi repeat those of the series branch of addDeflection on purpose: each
 * branch keeps one loop with no per-point test of the branch.
 */
function writeArguments(
  shape: Float64Array, x: Float64Array, y: Float64Array, n: number, argumentX: Float64Array, argumentY: Float64Array,
): void {
  const cos = shape[0], sin = shape[1], cx = shape[2], cy = shape[3], q = shape[4], qs2 = shape[5];
  const sK = shape[6], qqsK = shape[7], e = shape[8];
  // Without a core both denominators are psi: one division per point instead of two.
  const coreless = sK === 0;
  for (let i = 0; i < n; i++) {
    const dx = x[i] - cx, dy = y[i] - cy;
    const xr = cos * dx + sin * dy, yr = cos * dy - sin * dx;
    const psi = Math.sqrt(q * q * xr * xr + yr * yr + qs2);
    const dnx = psi + sK;
    if (dnx === 0) {
      argumentX[i] = 0;
      argumentY[i] = 0;
      continue;
    }
    const inverse = e / dnx;
    argumentX[i] = xr * inverse;
    argumentY[i] = coreless ? yr * inverse : (e * yr) / (psi + qqsK);
  }
}

/** alpha += R(angle) (scale a_x, scale a_y): the deflection rotated back to the sky frame. */
function addRotated(
  scale: number, cos: number, sin: number, ax: Float64Array, ay: Float64Array, n: number,
  alphaX: Float64Array, alphaY: Float64Array,
): void {
  for (let i = 0; i < n; i++) {
    const u = scale * ax[i], v = scale * ay[i];
    alphaX[i] += cos * u - sin * v;
    alphaY[i] += sin * u + cos * v;
  }
}
