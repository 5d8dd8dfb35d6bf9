import type { MassProfile } from './massProfile.js';

/**
 * External shear about the image-plane origin (not the lens centre):
 *   psi = (gamma / 2) r^2 cos(2 (phi - phiGamma))
 *       = (gamma1 / 2)(x^2 - y^2) + gamma2 x y,   gamma1 = gamma cos 2 phiGamma, gamma2 = gamma sin 2 phiGamma,
 *   alpha = (gamma1 x + gamma2 y, gamma2 x - gamma1 y),   kappa = 0.
 * gamma = shearStrength (dimensionless), phiGamma = shearAngleDeg counter-clockwise from +x.
 * Angle convention: the lens-equation Jacobian is 1 - gamma along phiGamma and 1 + gamma across
 * it, so images are stretched along phiGamma; the mass that would cause this shear lies
 * perpendicular to phiGamma as seen from the lens. phiGamma and phiGamma + 180 deg are the same.
 */
export const externalShear: MassProfile = {
  kind: 'externalShear',
  parameterNames: ['shearStrength', 'shearAngleDeg'],

  // Gradient of the external-shear potential above (common practice; e.g. the shear term of the
  // Chang-Refsdal lens, Schneider, Ehlers & Falco 1992, ch. 8 "Simple lens models": chapter title
  // checked, section not).
  addDeflection(p, offset, x, y, n, alphaX, alphaY) {
    const gamma = p[offset], twice = 2 * p[offset + 1] * DEG;
    const gamma1 = gamma * Math.cos(twice), gamma2 = gamma * Math.sin(twice);
    for (let i = 0; i < n; i++) {
      const xi = x[i], yi = y[i];
      alphaX[i] += gamma1 * xi + gamma2 * yi;
      alphaY[i] += gamma2 * xi - gamma1 * yi;
    }
  },

  // A pure shear is traceless: its convergence is zero, so nothing is added.
  addConvergence() {},

  // The external-shear potential above.
  addPotential(p, offset, x, y, n, psi) {
    const gamma = p[offset], twice = 2 * p[offset + 1] * DEG;
    const halfGamma1 = 0.5 * gamma * Math.cos(twice), gamma2 = gamma * Math.sin(twice);
    for (let i = 0; i < n; i++) {
      const xi = x[i], yi = y[i];
      psi[i] += halfGamma1 * (xi * xi - yi * yi) + gamma2 * xi * yi;
    }
  },
};

const DEG = Math.PI / 180;
