import { createRequire } from 'node:module';
import type randuType from '@stdlib/random/base/randu';
import { EnvelopeCholesky } from '../numeric/sparse/envelopeCholesky.js';
import { envelopeInverseDiagonal } from '../numeric/sparse/envelopeInverseDiagonal.js';
import { MultifrontalCholesky } from '../numeric/sparse/multifrontalCholesky.js';
import { NestedDissection } from '../numeric/sparse/nestedDissection.js';
import { ReverseCuthillMcKee } from '../numeric/sparse/reverseCuthillMcKee.js';
import { SupernodeChain } from '../numeric/sparse/supernodeChain.js';
import type { SupernodeTree } from '../numeric/sparse/supernodeTree.js';
import { SymmetricSparseAccumulator } from '../numeric/sparse/symmetricSparseAccumulator.js';
import type { SymmetricCsr } from '../numeric/sparse/symmetricCsr.js';
import { benchOption, wholeNumberOption } from './benchOptions.js';
import { discNormalMatrix, type DiscNormalMatrix } from './discNormalMatrix.js';
import { bestMillisecondsPerCall } from './forward.js';

// @stdlib packages are CommonJS folders without an exports map: Node's ESM loader needs require.
const require = createRequire(import.meta.url);
const randu = require('@stdlib/random/base/randu') as typeof randuType;

/** Contributions (row, column, value) to a symmetric matrix, as a likelihood call would add them. */
class Contributions {
  rows: number[] = [];
  columns: number[] = [];
  values: number[] = [];

  /** Adds w w^T over the listed indices (each unordered pair once). */
  addOuterProduct(index: readonly number[], weight: readonly number[]): void {
    for (let a = 0; a < index.length; a++) {
      for (let b = 0; b <= a; b++) {
        this.rows.push(index[a]);
        this.columns.push(index[b]);
        this.values.push(weight[a] * weight[b]);
      }
    }
  }

  /** Resets `accumulator` to order n, adds every contribution, compresses. */
  accumulate(accumulator: SymmetricSparseAccumulator, n: number): SymmetricCsr {
    accumulator.reset(n);
    const { rows, columns, values } = this;
    for (let t = 0; t < rows.length; t++) accumulator.add(rows[t], columns[t], values[t]);
    return accumulator.compress();
  }
}

/**
 * A regularised pixelated-source system: A = B^T B + H + prior precision of the extras, on
 * `cells` source cells and `extras` dense linear amplitudes; H = D^T D, D a discrete Laplacian
 * (curvature regularisation). Each image pixel's row of B holds random positive weights on its
 * source cells (interpolation and PSF) and random basis values on every extra amplitude.
 */
interface SourceSystem {
  readonly name: string;
  readonly cells: number;
  readonly extras: number;
  readonly full: Contributions;
  readonly regularisation: Contributions;
}

/**
 * A k x k regular grid: one pixel per cell sees the 3 x 3 block around it, so B^T B couples
 * cells up to two apart (a 5 x 5 box, 25 nonzeros per row); D is the 5-point Laplacian.
 */
function gridSystem(k: number, extras: number, uniform: () => number): SourceSystem {
  const cells = k * k;
  const within = (x: number, y: number): boolean => x >= 0 && y >= 0 && x < k && y < k;
  const curvature = new Contributions();
  for (let y = 0; y < k; y++) {
    for (let x = 0; x < k; x++) {
      const index = [y * k + x];
      for (const [dx, dy] of [[-1, 0], [1, 0], [0, -1], [0, 1]]) if (within(x + dx, y + dy)) index.push((y + dy) * k + x + dx);
      curvature.addOuterProduct(index, index.map((_, t) => (t === 0 ? -4 : 1)));
    }
  }
  const pixelCells: number[][] = [];
  for (let y = 0; y < k; y++) {
    for (let x = 0; x < k; x++) {
      const index: number[] = [];
      for (let dy = -1; dy <= 1; dy++) for (let dx = -1; dx <= 1; dx++) if (within(x + dx, y + dy)) index.push((y + dy) * k + x + dx);
      pixelCells.push(index);
    }
  }
  return withData(`${k}x${k} grid + ${extras} dense`, cells, extras, curvature, pixelCells, uniform);
}

/**
 * `cells` cells at random points of the unit square (like an adaptive grid): D joins each cell
 * to the cells within radius 0.045 (about 6), its diagonal one more than their count (as at a
 * zero boundary, so that H is positive definite); each of 2 x cells random pixels sees the
 * cells within 0.05 of it (about 8), so B^T B couples cells up to 0.1 apart (about 30 per row).
 */
