// Regularisation matrices (src/inversion/regularMesh.ts, adaptiveMesh.ts,
// regularisationMatrix.ts) against their definitions (Suyu et al. 2006, sec. 2.4: zeroth-order,
// gradient and curvature forms; here with the source vanishing beyond the mesh), and ln det H
// against ml-matrix's Cholesky factor.
import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { AdaptiveMesh } from '../../src/inversion/adaptiveMesh.js';
import { RegularMesh } from '../../src/inversion/regularMesh.js';
import { RegularisationMatrix } from '../../src/inversion/regularisationMatrix.js';
import { emptyDifferenceRows } from '../../src/inversion/sourceMesh.js';
import type { SymmetricCsr } from '../../src/numeric/sparse/symmetricCsr.js';
import { uniformSequence } from '../support/uniformSequence.js';

function dense(h: SymmetricCsr): Matrix {
  const m = new Matrix(h.size, h.size);
  for (let i = 0; i < h.size; i++) {
    for (let k = h.rowStart[i]; k < h.rowStart[i + 1]; k++) {
      m.set(i, h.column[k], m.get(i, h.column[k]) + h.value[k]);
      if (h.column[k] !== i) m.set(h.column[k], i, m.get(h.column[k], i) + h.value[k]);
    }
  }
  return m;
}

/** Kronecker product a (x) b. */
function kron(a: Matrix, b: Matrix): Matrix {
  const out = new Matrix(a.rows * b.rows, a.columns * b.columns);
  for (let i = 0; i < a.rows; i++) for (let j = 0; j < a.columns; j++) {
    for (let k = 0; k < b.rows; k++) for (let l = 0; l < b.columns; l++) out.set(i * b.rows + k, j * b.columns + l, a.get(i, j) * b.get(k, l));
  }
  return out;
}

function tridiagonal(n: number, off: number, diagonal: number): Matrix {
  const m = new Matrix(n, n);
  for (let i = 0; i < n; i++) {
    m.set(i, i, diagonal);
    if (i + 1 < n) {
      m.set(i, i + 1, off);
      m.set(i + 1, i, off);
    }
  }
  return m;
}

function maxDifference(a: Matrix, b: Matrix): number {
  let worst = 0;
  for (let i = 0; i < a.rows; i++) for (let j = 0; j < a.columns; j++) worst = Math.max(worst, Math.abs(a.get(i, j) - b.get(i, j)));
  return worst;
}

function logDet(m: Matrix): number {
  const l = new CholeskyDecomposition(m).lowerTriangularMatrix;
  let sum = 0;
  for (let i = 0; i < m.rows; i++) sum += 2 * Math.log(l.get(i, i));
  return sum;
}

function regularH(side: number, form: 'zeroth' | 'gradient' | 'curvature'): { h: Matrix; logDet: number } {
  const mesh = new RegularMesh(side);
  const rows = emptyDifferenceRows();
  mesh.differenceRows(form, rows);
  const matrix = new RegularisationMatrix();
  const h = dense(matrix.build(rows, side * side));
  return { h, logDet: matrix.logDeterminant() };
}

