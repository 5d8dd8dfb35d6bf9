/** P_n'(x) from the three-term recurrence, also returning P_n(x) in `value[0]` (A&S 1972, 22.7.10, 22.8.5). */
function legendreDerivative(order: number, x: number, value: Float64Array): number {
  let previous = 1;
  let current = x;
  for (let n = 2; n <= order; n++) {
    const next = ((2 * n - 1) * x * current - (n - 1) * previous) / n;
    previous = current;
    current = next;
  }
  value[0] = current;
  return (order * (x * current - previous)) / (x * x - 1);
}

/**
 * Gauss-Legendre nodes and weights on [-1, 1] (Gauss 1814): roots of P_n by Newton's method from
 * the Tricomi initial guess cos(pi (i - 1/4)/(n + 1/2)), weights 2 / ((1 - x^2) P_n'(x)^2)
 * (Abramowitz & Stegun 1972, 25.4.29). Nodes ascend.
 */
export function gaussLegendre(order: number): { nodes: Float64Array; weights: Float64Array } {
  const nodes = new Float64Array(order);
  const weights = new Float64Array(order);
  const value = new Float64Array(1);
  for (let i = 0; i < Math.ceil(order / 2); i++) {
    let x = Math.cos((Math.PI * (i + 0.75)) / (order + 0.5));
    for (let iteration = 0; iteration < 100; iteration++) {
      const derivative = legendreDerivative(order, x, value);
      const change = value[0] / derivative;
      x -= change;
      if (Math.abs(change) < 1e-16) break;
    }
    const derivative = legendreDerivative(order, x, value);
    const weight = 2 / ((1 - x * x) * derivative * derivative);
    nodes[i] = -x;
    nodes[order - 1 - i] = x;
    weights[i] = weight;
    weights[order - 1 - i] = weight;
  }
  return { nodes, weights };
}
