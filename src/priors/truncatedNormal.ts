import type { Prior, PriorSpec } from './prior.js';
import { finiteField, orderedBounds, positiveSigma, priorError, type PriorPlace } from './priorChecks.js';
import {
  LOG_SQRT_2PI, logUpperTail, standardNormalQuantile, upperTail, upperTailQuantileFromLog,
} from '../numeric/special/standardNormal.js';

// Normal N(mean, sigma^2) truncated to [lower, upper], sampled by inverting the CDF on the window
// [Phi(alpha), Phi(beta)] (inverse-transform method, Devroye 1986 ch. 2). When the window lies
// wholly in one tail it is worked in log upper-tail probabilities (mirrored for the lower tail), so
// windows many sigma from the mean keep their relative precision.
export function truncatedNormalPrior(
  name: string, spec: Extract<PriorSpec, { kind: 'truncatedNormal' }>, place: PriorPlace = {},
): Prior {
  const mean = finiteField(name, spec, 'mean', place);
  const sigma = positiveSigma(name, spec, place);
  const { lower, upper } = orderedBounds(name, spec, place);
  const alpha = (lower - mean) / sigma;
  const beta = (upper - mean) / sigma;

  let logMass: number;
  let standardFromUnit: (u: number) => number;
  if (alpha >= 0 || beta <= 0) {
    // One tail: in the mirrored frame (if needed) the window is [a, b] with 0 <= a < b.
    const mirrored = beta <= 0;
    const a = mirrored ? -beta : alpha;
    const b = mirrored ? -alpha : beta;
    const logQa = logUpperTail(a);
    const logRatio = logUpperTail(b) - logQa; // log(Q(b) / Q(a)) < 0
    const ratio = Math.exp(logRatio);
    const oneMinusRatio = -Math.expm1(logRatio);
    logMass = logQa + Math.log(oneMinusRatio);
    // Q(z') = Q(a) (1 - v (1 - r)) with v the CDF value measured from a in the working frame.
    standardFromUnit = mirrored
      ? (u: number): number => -upperTailQuantileFromLog(logQa + Math.log(ratio + u * oneMinusRatio))
      : (u: number): number => upperTailQuantileFromLog(logQa + Math.log1p(-u * oneMinusRatio));
  } else {
    const below = upperTail(-alpha); // Phi(alpha)
    const above = upperTail(beta); // 1 - Phi(beta)
    const mass = 1 - below - above;
    logMass = Math.log(mass);
    standardFromUnit = (u: number): number => {
      const p = below + u * mass;
      if (p < 0.5) return standardNormalQuantile(p);
      return -standardNormalQuantile(above + (1 - u) * mass);
    };
  }
  if (!Number.isFinite(logMass)) {
    throw priorError(
      name,
      `expected a truncation window holding some probability, found [${lower}, ${upper}] ` +
        `(${alpha.toPrecision(4)} to ${beta.toPrecision(4)} sigma from the mean ${mean}) with none`,
      place,
    );
  }
  const logNormaliser = Math.log(sigma) + LOG_SQRT_2PI + logMass;
  return Object.freeze({
    name,
    spec: Object.freeze({ kind: 'truncatedNormal', mean, sigma, lower, upper } as const),
    isFixed: false,
    periodic: false,
    lower,
    upper,
    fromUnit: (u: number): number =>
      Math.min(upper, Math.max(lower, mean + sigma * standardFromUnit(u))),
    logDensity: (x: number): number => {
      if (!(x >= lower && x <= upper)) return -Infinity;
      const z = (x - mean) / sigma;
      return -0.5 * z * z - logNormaliser;
    },
  });
}