describe('regularisation on a regular grid', () => {
  const n = 5;
  const identity = Matrix.eye(n);
  it('zeroth order is the identity', () => {
    expect(maxDifference(regularH(n, 'zeroth').h, Matrix.eye(n * n))).toBe(0);
  });

  it('gradient is T (x) I + I (x) T, T = tridiag(-1, 2, -1) (differences with the zero beyond the edges)', () => {
    const t = tridiagonal(n, -1, 2);
    const { h, logDet: lnDet } = regularH(n, 'gradient');
    const expected = kron(identity, t).add(kron(t, identity));
    expect(maxDifference(h, expected)).toBeLessThan(1e-12);
    expect(Math.abs(lnDet - logDet(expected))).toBeLessThan(1e-10);
  });

  it('curvature is (D^T D) (x) I + I (x) (D^T D), D = tridiag(1, -2, 1)', () => {
    const d = tridiagonal(n, 1, -2);
    const dd = d.transpose().mmul(d);
    const { h, logDet: lnDet } = regularH(n, 'curvature');
    const expected = kron(identity, dd).add(kron(dd, identity));
    expect(maxDifference(h, expected)).toBeLessThan(1e-12);
    expect(Math.abs(lnDet - logDet(expected))).toBeLessThan(1e-10);
  });

  it('interpolates bilinearly: weights sum to 1 and reproduce a linear function (common practice)', () => {
    const mesh = new RegularMesh(7);
    expect(mesh.layOver(-1, 2, 0.5, 1.5)).toBe(true);
    const random = uniformSequence(3);
    const count = 200;
    const bx = Float64Array.from({ length: count }, () => -1 + 3 * random());
    const by = Float64Array.from({ length: count }, () => 0.5 + random());
    const cells = new Int32Array(4 * count), weights = new Float64Array(4 * count);
    expect(mesh.interpolate(bx, by, count, cells, weights)).toBe(0);
    const f = (x: number, y: number) => 0.3 + 2 * x - 1.5 * y;
    for (let i = 0; i < count; i++) {
      let sum = 0, value = 0;
      for (let k = 0; k < 4; k++) {
        sum += weights[4 * i + k];
        value += weights[4 * i + k] * f(mesh.cellX[cells[4 * i + k]], mesh.cellY[cells[4 * i + k]]);
      }
      expect(Math.abs(sum - 1)).toBeLessThan(1e-12);
      expect(Math.abs(value - f(bx[i], by[i]))).toBeLessThan(1e-12);
    }
  });
});

describe('regularisation on a Delaunay mesh', () => {
  const random = uniformSequence(9);
  const count = 60;
  const vx = Float64Array.from({ length: count }, () => random());
  const vy = Float64Array.from({ length: count }, () => random());
  const mesh = new AdaptiveMesh();
  mesh.build(vx, vy, count);
  const triangles = mesh.triangulation.triangles;
  const edges = new Set<string>();
  for (let t = 0; t < mesh.triangulation.triangleCount; t++) {
    for (let k = 0; k < 3; k++) {
      const a = triangles[3 * t + k], b = triangles[3 * t + ((k + 1) % 3)];
      edges.add(`${Math.min(a, b)},${Math.max(a, b)}`);
    }
  }
  const hull = new Set(Array.from(mesh.triangulation.hull));

  it('gradient is the graph Laplacian of the triangulation plus 1 at each hull vertex', () => {
    const rows = emptyDifferenceRows();
    mesh.differenceRows('gradient', rows);
    const matrix = new RegularisationMatrix();
    const h = dense(matrix.build(rows, count));
    const expected = new Matrix(count, count);
    for (const edge of edges) {
      const [a, b] = edge.split(',').map(Number);
      expected.set(a, b, -1);
      expected.set(b, a, -1);
      expected.set(a, a, expected.get(a, a) + 1);
      expected.set(b, b, expected.get(b, b) + 1);
    }
    for (const v of hull) expected.set(v, v, expected.get(v, v) + 1);
    expect(maxDifference(h, expected)).toBeLessThan(1e-12);
    expect(Math.abs(matrix.logDeterminant() - logDet(expected))).toBeLessThan(1e-9);
  });

  it('curvature is L^T L of the umbrella operator (value less neighbours\' mean) plus the hull ties', () => {
    const rows = emptyDifferenceRows();
    mesh.differenceRows('curvature', rows);
    const h = dense(new RegularisationMatrix().build(rows, count));
    const neighbours = Array.from({ length: count }, () => new Set<number>());
    for (const edge of edges) {
      const [a, b] = edge.split(',').map(Number);
      neighbours[a].add(b);
      neighbours[b].add(a);
    }
    const umbrella = new Matrix(count, count);
    for (let i = 0; i < count; i++) {
      umbrella.set(i, i, 1);
      for (const j of neighbours[i]) umbrella.set(i, j, -1 / neighbours[i].size);
    }
    const expected = umbrella.transpose().mmul(umbrella);
    for (const v of hull) expected.set(v, v, expected.get(v, v) + 1);
    expect(maxDifference(h, expected)).toBeLessThan(1e-12);
  });
});