function scatteredSystem(cells: number, extras: number, uniform: () => number): SourceSystem {
  const xs = Array.from({ length: cells }, () => uniform());
  const ys = Array.from({ length: cells }, () => uniform());
  const near = (x: number, y: number, radius: number): number[] => {
    const found: number[] = [];
    for (let c = 0; c < cells; c++) if ((xs[c] - x) ** 2 + (ys[c] - y) ** 2 < radius * radius) found.push(c);
    return found;
  };
  const curvature = new Contributions();
  for (let c = 0; c < cells; c++) {
    const index = [c, ...near(xs[c], ys[c], 0.045).filter((d) => d !== c)];
    curvature.addOuterProduct(index, index.map((_, t) => (t === 0 ? -index.length : 1)));
  }
  const pixelCells = Array.from({ length: 2 * cells }, () => near(uniform(), uniform(), 0.05));
  return withData(`${cells} scattered cells + ${extras} dense`, cells, extras, curvature, pixelCells, uniform);
}

/** Adds B^T B (pixels' cells with random weights, extras with random basis values) and the extras' prior to H. */
function withData(
  name: string, cells: number, extras: number, curvature: Contributions, pixelCells: number[][], uniform: () => number,
): SourceSystem {
  const full = new Contributions();
  full.rows = [...curvature.rows];
  full.columns = [...curvature.columns];
  full.values = [...curvature.values];
  for (let e = 0; e < extras; e++) full.addOuterProduct([cells + e], [0.1]);
  for (const index of pixelCells) {
    const extraIndex = Array.from({ length: extras }, (_, e) => cells + e);
    full.addOuterProduct([...index, ...extraIndex], [...index, ...extraIndex].map(() => uniform()));
  }
  return { name, cells, extras, full, regularisation: curvature };
}

function rounded(ms: number): number {
  return Number(ms.toPrecision(3));
}

/**
 * `npm run bench -- sparseCholesky [--repeats N] [--only TEXT]`: milliseconds (best of N,
 * default 10, runs of ~60 ms, one thread) of each step of the sparse kernel, one JSON line per
 * scenario (those whose name holds TEXT with --only).
 *
 * On regularised-source systems: accumulate (reset, adds, compress), order (reverse
 * Cuthill-McKee, extras last), analyse, factor, solve, their sum without accumulate, order +
 * analyse + factor of H alone (ln det H), the envelope size, and one inverse diagonal (the
 * report's). Regular grids also give the envelope and factor time of the natural ordering
 * (grid rows, extras last).
 *
 * On discs (discNormalMatrix: the PSF's wide coupling, ~190 neighbours for 930 cells as an
 * adaptive mesh, ~540 for 4100 as a regular 64 x 64 grid, one dense row): the envelope
 * Cholesky in reverse Cuthill-McKee order against the multifrontal Cholesky over nested
 * dissection and over a chain of blocks in the same reverse Cuthill-McKee order (compareOnDisc).
 */
export async function run(args: string[]): Promise<void> {
  const repeats = wholeNumberOption(args, '--repeats', 10);
  const only = benchOption(args, '--only') ?? '';
  const uniform = randu.factory({ name: 'mt19937', seed: 1 });
  const systems = [gridSystem(32, 5, uniform), scatteredSystem(1000, 5, uniform), gridSystem(64, 5, uniform)].filter((s) => s.name.includes(only));
  const time = (f: () => void): number => bestMillisecondsPerCall(f, repeats).ms;
  for (const [cells, neighbours] of [[930, 190], [4100, 540]]) {
    const name = `disc ${cells} cells, ~${neighbours} neighbours + 1 dense`;
    if (name.includes(only)) compareOnDisc(name, discNormalMatrix(cells, neighbours, 1, uniform), repeats);
  }
  for (const system of systems) {
    const n = system.cells + system.extras;
    const accumulator = new SymmetricSparseAccumulator();
    const rcm = new ReverseCuthillMcKee();
    const cholesky = new EnvelopeCholesky();
    const last = Array.from({ length: system.extras }, (_, e) => system.cells + e);
    const order = new Int32Array(n);
    const b = Float64Array.from({ length: n }, (_, i) => Math.sin(i));
    const x = new Float64Array(n);
    const accumulateMs = time(() => system.full.accumulate(accumulator, n));
    const matrix = system.full.accumulate(accumulator, n);
    const orderMs = time(() => rcm.order(matrix, order, last));
    const analyseMs = time(() => cholesky.analyse(matrix, order));
    const factorMs = time(() => cholesky.factor(matrix));
    const logDet = cholesky.factor(matrix);
    const solveMs = time(() => cholesky.solve(b, x));
    const inverseStart = performance.now();
    envelopeInverseDiagonal(cholesky, new Float64Array(n));
    const inverseDiagonalMs = performance.now() - inverseStart;
    const h = system.regularisation.accumulate(new SymmetricSparseAccumulator(), system.cells);
    const hCholesky = new EnvelopeCholesky();
    const hOrder = new Int32Array(system.cells);
    const regularisationMs = time(() => {
      hCholesky.analyse(h, rcm.order(h, hOrder));
      hCholesky.factor(h);
    });
    const natural = new EnvelopeCholesky();
    const grid = system.name.includes('grid');
    const naturalEnvelope = grid ? natural.analyse(matrix, Int32Array.from({ length: n }, (_, i) => i)) : undefined;
    const naturalFactorMs = grid ? rounded(time(() => natural.factor(matrix))) : undefined;
    console.log(JSON.stringify({
      benchmark: 'sparseCholesky',
      scenario: system.name,
      size: n,
      storedLowerPerRow: rounded(matrix.rowStart[n] / n),
      contributions: accumulator.contributions,
      accumulateMs: rounded(accumulateMs),
      orderMs: rounded(orderMs),
      analyseMs: rounded(analyseMs),
      factorMs: rounded(factorMs),
      solveMs: rounded(solveMs),
      orderAnalyseFactorSolveMs: rounded(orderMs + analyseMs + factorMs + solveMs),
      regularisationOrderAnalyseFactorMs: rounded(regularisationMs),
      envelope: cholesky.envelopeSize,
      naturalEnvelope,
      naturalFactorMs,
      logDet: rounded(logDet),
      regularisationLogDet: rounded(hCholesky.factor(h)),
      inverseDiagonalMsOnce: rounded(inverseDiagonalMs),
      repeats,
    }));
  }
}

