// The evidence of a regularised linear inversion (src/inversion/normalMatrix.ts and
// linearEvidence.ts) against two outside routes: dense linear algebra with ml-matrix (a
// general-purpose library from the npm registry), the marginal likelihood in data space
// N(d; 0, C + R P^-1 R^T), and brute-force numerical integration over the unknowns.
import { CholeskyDecomposition, Matrix, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { DENSE_FRONT_DENSITY, LinearEvidence, NESTED_DISSECTION_DENSITY, type LinearEvidenceFactorisation } from '../../src/inversion/linearEvidence.js';
import { NormalMatrix } from '../../src/inversion/normalMatrix.js';
import { RegularisationMatrix } from '../../src/inversion/regularisationMatrix.js';
import { addDifferenceRow, emptyDifferenceRows } from '../../src/inversion/sourceMesh.js';
import { SparseRows } from '../../src/inversion/sparseRows.js';
import { uniformSequence } from '../support/uniformSequence.js';

interface Problem {
  n: number; cells: number; extras: number;
  b: SparseRows; bt: SparseRows; bDense: Matrix; lDense: Matrix; extrasPacked: Float64Array;
  w: Float64Array; d: Float64Array; lambda: number; h: Matrix; s: number;
}

/** A random problem: N pixels, S cells on a line with gradient regularisation (zero beyond both ends), K extra bases. */
function problem(n: number, cells: number, extras: number, seed: number): Problem {
  const random = uniformSequence(seed);
  const b = new SparseRows();
  b.reset(n, 4 * n);
  const bDense = new Matrix(n, cells);
  let end = 0;
  for (let e = 0; e < n; e++) {
    const first = Math.floor(random() * (cells - 1));
    const count = 1 + Math.floor(random() * Math.min(3, cells - first));
    for (let c = first; c < first + count; c++) {
      const v = 0.2 + random();
      b.column[end] = c;
      b.value[end++] = v;
      bDense.set(e, c, v);
    }
    b.rowStart[e + 1] = end;
  }
  b.rowCount = n;
  const bt = new SparseRows();
  bt.transposeOf(b, cells);
  const lDense = new Matrix(n, extras);
  const extrasPacked = new Float64Array(extras * n);
  for (let a = 0; a < extras; a++) for (let e = 0; e < n; e++) {
    const v = Math.exp(-(((e - (a + 1) * n / (extras + 1)) / (n / 6)) ** 2));
    lDense.set(e, a, v);
    extrasPacked[a * n + e] = v;
  }
  const w = Float64Array.from({ length: n }, () => 1 / (0.05 + 0.1 * random()) ** 2);
  const d = Float64Array.from({ length: n }, () => random() - 0.3);
  const h = new Matrix(cells, cells);
  for (let c = 0; c < cells; c++) h.set(c, c, 2);
  for (let c = 0; c + 1 < cells; c++) {
    h.set(c, c + 1, -1);
    h.set(c + 1, c, -1);
  }
  return { n, cells, extras, b, bt, bDense, lDense, extrasPacked, w, d, lambda: 0.7, h, s: 3 };
}

/** The gradient operator on a line, zero beyond both ends: H = tridiag(-1, 2, -1). */
function lineGradient(cells: number): ReturnType<typeof emptyDifferenceRows> {
  const rows = emptyDifferenceRows();
  addDifferenceRow(rows, [0], [1], 1);
  for (let c = 0; c + 1 < cells; c++) addDifferenceRow(rows, [c, c + 1], [-1, 1], 2);
  addDifferenceRow(rows, [cells - 1], [-1], 1);
  return rows;
}

function logDet(m: Matrix): number {
  const l = new CholeskyDecomposition(m).lowerTriangularMatrix;
  let sum = 0;
  for (let i = 0; i < m.rows; i++) sum += 2 * Math.log(l.get(i, i));
  return sum;
}

/** The normal matrix of a problem and ln det P. */
function normalOf(p: Problem): { normal: NormalMatrix; logDetPrior: number } {
  const regularisation = new RegularisationMatrix();
  const h = regularisation.build(lineGradient(p.cells), p.cells);
  const logDetH = regularisation.logDeterminant();
  const normal = new NormalMatrix();
  normal.build(p.b, p.bt, p.cells, p.w, p.d, h, p.lambda, p.extrasPacked, p.extras, 1 / (p.s * p.s));
  return { normal, logDetPrior: p.cells * Math.log(p.lambda) + logDetH - p.extras * Math.log(p.s * p.s) };
}

/** The cells' coordinates on their line. */
function linePoints(cells: number): { x: Float64Array; y: Float64Array; count: number } {
  return { x: Float64Array.from({ length: cells }, (_, c) => c), y: new Float64Array(cells), count: cells };
}

/** ln Z by the code under test (without `withPoints`, the cells' coordinates are not given). */
function evidenceOf(p: Problem, factorisation: LinearEvidenceFactorisation = 'automatic', withPoints = true): number {
  const { normal, logDetPrior } = normalOf(p);
  return new LinearEvidence(p.d, p.w, factorisation).evaluate(normal, p.extras, logDetPrior, withPoints ? linePoints(p.cells) : null);
}

/** ln N(d; 0, C + R P^-1 R^T): the same evidence computed in data space. */
function dataSpaceEvidence(p: Problem): number {
  const r = Matrix.zeros(p.n, p.cells + p.extras);
  r.setSubMatrix(p.bDense, 0, 0);
  if (p.extras > 0) r.setSubMatrix(p.lDense, 0, p.cells);
  const prior = Matrix.zeros(p.cells + p.extras, p.cells + p.extras);
  prior.setSubMatrix(p.h.clone().mul(p.lambda), 0, 0);
  for (let a = 0; a < p.extras; a++) prior.set(p.cells + a, p.cells + a, 1 / (p.s * p.s));
  const covariance = r.mmul(inverse(prior)).mmul(r.transpose());
  for (let e = 0; e < p.n; e++) covariance.set(e, e, covariance.get(e, e) + 1 / p.w[e]);
  const symmetric = covariance.clone().add(covariance.transpose()).mul(0.5);
  const dv = Matrix.columnVector(Array.from(p.d));
  const quadratic = dv.transpose().mmul(inverse(covariance)).mmul(dv).get(0, 0);
  return -0.5 * (p.n * Math.log(2 * Math.PI) + logDet(symmetric) + quadratic);
}

/** The dense A of a normal matrix, from its stored lower triangle. */
function denseOfNormal(normal: NormalMatrix): Matrix {
  const a = new Matrix(normal.size, normal.size);
  for (let i = 0; i < normal.size; i++) for (let k = normal.rowStart[i]; k < normal.rowStart[i + 1]; k++) {
    a.set(i, normal.column[k], normal.value[k]);
    a.set(normal.column[k], i, normal.value[k]);
  }
  return a;
}

describe('the evidence of a regularised linear inversion', () => {
  it('equals the marginal likelihood in data space (ml-matrix) to 1e-9 relative', () => {
    // Two routes to one Gaussian integral: A = P + R^T W R in the unknowns' space (the code) and
    // the N x N covariance C + R P^-1 R^T in data space (Woodbury's identity makes them equal).
    // Both round at ~1e-13 relative here; 1e-9 leaves room for the conditioning of A.
    // Each factorisation, and the automatic choice, on each problem; the 150-cell problem is
    // sparse enough for the automatic choice to take the nested dissection.
    const factorisations: LinearEvidenceFactorisation[] = ['automatic', 'nestedDissection', 'profileChain', 'envelope', 'dense'];
    for (const [n, cells, extras, seed] of [[40, 6, 2, 3], [60, 12, 0, 5], [30, 3, 1, 8], [400, 150, 2, 21]] as const) {
      const p = problem(n, cells, extras, seed);
      const expected = dataSpaceEvidence(p);
      for (const factorisation of factorisations) {
        expect(Math.abs(evidenceOf(p, factorisation) - expected)).toBeLessThan(1e-9 * Math.abs(expected));
      }
      // Without coordinates the profile order is reverse Cuthill-McKee's instead of the sweep's.
      expect(Math.abs(evidenceOf(p, 'profileChain', false) - expected)).toBeLessThan(1e-9 * Math.abs(expected));
    }
  });

  it('takes the nested dissection for a sparse A, the profile chain between, one dense front for a full one', () => {
    // Stored fractions (2 nnz - n) / n^2: 0.06 (150 cells, 2 dense rows), 0.24 (20 cells), 1
    // (6 cells, 2 dense rows); the thresholds are NESTED_DISSECTION_DENSITY and DENSE_FRONT_DENSITY.
    const cases = [[problem(400, 150, 2, 21), 'nestedDissection'], [problem(60, 20, 0, 5), 'profileChain'], [problem(40, 6, 2, 3), 'dense']] as const;
    for (const [p, expected] of cases) {
      const { normal, logDetPrior } = normalOf(p);
      const n = normal.size;
      const fraction = (2 * normal.rowStart[n] - n) / (n * n);
      expect(fraction < NESTED_DISSECTION_DENSITY || expected !== 'nestedDissection').toBe(true);
      expect(fraction >= DENSE_FRONT_DENSITY || expected !== 'dense').toBe(true);
      const evidence = new LinearEvidence(p.d, p.w);
      evidence.evaluate(normal, p.extras, logDetPrior, linePoints(p.cells));
      expect(evidence.lastFactorisation).toBe(expected);
    }
  });

  it('keeps an analysis for the same pattern and points only, with the result of a fresh one', () => {
    // New values on the same pattern (inverse variances scaled): a kept analysis must give what a
    // fresh instance gives, bit for bit (same ordering, same operations). Then the same pattern
    // with moved points must be ordered afresh: again equal to a fresh instance.
    const sparse = problem(400, 150, 2, 21);
    const first = normalOf(sparse);
    const scaled = { ...sparse, w: sparse.w.map((v) => 1.7 * v) };
    const again = normalOf(scaled);
    const moved = linePoints(scaled.cells);
    for (let c = 0; c < scaled.cells; c++) moved.x[c] = c < 75 ? 149 - c : c - 75;
    for (const factorisation of ['nestedDissection', 'profileChain'] as const) {
      const kept = new LinearEvidence(scaled.d, scaled.w, factorisation);
      kept.evaluate(first.normal, sparse.extras, first.logDetPrior, linePoints(sparse.cells));
      const reused = kept.evaluate(again.normal, scaled.extras, again.logDetPrior, linePoints(scaled.cells));
      const fresh = new LinearEvidence(scaled.d, scaled.w, factorisation).evaluate(again.normal, scaled.extras, again.logDetPrior, linePoints(scaled.cells));
      expect(reused).toBe(fresh);
      expect(Math.abs(reused - dataSpaceEvidence(scaled))).toBeLessThan(1e-9 * Math.abs(reused));
      const reordered = kept.evaluate(again.normal, scaled.extras, again.logDetPrior, moved);
      expect(reordered).toBe(new LinearEvidence(scaled.d, scaled.w, factorisation).evaluate(again.normal, scaled.extras, again.logDetPrior, moved));
    }
  });

  it('gives the diagonal of A^-1 of ml-matrix with every factorisation', () => {
    // Posterior variances of the 150-cell problem against ml-matrix's inverse of the dense A
    // (built from the stored lower triangle). A's condition number is 2.5e3 (ml-matrix's SVD),
    // so either route rounds at ~1e-12 relative; 1e-10 leaves a margin and no more.
    const p = problem(400, 150, 2, 21);
    const { normal, logDetPrior } = normalOf(p);
    const size = normal.size;
    const a = denseOfNormal(normal);
    const expected = inverse(a);
    for (const factorisation of ['nestedDissection', 'profileChain', 'envelope', 'dense'] as const) {
      const evidence = new LinearEvidence(p.d, p.w, factorisation);
      evidence.evaluate(normal, p.extras, logDetPrior, linePoints(p.cells));
      expect(evidence.lastFactorisation).toBe(factorisation);
      const variance = new Float64Array(size);
      evidence.inverseDiagonal(variance);
      for (let i = 0; i < size; i++) expect(Math.abs(variance[i] - expected.get(i, i))).toBeLessThan(1e-10 * expected.get(i, i));
    }
  });

  it('gives the posterior mean A^-1 b of ml-matrix with every factorisation, read before or after the variances', () => {
    // ln Z takes b^T A^-1 b from the forward substitution alone; the back substitution runs when
    // `solution` is first read, from the forward half's vector kept in the factorisation, which
    // inverseDiagonal in between must leave alone. Reference: ml-matrix's solve of the dense A.
    const p = problem(400, 150, 2, 23);
    const { normal, logDetPrior } = normalOf(p);
    const size = normal.size;
    const a = denseOfNormal(normal);
    const expected = new CholeskyDecomposition(a).solve(Matrix.columnVector(Array.from(normal.rhs.subarray(0, size)))).getColumn(0);
    const scale = Math.max(...expected.map(Math.abs));
    for (const factorisation of ['nestedDissection', 'profileChain', 'envelope', 'dense'] as const) {
      for (const variancesFirst of [false, true]) {
        const evidence = new LinearEvidence(p.d, p.w, factorisation);
        evidence.evaluate(normal, p.extras, logDetPrior, linePoints(p.cells));
        if (variancesFirst) evidence.inverseDiagonal(new Float64Array(size));
        const mean = evidence.solution;
        for (let i = 0; i < size; i++) expect(Math.abs(mean[i] - expected[i]), `${factorisation}, variances first ${variancesFirst}: ${i}`).toBeLessThan(1e-10 * scale);
      }
    }
  });

  it('equals brute-force integration over two cells to 1e-6', () => {
    // Trapezoid rule over +-10 posterior widths on a 600 x 600 grid; the integrand is a Gaussian,
    // so the rule's error is far below the 1e-6 asked.
    const p = problem(5, 2, 0, 11);
    const h = p.h.clone().mul(p.lambda);
    const logPrior = (s0: number, s1: number) => 0.5 * logDet(h) - Math.log(2 * Math.PI)
      - 0.5 * (h.get(0, 0) * s0 * s0 + 2 * h.get(0, 1) * s0 * s1 + h.get(1, 1) * s1 * s1);
    const logLike = (s0: number, s1: number) => {
      let sum = 0;
      for (let e = 0; e < p.n; e++) {
        const r = p.d[e] - p.bDense.get(e, 0) * s0 - p.bDense.get(e, 1) * s1;
        sum += -0.5 * Math.log((2 * Math.PI) / p.w[e]) - 0.5 * p.w[e] * r * r;
      }
      return sum;
    };
    const size = 600;
    const half = 10 / Math.sqrt(Math.min(...p.w) * 0.04 + p.lambda);
    const step = (2 * half) / (size - 1);
    const values: number[] = [];
    for (let i = 0; i < size; i++) for (let j = 0; j < size; j++) {
      const s0 = -half + i * step, s1 = -half + j * step;
      values.push(logLike(s0, s1) + logPrior(s0, s1));
    }
    const top = values.reduce((a, b) => Math.max(a, b), -Infinity);
    let sum = 0;
    for (let i = 0; i < size; i++) for (let j = 0; j < size; j++) {
      const edge = (i === 0 || i === size - 1 ? 0.5 : 1) * (j === 0 || j === size - 1 ? 0.5 : 1);
      sum += edge * Math.exp(values[i * size + j] - top);
    }
    const bruteForce = top + Math.log(sum * step * step);
    expect(Math.abs(evidenceOf(p) - bruteForce)).toBeLessThan(1e-6);
  });

  it('builds the normal matrix row by row above the dense limit as the definition says', () => {
    // 1,700 cells take the sparse row-by-row path (the tests above take the dense one): its
    // entries against B^T W B + lambda H formed from the dense B.
    const p = problem(400, 1700, 1, 13);
    const normal = new NormalMatrix();
    const regularisation = new RegularisationMatrix();
    const h = regularisation.build(lineGradient(p.cells), p.cells);
    normal.build(p.b, p.bt, p.cells, p.w, p.d, h, p.lambda, p.extrasPacked, p.extras, 1 / (p.s * p.s));
    // Entry by entry against B^T W B + lambda H computed from the dense B.
    const bw = p.bDense.clone();
    for (let e = 0; e < p.n; e++) for (let c = 0; c < p.cells; c++) bw.set(e, c, bw.get(e, c) * p.w[e]);
    let worst = 0;
    for (let j = 0; j < p.cells; j += 17) {
      const row = new Map<number, number>();
      for (let k = normal.rowStart[j]; k < normal.rowStart[j + 1]; k++) row.set(normal.column[k], normal.value[k]);
      for (let c = Math.max(0, j - 3); c <= j; c++) {
        let expected = p.lambda * p.h.get(j, c);
        for (let e = 0; e < p.n; e++) expected += bw.get(e, j) * p.bDense.get(e, c);
        worst = Math.max(worst, Math.abs((row.get(c) ?? 0) - expected));
      }
    }
    expect(worst).toBeLessThan(1e-9);
    // b = [B^T W d, L^T W d] and the amplitude row's L^T W B against the dense B and L.
    let worstProjection = 0;
    for (let j = 0; j < p.cells; j += 7) {
      let rhs = 0, amplitude = 0;
      for (let e = 0; e < p.n; e++) {
        rhs += bw.get(e, j) * p.d[e];
        amplitude += bw.get(e, j) * p.lDense.get(e, 0);
      }
      const last = p.cells;
      worstProjection = Math.max(worstProjection, Math.abs(normal.rhs[j] - rhs), Math.abs(normal.value[normal.rowStart[last] + j] - amplitude));
      expect(normal.column[normal.rowStart[last] + j]).toBe(j);
    }
    expect(worstProjection).toBeLessThan(1e-9);
    // Without B^T from the caller the matrix makes its own: the same entries to the bit.
    const own = new NormalMatrix();
    own.build(p.b, null, p.cells, p.w, p.d, h, p.lambda, p.extrasPacked, p.extras, 1 / (p.s * p.s));
    const stored = normal.rowStart[normal.size];
    expect(Array.from(own.rowStart.subarray(0, normal.size + 1))).toEqual(Array.from(normal.rowStart.subarray(0, normal.size + 1)));
    expect(Array.from(own.column.subarray(0, stored))).toEqual(Array.from(normal.column.subarray(0, stored)));
    expect(Array.from(own.value.subarray(0, stored))).toEqual(Array.from(normal.value.subarray(0, stored)));
    expect(Array.from(own.rhs.subarray(0, normal.size))).toEqual(Array.from(normal.rhs.subarray(0, normal.size)));
  });
});
