import type { MassProfile } from '../../lens/massProfile.js';
import {
  nfwConvergenceShape, nfwProjectedMassShape, nfwProjectionF, nfwSmallestRadiusRatio,
} from '../../lens/darkHalo/nfwProjection.js';

/**
 * Truncated NFW halo of Baltz, Marshall & Oguri 2009 (JCAP 01, 015), n = 1 case:
 *   rho = rho_s / ((r/r_s)(1 + r/r_s)^2) * tau^2 / (tau^2 + (r/r_s)^2),   tau = r_t / r_s,
 * in lensing units convergenceScale kappa_s = rho_s r_s / Sigma_crit, scaleRadiusArcsec theta_s,
 * truncationRatio tau. With x = |theta - centre| / theta_s, F, h as for the NFW (nfwProjection.ts),
 * R = sqrt(tau^2 + x^2), L = ln(x / (R + tau)) and P = tau^2 / (tau^2 + 1)^2 (BMO09, appendix):
 *   kappa = 2 kappa_s P [(tau^2 + 1)(1 - F)/(x^2 - 1) + 2F - pi/R + (tau^2 - 1) L/(tau R)],
 *   alpha = (4 kappa_s theta_s / x) P [(tau^2 + 1 + 2(x^2 - 1)) F + tau pi + (tau^2 - 1) ln tau
 *                                       + R (-pi + (tau^2 - 1) L / tau)].
 * The bracket of alpha vanishes like x^2 ln x at the centre through cancelling logarithms; it is
 * evaluated as the equal sum
 *   (tau^2 - 1)[h(x) - log1p(d/2) + d L] + 2 x^2 F - pi x^2/(tau + R),   d = R/tau - 1 = x^2/(tau(tau + R)),
 * whose terms each vanish at x = 0, so the deflection keeps full precision there. From x = 1/2 on,
 * where nothing cancels, h - log1p(d/2) is replaced by the equal F + L + ln tau (since
 * 1 + d/2 = (R + tau)/(2 tau)), which saves two logarithms per point. Nothing is
 * singular at x = tau. A point exactly at the centre is evaluated at x = 1e-20 (finite kappa,
 * zero deflection), as for the NFW. No potential is provided (image fitting needs none).
 * The reference formula; its fast twin, fastTruncatedNfw.ts beside it, is what the forward model runs
 * (the two are compared in test/perturber/truncatedNfw/fastTruncatedNfw.test.ts).
 */
export const truncatedNfw: MassProfile = {
  kind: 'truncatedNfw',
  parameterNames: [
    'convergenceScale', 'scaleRadiusArcsec', 'truncationRatio', 'centerXArcsec', 'centerYArcsec',
  ],

  // Baltz, Marshall & Oguri 2009, appendix: projected mass of the n = 1 truncated NFW.
  addDeflection(p, offset, x, y, n, alphaX, alphaY) {
    const kappaS = p[offset], thetaS = p[offset + 1], tau = p[offset + 2];
    const cx = p[offset + 3], cy = p[offset + 4];
    const invThetaS = 1 / thetaS, tau2 = tau * tau, tau2m1 = (tau - 1) * (tau + 1), invTau = 1 / tau;
    const logTau = Math.log(tau), scale = (4 * kappaS * tau2) / ((tau2 + 1) * (tau2 + 1));
    for (let i = 0; i < n; i++) {
      const dx = x[i] - cx, dy = y[i] - cy;
      const u = Math.max(Math.sqrt(dx * dx + dy * dy) * invThetaS, nfwSmallestRadiusRatio);
      const u2 = u * u;
      const r = Math.sqrt(tau2 + u2);
      const tauPlusR = tau + r;
      const d = (u2 * invTau) / tauPlusR;
      const logRatio = Math.log(u / tauPlusR);
      const f = nfwProjectionF(u);
      const logarithms = u < 0.5
        ? nfwProjectedMassShape(u) - Math.log1p(0.5 * d) + d * logRatio
        : f + logTau + (1 + d) * logRatio;
      const bracket = tau2m1 * logarithms + 2 * u2 * f - (Math.PI * u2) / tauPlusR;
      // alpha / |theta - centre| = 4 kappa_s P bracket / u^2
      const factor = (scale * bracket) / u2;
      alphaX[i] += factor * dx;
      alphaY[i] += factor * dy;
    }
  },

  // Baltz, Marshall & Oguri 2009, appendix: surface density of the n = 1 truncated NFW.
  addConvergence(p, offset, x, y, n, kappa) {
    const kappaS = p[offset], thetaS = p[offset + 1], tau = p[offset + 2];
    const cx = p[offset + 3], cy = p[offset + 4];
    const invThetaS = 1 / thetaS, tau2 = tau * tau, tau2p1 = tau2 + 1;
    const logCoefficient = ((tau - 1) * (tau + 1)) / tau;
    const scale = (2 * kappaS * tau2) / (tau2p1 * tau2p1);
    for (let i = 0; i < n; i++) {
      const dx = x[i] - cx, dy = y[i] - cy;
      const u = Math.max(Math.sqrt(dx * dx + dy * dy) * invThetaS, nfwSmallestRadiusRatio);
      const r = Math.sqrt(tau2 + u * u);
      const logRatio = Math.log(u / (r + tau));
      kappa[i] += scale * (
        tau2p1 * nfwConvergenceShape(u) + 2 * nfwProjectionF(u) +
        (logCoefficient * logRatio - Math.PI) / r
      );
    }
  },
};
