import { describe, expect, it } from 'vitest';
import { Matrix, solve } from 'ml-matrix';
import { LinearAmplitudeChiSquare } from '../../src/sensitivity/linearAmplitudeChiSquare.js';

// Reference: weighted linear least squares solved by ml-matrix (solve() of an over-determined
// system uses its QR decomposition, a general-purpose library of the npm registry) on the
// whitened system (B / sigma) a = d / sigma.
function pseudoRandom(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s * 1103515245 + 12345) % 2147483648;
    return s / 2147483648;
  };
}

describe('LinearAmplitudeChiSquare', () => {
  const pixelCount = 60;
  const k = 3;
  const random = pseudoRandom(7);
  const basis = Float64Array.from({ length: k * pixelCount }, () => random() - 0.3);
  const sigma = Float64Array.from({ length: pixelCount }, () => 0.5 + random());
  const target = Float64Array.from({ length: pixelCount }, () => 2 * random());
  // Every other pixel is used.
  const used = Int32Array.from({ length: pixelCount / 2 }, (_, e) => 2 * e + 1);

  it('equals the chi^2 of the QR least-squares solution over the used pixels', () => {
    const chi = new LinearAmplitudeChiSquare(used, sigma, k);
    chi.setTarget(target);
    const value = chi.chiSquare(basis, pixelCount);
    const a = new Matrix(used.length, k);
    const b = new Matrix(used.length, 1);
    used.forEach((p, e) => {
      for (let q = 0; q < k; q++) a.set(e, q, basis[q * pixelCount + p] / sigma[p]);
      b.set(e, 0, target[p] / sigma[p]);
    });
    const x = solve(a, b);
    let reference = 0;
    for (let e = 0; e < used.length; e++) {
      let r = b.get(e, 0);
      for (let q = 0; q < k; q++) r -= a.get(e, q) * x.get(q, 0);
      reference += r * r;
    }
    // Both solve the same well-conditioned 30 x 3 problem: agreement to rounding (1e-10 relative).
    expect(value).toBeCloseTo(reference, 10);
    for (let q = 0; q < k; q++) expect(chi.amplitudes[q]).toBeCloseTo(x.get(q, 0), 9);
  });

  it('gives 0 (to rounding) for a target that is a combination of the bases', () => {
    const exact = new Float64Array(pixelCount);
    for (let p = 0; p < pixelCount; p++) exact[p] = 2 * basis[p] - 0.5 * basis[pixelCount + p] + 3 * basis[2 * pixelCount + p];
    const chi = new LinearAmplitudeChiSquare(used, sigma, k);
    chi.setTarget(exact);
    expect(chi.chiSquare(basis, pixelCount)).toBeLessThan(1e-20);
    expect(Array.from(chi.amplitudes).map((v) => +v.toFixed(10))).toEqual([2, -0.5, 3]);
  });

  it('returns +Infinity when a basis is empty over the used pixels', () => {
    const empty = Float64Array.from(basis);
    for (const p of used) empty[pixelCount + p] = 0;
    const chi = new LinearAmplitudeChiSquare(used, sigma, k);
    chi.setTarget(target);
    expect(chi.chiSquare(empty, pixelCount)).toBe(Number.POSITIVE_INFINITY);
  });
});
