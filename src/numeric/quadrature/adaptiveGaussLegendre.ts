import { gaussLegendre } from './gaussLegendre.js';

const ruleOrder = 20;
const maximumDepth = 16;

const rule = gaussLegendre(ruleOrder);

function panel(f: (x: number) => number, a: number, b: number): number {
  const half = 0.5 * (b - a);
  const middle = 0.5 * (a + b);
  let sum = 0;
  for (let i = 0; i < ruleOrder; i++) sum += rule.weights[i] * f(middle + half * rule.nodes[i]);
  return half * sum;
}

function refine(
  f: (x: number) => number, a: number, b: number,
  whole: number, absoluteError: number, depth: number,
): number {
  const middle = 0.5 * (a + b);
  const left = panel(f, a, middle);
  const right = panel(f, middle, b);
  const halves = left + right;
  if (Math.abs(halves - whole) <= absoluteError || depth >= maximumDepth) return halves;
  return (
    refine(f, a, middle, left, 0.5 * absoluteError, depth + 1) +
    refine(f, middle, b, right, 0.5 * absoluteError, depth + 1)
  );
}

/**
 * Integral of a smooth f over [a, b] to the given relative accuracy, by adaptive bisection of
 * 20-point Gauss-Legendre panels (e.g. Davis & Rabinowitz 1984, sec. 6.1): a panel is accepted
 * when the rule on it and on its two halves agree within its share of the absolute error.
 */
export function integrateAdaptiveGaussLegendre(
  f: (x: number) => number, a: number, b: number, relativeAccuracy: number,
): number {
  if (a === b) return 0;
  const whole = panel(f, a, b);
  return refine(f, a, b, whole, relativeAccuracy * Math.abs(whole), 0);
}
