import type { MassProfile } from '../lens/massProfile.js';
import {
  nfwConvergenceShape, nfwProjectedMassShape, nfwProjectionF, nfwSmallestRadiusRatio,
} from '../lens/darkHalo/nfwProjection.js';

/**
 * Spherical NFW halo (Navarro, Frenk & White 1996), rho = rho_s / ((r/r_s)(1 + r/r_s)^2), in
 * lensing units: convergenceScale kappa_s = rho_s r_s / Sigma_crit, scaleRadiusArcsec theta_s =
 * r_s / D_d. With x = |theta - centre| / theta_s:
 *   kappa = 2 kappa_s (1 - F(x)) / (x^2 - 1),
 *   alpha = 4 kappa_s theta_s h(x) / x  (radial),  h = ln(x/2) + F,
 *   psi   = 2 kappa_s theta_s^2 [ln^2(x/2) + (x^2 - 1) F(x)^2]
 * (the last is ln^2(x/2) - arccosh^2(1/x) below x = 1 and ln^2(x/2) + arccos^2(1/x) above, psi(0) = 0).
 * The convergence diverges logarithmically at the centre; a point exactly there is evaluated at
 * x = 1e-20 (kappa about 90 kappa_s) and gets zero deflection.
 */
export const nfw: MassProfile = {
  kind: 'nfw',
  parameterNames: ['convergenceScale', 'scaleRadiusArcsec', 'centerXArcsec', 'centerYArcsec'],

  // Bartelmann 1996 (A&A 313, 697) and Wright & Brainerd 2000 (ApJ 534, 34) NFW deflection.
  addDeflection(p, offset, x, y, n, alphaX, alphaY) {
    const kappaS = p[offset], thetaS = p[offset + 1], cx = p[offset + 2], cy = p[offset + 3];
    const invThetaS = 1 / thetaS, scale = 4 * kappaS;
    for (let i = 0; i < n; i++) {
      const dx = x[i] - cx, dy = y[i] - cy;
      const u = Math.max(Math.sqrt(dx * dx + dy * dy) * invThetaS, nfwSmallestRadiusRatio);
      // alpha / |theta - centre| = 4 kappa_s h(u) / u^2
      const factor = (scale * nfwProjectedMassShape(u)) / (u * u);
      alphaX[i] += factor * dx;
      alphaY[i] += factor * dy;
    }
  },

  // Bartelmann 1996; Wright & Brainerd 2000, eq. 11: kappa = 2 kappa_s (1 - F)/(x^2 - 1).
  addConvergence(p, offset, x, y, n, kappa) {
    const kappaS = p[offset], thetaS = p[offset + 1], cx = p[offset + 2], cy = p[offset + 3];
    const invThetaS = 1 / thetaS, scale = 2 * kappaS;
    for (let i = 0; i < n; i++) {
      const dx = x[i] - cx, dy = y[i] - cy;
      const u = Math.max(Math.sqrt(dx * dx + dy * dy) * invThetaS, nfwSmallestRadiusRatio);
      kappa[i] += scale * nfwConvergenceShape(u);
    }
  },

  // Meneghetti, Bartelmann & Moscardini 2003 (MNRAS 340, 105) and Golse & Kneib 2002 NFW potential.
  addPotential(p, offset, x, y, n, psi) {
    const kappaS = p[offset], thetaS = p[offset + 1], cx = p[offset + 2], cy = p[offset + 3];
    const invThetaS = 1 / thetaS, scale = 2 * kappaS * thetaS * thetaS;
    for (let i = 0; i < n; i++) {
      const dx = x[i] - cx, dy = y[i] - cy;
      const u = Math.max(Math.sqrt(dx * dx + dy * dy) * invThetaS, nfwSmallestRadiusRatio);
      const logHalf = Math.log(0.5 * u), f = nfwProjectionF(u);
      psi[i] += scale * (logHalf * logHalf + (u - 1) * (u + 1) * f * f);
    }
  },
};
