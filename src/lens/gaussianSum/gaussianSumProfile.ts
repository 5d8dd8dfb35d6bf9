import type { MassProfile } from '../massProfile.js';
import {
  addEllipticalGaussianSumConvergence, addEllipticalGaussianSumDeflection, type EllipticalGaussianSum,
} from './ellipticalGaussianSum.js';

/**
 * A main-lens profile evaluated through its Gaussian expansion: `place` fills the sum for the
 * parameters at p[offset] (scaling a cached unit expansion, allocating nothing); the axis ratio,
 * position angle and centre are read by their names in `parameterNames`.
 */
export function gaussianSumProfile(
  kind: string, parameterNames: readonly string[],
  place: (p: Float64Array, offset: number) => EllipticalGaussianSum,
  sphericalMassWithin: (p: Float64Array, offset: number, radiusArcsec: number) => number,
): MassProfile {
  const q = parameterNames.indexOf('axisRatio'), angle = parameterNames.indexOf('positionAngleDeg');
  const x0 = parameterNames.indexOf('centerXArcsec'), y0 = parameterNames.indexOf('centerYArcsec');
  return {
    kind,
    parameterNames,
    // Sum of elliptical Gaussians (Shajib 2019, MNRAS 488, 1387, sec. 4), see ellipticalGaussianSum.ts.
    addDeflection(p, offset, x, y, n, alphaX, alphaY) {
      addEllipticalGaussianSumDeflection(
        place(p, offset), p[offset + q], p[offset + angle], p[offset + x0], p[offset + y0], x, y, n, alphaX, alphaY,
      );
    },
    // The same sum's convergence.
    addConvergence(p, offset, x, y, n, kappa) {
      addEllipticalGaussianSumConvergence(
        place(p, offset), p[offset + q], p[offset + angle], p[offset + x0], p[offset + y0], x, y, n, kappa,
      );
    },
    sphericalMassWithin,
  };
}
