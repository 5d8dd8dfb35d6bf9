import type { MassProfile } from '../lens/massProfile.js';
import { isothermalEllipsoid } from '../lens/isothermalEllipsoid.js';
import { fastAtan, fastAtanh } from './fastAtan.js';
import { passScratch } from './passScratch.js';

const DEG = Math.PI / 180;
/** As in isothermalEllipsoid.ts: below this 1 - q^2 the deflection uses the series of atan(z)/z, atanh(z)/z. */
const SERIES_BELOW = 1e-6;

/**
 * The singular isothermal ellipsoid of src/lens/isothermalEllipsoid.ts (Kormann, Schneider &
 * Bartelmann 1994; Keeton 2001 for the core), same parameters, same formulas, with the
 * deflection's atan and atanh from fastAtan.ts (atanh by fastLog). The atanh argument z = e u_y
 * has |z| <= e, so its absolute error is below 2e-16 (1 + 2 artanh e) plus a rounding, and the
 * deflection's below (b/e) 5e-16 for e < 1/2 (<= 1.2e3 b 5e-16, since e >= 1e-3 outside the series
 * branch) and 2 b 2e-16 (2 + 2 artanh e) < 3e-15 b for 1/2 <= e, q >= 0.1: under 1e-12 arcsec for
 * any Einstein radius below 300 arcsec (tested against isothermalEllipsoid.ts in
 * test/model/fastElementary.test.ts). Convergence and potential are the plain ones.
 */
export const fastIsothermalEllipsoid: MassProfile = {
  kind: isothermalEllipsoid.kind,
  parameterNames: isothermalEllipsoid.parameterNames,
  addConvergence: isothermalEllipsoid.addConvergence,
  addPotential: isothermalEllipsoid.addPotential,
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
    // Without a core both denominators are psi: one division per point instead of two.
    const coreless = sK === 0;
    if (nearRound) {
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
    // In passes (see passScratch.ts): the arguments e ux, e uy; atan; atanh; the rotation back.
    // A point at the centre of a coreless profile gets arguments 0, i.e. no deflection.
    const argumentX = passScratch(0, n), argumentY = passScratch(1, n);
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
    for (let i = 0; i < n; i++) argumentX[i] = fastAtan(argumentX[i]);
    for (let i = 0; i < n; i++) argumentY[i] = fastAtanh(argumentY[i]);
    for (let i = 0; i < n; i++) {
      const ax = scaleOverE * argumentX[i], ay = scaleOverE * argumentY[i];
      alphaX[i] += cos * ax - sin * ay;
      alphaY[i] += sin * ax + cos * ay;
    }
  },
};
