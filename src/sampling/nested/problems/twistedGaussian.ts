import type { NestedProblem } from '../nestedProblem.js';

/** Twist b, first-axis deviation and prior box of the twisted Gaussian benchmark. */
export const twistStrength = 0.03;
export const twistFirstSigma = 10;
const firstAxisRange = [-50, 50];
const secondAxisRange = [-100, 20];
const otherAxisHalfWidth = 6;

function axisRange(axis: number): [number, number] {
  if (axis === 0) return [firstAxisRange[0], firstAxisRange[1]];
  if (axis === 1) return [secondAxisRange[0], secondAxisRange[1]];
  return [-otherAxisHalfWidth, otherAxisHalfWidth];
}

/**
 * The twisted ("banana") Gaussian of Haario, Saksman & Tamminen 1999 (Section 4): a normal
 * density with sigma 10 on x1 and 1 on the rest, bent by x2 -> x2 + b (x1^2 - 100), b = 0.03.
 * The bend has unit Jacobian, so L stays normalised; in the uniform prior box x1 in [-50, 50],
 * x2 in [-100, 20], others in [-6, 6] the truncated mass is below 1e-5 and ln Z = -ln(box volume)
 * (see twistedGaussianLnEvidence). A curved degeneracy that ellipsoids bound poorly.
 */
export function twistedGaussianProblem(dim: number): NestedProblem {
  const lower = new Float64Array(dim);
  const width = new Float64Array(dim);
  for (let i = 0; i < dim; i++) {
    const [low, high] = axisRange(i);
    lower[i] = low;
    width[i] = high - low;
  }
  const lnNormalisation = -0.5 * dim * Math.log(2 * Math.PI) - Math.log(twistFirstSigma);
  return {
    dim,
    physicalDim: dim,
    transform(unit, out) {
      for (let i = 0; i < dim; i++) out[i] = lower[i] + unit[i] * width[i];
    },
    logLikelihood(points, count) {
      const lnL = new Float64Array(count);
      for (let n = 0; n < count; n++) {
        const row = n * dim;
        const x = points[row];
        const y = points[row + 1] + twistStrength * (x * x - twistFirstSigma * twistFirstSigma);
        let sum = (x / twistFirstSigma) ** 2 + y * y;
        for (let i = 2; i < dim; i++) sum += points[row + i] * points[row + i];
        lnL[n] = lnNormalisation - 0.5 * sum;
      }
      return lnL;
    },
  };
}

/** ln Z of twistedGaussianProblem(dim): minus the log volume of its prior box. */
export function twistedGaussianLnEvidence(dim: number): number {
  let lnVolume = 0;
  for (let i = 0; i < dim; i++) {
    const [low, high] = axisRange(i);
    lnVolume += Math.log(high - low);
  }
  return -lnVolume;
}
