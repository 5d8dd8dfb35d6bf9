// Test helper: Gauss-Legendre quadrature written for the lens tests (not library code).

/** Nodes and weights of the n-point Gauss-Legendre rule on [-1, 1]. */
export interface GaussRule { nodes: Float64Array; weights: Float64Array }

// Gauss-Legendre nodes as roots of P_n by Newton's method from the Chebyshev-like guess
// cos(pi (i + 3/4) / (n + 1/2)), weights 2 / ((1 - x^2) P_n'(x)^2) (Abramowitz & Stegun 25.4.29).
export function gaussLegendre(n: number): GaussRule {
  const nodes = new Float64Array(n), weights = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let z = Math.cos(Math.PI * (i + 0.75) / (n + 0.5));
    let derivative = 0;
    for (let iteration = 0; iteration < 100; iteration++) {
      let p0 = 1, p1 = 0;
      for (let j = 1; j <= n; j++) {
        const p2 = p1;
        p1 = p0;
        p0 = ((2 * j - 1) * z * p1 - (j - 1) * p2) / j;
      }
      derivative = n * (z * p0 - p1) / (z * z - 1);
      const step = p0 / derivative;
      z -= step;
      if (Math.abs(step) < 1e-16) break;
    }
    nodes[i] = z;
    weights[i] = 2 / ((1 - z * z) * derivative * derivative);
  }
  return { nodes, weights };
}

/**
 * Composite Gauss-Legendre integral of f over [0, 1] on panels graded geometrically (ratio 4,
 * `levels` panels on each side) towards both ends, [0, 1/2] towards 0 and [1/2, 1] towards 1,
 * so that integrands with a steep but integrable feature at either end are resolved.
 */
export function integrateGraded(f: (w: number) => number, rule: GaussRule, levels = 24): number {
  let total = 0;
  let width = 0.5;
  for (let level = 0; level <= levels; level++) {
    const inner = level === levels ? 0 : width / 4;
    total += panel(f, rule, inner, width) + panel(f, rule, 1 - width, 1 - inner);
    width = inner;
  }
  return total;
}

function panel(f: (w: number) => number, rule: GaussRule, lower: number, upper: number): number {
  const half = 0.5 * (upper - lower), middle = 0.5 * (upper + lower);
  let sum = 0;
  for (let i = 0; i < rule.nodes.length; i++) sum += rule.weights[i] * f(middle + half * rule.nodes[i]);
  return half * sum;
}
