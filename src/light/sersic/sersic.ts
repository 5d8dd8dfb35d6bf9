import type { LightProfile } from '../lightProfile.js';
import { ellipticalQuadraticForm } from '../ellipticalQuadraticForm.js';
import { sersicCoefficient } from './sersicCoefficient.js';

const form = new Float64Array(3);

/**
 * Elliptical Sersic profile (Sersic 1968; Graham & Driver 2005, eq. 1):
 * I(R) = I_e exp(-b_n [(R / R_e)^(1/n) - 1]), amplitude I_e = brightness at R = R_e.
 * R is the circularised elliptical radius sqrt(q x'^2 + y'^2 / q) (see
 * ellipticalQuadraticForm.ts), so `effectiveRadiusArcsec` is the radius of the circle with the
 * same area as the half-light isophote; the semi-major axis of that isophote is R_e / sqrt(q).
 * Total flux 2 pi n R_e^2 I_e e^(b_n) b_n^(-2n) Gamma(2n) (Graham & Driver 2005, eq. 2), for any q.
 * The reference formula; its fast twin, fastSersic.ts beside it, is what the forward model runs
 * (the two are compared in test/light/sersic/fastSersic.test.ts).
 */
export const sersic: LightProfile = {
  kind: 'sersic',
  parameterNames: [
    'effectiveRadiusArcsec', 'sersicIndex', 'axisRatio', 'positionAngleDeg',
    'centerXArcsec', 'centerYArcsec',
  ],
  basisCount: 1,
  writeBasis(p, offset, x, y, n, out, outOffset) {
    const sersicIndex = p[offset + 1];
    ellipticalQuadraticForm(p[offset], p[offset + 2], p[offset + 3], form);
    const a = form[0];
    const b = form[1];
    const c = form[2];
    const centerX = p[offset + 4];
    const centerY = p[offset + 5];
    const bn = sersicCoefficient(sersicIndex);
    // (R / R_e)^(1/n) = exp(log(R^2 / R_e^2) / (2n)), at R = 0 exp(-Infinity) = 0 (faster than
    // Math.pow on Node 20; DEVELOPERS.md, measured choices).
    const halfInverseIndex = 0.5 / sersicIndex;
    for (let i = 0; i < n; i++) {
      const dx = x[i] - centerX;
      const dy = y[i] - centerY;
      const r2 = (a * dx + b * dy) * dx + c * dy * dy;
      out[outOffset + i] = Math.exp(bn - bn * Math.exp(halfInverseIndex * Math.log(r2)));
    }
  },
};
