/**
 * Gauss-Legendre nodes and weights on [-1, 1] (Gauss 1814): roots of P_n by Newton's method on
 * the three-term recurrence (Abramowitz & Stegun 1972, 22.7.10) from the Tricomi initial guess
 * cos(pi (i + 3/4) / (n + 1/2)); weights 2 / ((1 - x^2) P_n'(x)^2) (25.4.29) with P_n' from the
 * last Newton step. Nodes ascend.
 */
export function gaussLegendre(order: number): { nodes: Float64Array; weights: Float64Array } {
  const nodes = new Float64Array(order);
  const weights = new Float64Array(order);
  for (let i = 0; i < Math.ceil(order / 2); i++) {
    let x = Math.cos((Math.PI * (i + 0.75)) / (order + 0.5));
    let derivative = 0;
    for (let iteration = 0; iteration < 100; iteration++) {
      let previous = 1;
      let current = x;
      for (let k = 2; k <= order; k++) {
        const next = ((2 * k - 1) * x * current - (k - 1) * previous) / k;
        previous = current;
        current = next;
      }
      derivative = (order * (x * current - previous)) / (x * x - 1);
      const step = current / derivative;
      x -= step;
      if (Math.abs(step) < 1e-16) break;
    }
    const weight = 2 / ((1 - x * x) * derivative * derivative);
    nodes[i] = -x;
    nodes[order - 1 - i] = x;
    weights[i] = weight;
    weights[order - 1 - i] = weight;
  }
  return { nodes, weights };
}
