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
  const hull = new Set(Array.from(mesh.triangulation.hull));
  // Cotangent weights from their definition, (cot alpha + cot beta) / 2 over the angles opposite
  // each edge (Pinkall & Polthier 1993, eq. 5), computed here from the angles themselves.
  const weight = new Map<string, number>();
  for (let t = 0; t < mesh.triangulation.triangleCount; t++) {
    for (let k = 0; k < 3; k++) {
      const a = triangles[3 * t + k], b = triangles[3 * t + ((k + 1) % 3)], c = triangles[3 * t + ((k + 2) % 3)];
      const angle = Math.abs(Math.atan2(vy[a] - vy[c], vx[a] - vx[c]) - Math.atan2(vy[b] - vy[c], vx[b] - vx[c]));
      const opposite = angle > Math.PI ? 2 * Math.PI - angle : angle;
      const key = `${Math.min(a, b)},${Math.max(a, b)}`;
      weight.set(key, (weight.get(key) ?? 0) + 0.5 / Math.tan(opposite));
    }
  }

  it('gradient is the cotangent stiffness matrix plus 1 at each hull vertex', () => {
    const rows = emptyDifferenceRows();
    mesh.differenceRows('gradient', rows);
    const matrix = new RegularisationMatrix();
    const h = dense(matrix.build(rows, count));
    const expected = new Matrix(count, count);
    for (const [edge, w0] of weight) {
      const [a, b] = edge.split(',').map(Number);
      const w = w0;
      expected.set(a, b, expected.get(a, b) - w);
      expected.set(b, a, expected.get(b, a) - w);
      expected.set(a, a, expected.get(a, a) + w);
      expected.set(b, b, expected.get(b, b) + w);
    }
    for (const v of hull) expected.set(v, v, expected.get(v, v) + 1);
    expect(maxDifference(h, expected)).toBeLessThan(1e-10);
    expect(Math.abs(matrix.logDeterminant() - logDet(expected))).toBeLessThan(1e-9);
    // In the order of the cells swept along their principal axis (given their coordinates).
    const points = { x: mesh.cellX, y: mesh.cellY, count };
    expect(Math.abs(matrix.logDeterminant(points) - logDet(expected))).toBeLessThan(1e-9);
  });

  it('gradient gives the Dirichlet energy |grad s|^2 x area of a linear source on a square grid (P1 elements)', () => {
    // A 6 x 6 grid of unit spacing (slightly jittered, so the hull has slivers): for
    // s = 2x - 3y the energy sum w_ij (s_i - s_j)^2 is 13 x 25 exactly (common practice: linear
    // elements reproduce linear functions, whose Dirichlet energy is |grad s|^2 times the area).
    const n = 6;
    const gx = Float64Array.from({ length: n * n }, (_, k) => (k % n) + 1e-9 * Math.sin(k));
    const gy = Float64Array.from({ length: n * n }, (_, k) => Math.floor(k / n) + 1e-9 * Math.cos(k));
    const grid = new AdaptiveMesh();
    grid.build(gx, gy, n * n);
    const rows = emptyDifferenceRows();
    grid.differenceRows('gradient', rows);
    let energy = 0;
    for (let r = 0; r < rows.rowCount; r++) {
      if (rows.rowStart[r + 1] - rows.rowStart[r] === 1) continue;
      let v = 0;
      for (let k = rows.rowStart[r]; k < rows.rowStart[r + 1]; k++) v += rows.coefficient[k] * (2 * gx[rows.cell[k]] - 3 * gy[rows.cell[k]]);
      energy += v * v;
    }
    expect(energy).toBeCloseTo(13 * 25, 5);
  });

  it('curvature is L^T L of the cotangent-weighted mean operator plus the hull ties', () => {
    const rows = emptyDifferenceRows();
    mesh.differenceRows('curvature', rows);
    const h = dense(new RegularisationMatrix().build(rows, count));
    const neighbours = Array.from({ length: count }, () => new Map<number, number>());
    for (const [edge, w0] of weight) {
      const [a, b] = edge.split(',').map(Number);
      neighbours[a].set(b, Math.max(0, w0));
      neighbours[b].set(a, Math.max(0, w0));
    }
    const operator = new Matrix(count, count);
    for (let i = 0; i < count; i++) {
      const total = [...neighbours[i].values()].reduce((x, y) => x + y, 0);
      operator.set(i, i, 1);
      for (const [j, w] of neighbours[i]) operator.set(i, j, -w / total);
    }
    const expected = operator.transpose().mmul(operator);
    for (const v of hull) expected.set(v, v, expected.get(v, v) + 1);
    expect(maxDifference(h, expected)).toBeLessThan(1e-10);
  });
});
