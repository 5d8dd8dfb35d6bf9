/**
 * Adaptive Gauss-Legendre quadrature of a smooth function on a finite interval: each panel is
 * integrated with a 20-point rule and with the same rule on its two halves; a panel is accepted
 * when the two agree within its share of the requested absolute error, otherwise it is halved.
 */

const ruleOrder = 20;
const maximumDepth = 16;

// Gauss-Legendre nodes and weights on [-1, 1] by Newton iteration on the Legendre polynomial
// P_n through its three-term recurrence (Abramowitz & Stegun 1964, 25.4.29 and 22.7.10).
function gaussLegendreRule(n: number): { nodes: Float64Array; weights: Float64Array } {
  const nodes = new Float64Array(n);
  const weights = new Float64Array(n);
  for (let i = 0; i < Math.ceil(n / 2); i++) {
    let x = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let derivative = 0;
    for (let iteration = 0; iteration < 100; iteration++) {
      let p0 = 1;
      let p1 = x;
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1) * x * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      derivative = (n * (x * p1 - p0)) / (x * x - 1);
      const step = p1 / derivative;
      x -= step;
      if (Math.abs(step) < 1e-16) break;
    }
    const weight = 2 / ((1 - x * x) * derivative * derivative);
    nodes[i] = -x;
    nodes[n - 1 - i] = x;
    weights[i] = weight;
    weights[n - 1 - i] = weight;
  }
  return { nodes, weights };
}

const rule = gaussLegendreRule(ruleOrder);

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

// Integral of f over [a, b] to the given relative accuracy, by adaptive bisection of
// 20-point Gauss-Legendre panels (e.g. Davis & Rabinowitz 1984, sec. 6.1).
export function integrateAdaptiveGaussLegendre(
  f: (x: number) => number, a: number, b: number, relativeAccuracy: number,
): number {
  if (a === b) return 0;
  const whole = panel(f, a, b);
  return refine(f, a, b, whole, relativeAccuracy * Math.abs(whole), 0);
}
