// Test helper (not library code): double-exponential quadrature, written for the perturber tests
// so that their reference integrals share nothing with the code under test.

const halfPi = 0.5 * Math.PI;

// Tanh-sinh rule on [a, b] (Takahasi & Mori 1974): x = mid + half tanh(pi/2 sinh t); step halved
// until two levels agree to relativeTolerance. Integrable endpoint singularities (log, power) are
// fine: nodes are placed by their distance to the nearer endpoint, which never rounds to 0 first.
export function integrateTanhSinh(
  f: (x: number) => number, a: number, b: number, relativeTolerance = 1e-13,
): number {
  const half = 0.5 * (b - a);
  const evaluate = (t: number): number => {
    const u = halfPi * Math.sinh(Math.abs(t));
    const coshU = Math.cosh(u);
    const weight = (halfPi * Math.cosh(t)) / (coshU * coshU);
    const distance = (2 * half) / (Math.exp(2 * u) + 1); // half (1 - tanh u)
    if (!(distance > 0) || weight === 0) return 0;
    return weight * f(t >= 0 ? b - distance : a + distance);
  };
  return half * levels(evaluate, 3.2, relativeTolerance);
}

// Exp-sinh rule on [0, infinity) (Takahasi & Mori 1974): x = scale exp(pi/2 sinh t), for
// integrands decaying at least like x^-1-epsilon; scale should be the width of the main feature.
export function integrateExpSinh(
  f: (x: number) => number, scale: number, relativeTolerance = 1e-13,
): number {
  const evaluate = (t: number): number => {
    const x = scale * Math.exp(halfPi * Math.sinh(t));
    if (!(x > 0) || !Number.isFinite(x)) return 0;
    return x * halfPi * Math.cosh(t) * f(x);
  };
  return levels(evaluate, 4.5, relativeTolerance);
}

// Trapezoidal sums of g over t in [-tMax, tMax] with steps 1/2, 1/4, ..., reusing earlier nodes.
function levels(g: (t: number) => number, tMax: number, relativeTolerance: number): number {
  let step = 0.5;
  let sum = g(0);
  for (let t = step; t <= tMax; t += step) sum += g(t) + g(-t);
  let estimate = sum * step;
  for (let level = 0; level < 12; level++) {
    step *= 0.5;
    for (let t = step; t <= tMax; t += 2 * step) sum += g(t) + g(-t);
    const next = sum * step;
    if (level >= 2 && Math.abs(next - estimate) <= relativeTolerance * Math.abs(next)) return next;
    estimate = next;
  }
  return estimate;
}
