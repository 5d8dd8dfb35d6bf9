import type { LightProfile } from './lightProfile.js';
import { ellipticalQuadraticForm } from './ellipticalQuadraticForm.js';

const form = new Float64Array(3);

/**
 * Elliptical Gaussian normalised to unit total flux (common practice):
 * I(R) = exp(-R^2 / (2 sigma^2)) / (2 pi sigma^2), R the circularised elliptical radius
 * sqrt(q x'^2 + y'^2 / q) (see ellipticalQuadraticForm.ts); the dispersion is sigma / sqrt(q)
 * along the major axis and sigma sqrt(q) along the minor axis. Amplitude = total flux.
 */
export const ellipticalGaussian: LightProfile = {
  kind: 'ellipticalGaussian',
  parameterNames: ['sigmaArcsec', 'axisRatio', 'positionAngleDeg', 'centerXArcsec', 'centerYArcsec'],
  basisCount: 1,
  writeBasis(p, offset, x, y, n, out, outOffset) {
    const sigma = p[offset];
    // The form is built for radius sigma * sqrt(2), so that exp(-form) = exp(-R^2 / (2 sigma^2)).
    ellipticalQuadraticForm(sigma * Math.SQRT2, p[offset + 1], p[offset + 2], form);
    const a = form[0];
    const b = form[1];
    const c = form[2];
    const centerX = p[offset + 3];
    const centerY = p[offset + 4];
    const peak = 1 / (2 * Math.PI * sigma * sigma);
    for (let i = 0; i < n; i++) {
      const dx = x[i] - centerX;
      const dy = y[i] - centerY;
      out[outOffset + i] = peak * Math.exp(-((a * dx + b * dy) * dx + c * dy * dy));
    }
  },
};
