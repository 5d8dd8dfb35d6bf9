import { describe, expect, it } from 'vitest';
import { nelderMead } from '../../../src/numeric/optimisation/nelderMead.js';

describe('nelderMead', () => {
  it("finds the minimum of Rosenbrock's function, 0 at (1, 1), from the classic start (-1.2, 1)", () => {
    // Rosenbrock 1960, Computer Journal 3, 175: f = 100 (y - x^2)^2 + (1 - x)^2.
    const f = (p: Float64Array): number => 100 * (p[1] - p[0] * p[0]) ** 2 + (1 - p[0]) ** 2;
    const r = nelderMead(f, [-1.2, 1], { step: [0.1, 0.1], valueTolerance: 1e-14, pointTolerance: 1e-9, maxEvaluations: 5000 });
    expect(r.converged).toBe(true);
    // Tolerances: the simplex stops within 1e-9 of its best vertex; the valley's curvature
    // lets x stray by about sqrt(f) ~ 1e-7 along it.
    expect(r.point[0]).toBeCloseTo(1, 5);
    expect(r.point[1]).toBeCloseTo(1, 5);
    expect(r.value).toBeLessThan(1e-10);
  });

  it('finds the minimum of a rotated, scaled quadratic in 4 dimensions', () => {
    // f = sum_k w_k (u_k - c_k)^2 with u = R x, R a rotation in the (0,1) and (2,3) planes: minimum 0 at x = R^T c.
    const c = [0.3, -1.2, 2.0, 0.7];
    const w = [1, 10, 0.5, 4];
    const t = 0.6;
    const rotate = (x: ArrayLike<number>): number[] => [
      Math.cos(t) * x[0] - Math.sin(t) * x[1], Math.sin(t) * x[0] + Math.cos(t) * x[1],
      Math.cos(t) * x[2] - Math.sin(t) * x[3], Math.sin(t) * x[2] + Math.cos(t) * x[3],
    ];
    const f = (x: Float64Array): number => rotate(x).reduce((s, u, k) => s + w[k] * (u - c[k]) ** 2, 0);
    const r = nelderMead(f, [0, 0, 0, 0], { step: [0.5, 0.5, 0.5, 0.5], valueTolerance: 1e-14, pointTolerance: 1e-9, maxEvaluations: 20000 });
    const found = rotate(r.point);
    for (let k = 0; k < 4; k++) expect(found[k]).toBeCloseTo(c[k], 5);
  });

  it('never accepts a point where f is +Infinity (a bound) and finds the minimum on the allowed side', () => {
    // Minimum of (x - 2)^2 subject to x <= 1: at x = 1.
    const f = (p: Float64Array): number => (p[0] > 1 ? Number.POSITIVE_INFINITY : (p[0] - 2) ** 2);
    const r = nelderMead(f, [0], { step: [0.3], valueTolerance: 1e-12, pointTolerance: 1e-9, maxEvaluations: 1000 });
    expect(r.point[0]).toBeLessThanOrEqual(1);
    expect(r.point[0]).toBeCloseTo(1, 6);
  });

  it('stops at maxEvaluations and says it did not converge', () => {
    const f = (p: Float64Array): number => 100 * (p[1] - p[0] * p[0]) ** 2 + (1 - p[0]) ** 2;
    const r = nelderMead(f, [-1.2, 1], { step: [0.1, 0.1], valueTolerance: 1e-14, pointTolerance: 1e-12, maxEvaluations: 30 });
    expect(r.converged).toBe(false);
    expect(r.evaluations).toBeLessThanOrEqual(32);
  });
});
