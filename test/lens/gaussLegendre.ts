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
 * Composite Gauss-Legendre integral of f over [0, 1] on geometrically graded panels
 * [0, r^-k], ..., [r^-2, r^-1], [r^-1, 1] (ratio r = 4, `levels` panels), so that integrands
 * with a steep but integrable feature at 0 are resolved.
 */
export function integrateGraded(f: (w: number) => number, rule: GaussRule, levels = 24): number {
  let total = 0;
  let upper = 1;
  for (let level = 0; level <= levels; level++) {
    const lower = level === levels ? 0 : upper / 4;
    const half = 0.5 * (upper - lower), middle = 0.5 * (upper + lower);
    for (let i = 0; i < rule.nodes.length; i++) {
      total += rule.weights[i] * half * f(middle + half * rule.nodes[i]);
    }
    upper = lower;
  }
  return total;
}
