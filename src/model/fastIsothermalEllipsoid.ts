import type { MassProfile } from '../lens/massProfile.js';
import { isothermalEllipsoid } from '../lens/isothermalEllipsoid.js';
import { fastAtan, fastAtanh } from './fastAtan.js';

const DEG = Math.PI / 180;
/** As in isothermalEllipsoid.ts: below this 1 - q^2 the deflection uses the series of atan(z)/z, atanh(z)/z. */
const SERIES_BELOW = 1e-6;

/**
 * The singular isothermal ellipsoid of src/lens/isothermalEllipsoid.ts (Kormann, Schneider &
 * Bartelmann 1994; Keeton 2001 for the core), same parameters, same formulas, with the
 * deflection's atan and atanh from fastAtan.ts. Its absolute deflection error is below
 * (b/e) 5e-16 <= 1.2e3 b 5e-16 (e >= 1e-3 outside the series branch), i.e. under 1e-12 arcsec
 * for any Einstein radius below 1000 arcsec (tested against isothermalEllipsoid.ts in
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
    for (let i = 0; i < n; i++) {
      const dx = x[i] - cx, dy = y[i] - cy;
      const xr = cos * dx + sin * dy, yr = cos * dy - sin * dx;
      const psi = Math.sqrt(q * q * xr * xr + yr * yr + qs2);
      const dnx = psi + sK;
      if (dnx === 0) continue;
      const inverse = 1 / dnx;
      const ux = xr * inverse, uy = coreless ? yr * inverse : yr / (psi + qqsK);
      let ax: number, ay: number;
      if (nearRound) {
        const wx = e2 * ux * ux, wy = e2 * uy * uy;
        ax = scale * ux * (1 - wx * (1 / 3 - wx / 5));
        ay = scale * uy * (1 + wy * (1 / 3 + wy / 5));
      } else {
        ax = scaleOverE * fastAtan(e * ux);
        ay = scaleOverE * fastAtanh(e * uy);
      }
      alphaX[i] += cos * ax - sin * ay;
      alphaY[i] += sin * ax + cos * ay;
    }
  },
};