/** Times of one sparse Cholesky on a disc scenario (CPU milliseconds, best of the repeats). */
interface MethodTimes {
  orderMs: number;
  analyseMs: number;
  factorMs: number;
  solveMs: number;
  factorEntries: number;
  megaflops: number;
  gigaflopsPerSecond: number;
}

/**
 * One JSON line: the envelope Cholesky (reverse Cuthill-McKee), the multifrontal Cholesky over
 * nested dissection (coordinates of the cells, dense rows in the root) and over a chain of blocks
 * (reverse Cuthill-McKee), each with ordering, analysis, factor and solve times, the entries of L
 * and the operations of a factor (sum over columns of L of their entries squared).
 */
function compareOnDisc(name: string, disc: DiscNormalMatrix, repeats: number): void {
  const { matrix, cells } = disc;
  const n = matrix.size;
  const dense = Array.from({ length: n - cells }, (_, t) => cells + t);
  const cpu = (f: () => void): number => bestMillisecondsPerCall(f, repeats).cpuMs;
  const b = Float64Array.from({ length: n }, (_, i) => Math.sin(i));
  const x = new Float64Array(n);
  const order = new Int32Array(n);
  const rcm = new ReverseCuthillMcKee();
  const envelope = new EnvelopeCholesky();
  const envelopeOrderMs = cpu(() => rcm.order(matrix, order, dense));
  const envelopeAnalyseMs = cpu(() => envelope.analyse(matrix, order));
  const envelopeTimes = methodTimes(envelopeOrderMs, envelopeAnalyseMs, cpu(() => envelope.factor(matrix)), cpu(() => envelope.solve(b, x)), envelope.envelopeSize, envelope.flops);
  const dissection = new NestedDissection();
  let tree: SupernodeTree = dissection.order(matrix, { x: disc.x, y: disc.y, count: cells }, dense, order);
  const dissectionOrderMs = cpu(() => (tree = dissection.order(matrix, { x: disc.x, y: disc.y, count: cells }, dense, order)));
  const multifrontal = multifrontalTimes(matrix, order, tree, dissectionOrderMs, cpu, b, x);
  const chainOrder = rcm.order(matrix, new Int32Array(n), dense);
  const chain = multifrontalTimes(matrix, chainOrder, new SupernodeChain().build(n), envelopeOrderMs, cpu, b, x);
  console.log(JSON.stringify({
    benchmark: 'sparseCholesky',
    scenario: name,
    size: n,
    storedLowerPerRow: rounded(matrix.rowStart[n] / n),
    envelope: envelopeTimes,
    nestedDissection: multifrontal,
    chain,
    factorSpeedUp: rounded(envelopeTimes.factorMs / Math.min(multifrontal.factorMs, chain.factorMs)),
    repeats,
  }));
}

function multifrontalTimes(
  matrix: SymmetricCsr, order: Int32Array, tree: SupernodeTree, orderMs: number, cpu: (f: () => void) => number, b: Float64Array, x: Float64Array,
): MethodTimes {
  const cholesky = new MultifrontalCholesky();
  const analyseMs = cpu(() => cholesky.analyse(matrix, order, tree));
  const factorMs = cpu(() => cholesky.factor(matrix));
  return methodTimes(orderMs, analyseMs, factorMs, cpu(() => cholesky.solve(b, x)), cholesky.factorEntries, cholesky.flops);
}

function methodTimes(orderMs: number, analyseMs: number, factorMs: number, solveMs: number, factorEntries: number, flops: number): MethodTimes {
  return {
    orderMs: rounded(orderMs),
    analyseMs: rounded(analyseMs),
    factorMs: rounded(factorMs),
    solveMs: rounded(solveMs),
    factorEntries,
    megaflops: rounded(flops / 1e6),
    gigaflopsPerSecond: rounded(flops / factorMs / 1e6),
  };
}
