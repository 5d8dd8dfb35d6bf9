import type { MassProfile } from '../lens/massProfile.js';

/** Floor on r^2 (arcsec^2) so that a coreless profile stays finite at its exact centre. */
const smallestRadiusSquaredArcsec2 = 1e-300;

/**
 * Pseudo-Jaffe profile (Keeton 2001, astro-ph/0102341; Elíasdóttir et al. 2007, arXiv:0710.5636),
 * a cored isothermal sphere minus a wider one:
 *   kappa = (b/2) [1/sqrt(s^2 + r^2) - 1/sqrt(a^2 + r^2)],
 * b = strengthArcsec, s = coreRadiusArcsec, a = truncationRadiusArcsec, meant with 0 <= s < a
 * (the profile trusts its parameters: priors or config checks keep s < a). With s = 0 and a -> infinity it is the SIS of Einstein radius b.
 * Enclosed-mass integration gives, with A = sqrt(s^2 + r^2), B = sqrt(a^2 + r^2),
 *   alpha(r) = b [(A - s) - (B - a)] / r = b r [1/(A + s) - 1/(B + a)]   (radial).
 * Both differences cancel badly once r >> a; the code uses the equal forms
 *   kappa = (b/2) (a^2 - s^2) / (A B (A + B)),   alpha / r = b ((a^2 - s^2)/(A + B) + a - s) / ((A + s)(B + a)),
 * whose terms are all positive for a > s, and
 *   psi = b [A - s ln(s + A) - B + a ln(a + B)]   up to an additive constant.
 * Total mass: pi Sigma_crit b (a - s) (see subhaloLensing.ts).
 * A coreless profile (s = 0) evaluated exactly at its centre gets zero deflection.
 */
export const pseudoJaffe: MassProfile = {
  kind: 'pseudoJaffe',
  parameterNames: [
    'strengthArcsec', 'coreRadiusArcsec', 'truncationRadiusArcsec', 'centerXArcsec', 'centerYArcsec',
  ],

  // Keeton 2001, pseudo-Jaffe deflection (difference of two cored isothermal spheres).
  addDeflection(p, offset, x, y, n, alphaX, alphaY) {
    const b = p[offset], s = p[offset + 1], a = p[offset + 2], cx = p[offset + 3], cy = p[offset + 4];
    const s2 = s * s, a2 = a * a, widthDifference2 = (a - s) * (a + s), aMinusS = a - s;
    for (let i = 0; i < n; i++) {
      const dx = x[i] - cx, dy = y[i] - cy;
      const r2 = Math.max(dx * dx + dy * dy, smallestRadiusSquaredArcsec2);
      const inner = Math.sqrt(s2 + r2), outer = Math.sqrt(a2 + r2);
      const factor = (b * (widthDifference2 / (inner + outer) + aMinusS)) / ((inner + s) * (outer + a));
      alphaX[i] += factor * dx;
      alphaY[i] += factor * dy;
    }
  },

  // Keeton 2001; Elíasdóttir et al. 2007, eq. for the pseudo-Jaffe convergence.
  addConvergence(p, offset, x, y, n, kappa) {
    const half = 0.5 * p[offset], s = p[offset + 1], a = p[offset + 2];
    const cx = p[offset + 3], cy = p[offset + 4], s2 = s * s, a2 = a * a;
    const scale = half * (a - s) * (a + s);
    for (let i = 0; i < n; i++) {
      const dx = x[i] - cx, dy = y[i] - cy;
      const r2 = Math.max(dx * dx + dy * dy, smallestRadiusSquaredArcsec2);
      const inner = Math.sqrt(s2 + r2), outer = Math.sqrt(a2 + r2);
      kappa[i] += scale / (inner * outer * (inner + outer));
    }
  },

  // Keeton 2001, potential of the cored isothermal sphere, differenced.
  addPotential(p, offset, x, y, n, psi) {
    const b = p[offset], s = p[offset + 1], a = p[offset + 2], cx = p[offset + 3], cy = p[offset + 4];
    const s2 = s * s, a2 = a * a;
    for (let i = 0; i < n; i++) {
      const dx = x[i] - cx, dy = y[i] - cy;
      const r2 = Math.max(dx * dx + dy * dy, smallestRadiusSquaredArcsec2);
      const inner = Math.sqrt(s2 + r2), outer = Math.sqrt(a2 + r2);
      psi[i] += b * (inner - s * Math.log(s + inner) - outer + a * Math.log(a + outer));
    }
  },
};
