import type { MassProfile } from '../lens/massProfile.js';

/** Floor on r^2 (arcsec^2) so that the exact centre gives finite numbers. */
const smallestRadiusSquaredArcsec2 = 1e-300;

/**
 * Point mass (Schneider, Ehlers & Falco 1992, Gravitational Lenses, point-mass lens; Paczynski 1986, ApJ 304, 1):
 *   alpha = theta_E^2 (theta - centre) / |theta - centre|^2,   psi = theta_E^2 ln|theta - centre|,
 * with einsteinRadiusArcsec theta_E. Its convergence is theta_E^2 pi delta^2(theta - centre): a
 * delta function, which no sampled grid can hold, so addConvergence adds nothing anywhere.
 * A point exactly at the centre gets zero deflection and the potential of r = 1e-150 arcsec.
 */
export const pointMass: MassProfile = {
  kind: 'pointMass',
  parameterNames: ['einsteinRadiusArcsec', 'centerXArcsec', 'centerYArcsec'],

  // Schneider, Ehlers & Falco 1992, point-mass lens: alpha = theta_E^2 theta / |theta|^2.
  addDeflection(p, offset, x, y, n, alphaX, alphaY) {
    const thetaE = p[offset], cx = p[offset + 1], cy = p[offset + 2];
    const thetaE2 = thetaE * thetaE;
    for (let i = 0; i < n; i++) {
      const dx = x[i] - cx, dy = y[i] - cy;
      const factor = thetaE2 / Math.max(dx * dx + dy * dy, smallestRadiusSquaredArcsec2);
      alphaX[i] += factor * dx;
      alphaY[i] += factor * dy;
    }
  },

  // The convergence is a delta function at the centre: zero at every sampled point.
  addConvergence() {},

  // Schneider, Ehlers & Falco 1992, point-mass lens: psi = theta_E^2 ln|theta|.
  addPotential(p, offset, x, y, n, psi) {
    const thetaE = p[offset], cx = p[offset + 1], cy = p[offset + 2];
    const halfThetaE2 = 0.5 * thetaE * thetaE;
    for (let i = 0; i < n; i++) {
      const dx = x[i] - cx, dy = y[i] - cy;
      psi[i] += halfThetaE2 * Math.log(Math.max(dx * dx + dy * dy, smallestRadiusSquaredArcsec2));
    }
  },
};
