import type { SeededStream } from './seededStream.js';

/** Evaluates unit-cube rows: writes their physical rows and returns sanitised ln L (-Infinity if impossible). */
export type UnitBatchEvaluator = (unit: Float64Array, count: number, physicalOut: Float64Array) => Promise<Float64Array>;

export interface SliceSettings {
  readonly dim: number;
  readonly physicalDim: number;
  /** slice moves per chain. */
  readonly steps: number;
  /** 1 where the unit coordinate wraps, else 0; null when none wraps. */
  readonly periodic: Uint8Array | null;
  /** initial bracket width in units of the whitened direction's length. */
  readonly widthScale: number;
  /** Neal's cap m on stepping-out expansions per move. */
  readonly maxExpansions: number;
}

const left = 0;
const right = 1;
const shrink = 2;
const done = 3;

/**
 * k independent slice-sampling chains run in lock-step inside the contour ln L > threshold
 * (Neal 2003, "Slice sampling", Section 4: stepping out with the cap m split at random, then
 * shrinkage; directions drawn isotropically in the space whitened by the live points' covariance,
 * after Handley, Hobson & Lasenby 2015). Each round gathers at most one pending point per chain
 * and evaluates them all in one call, so the evaluation order, and hence the result, does not
 * depend on the likelihood's parallelism. Chains start at `start*` (k rows) and end in `out*`.
 * `whitening` is the lower Cholesky factor of the live points' covariance (dim x dim). Returns the
 * number of points evaluated.
 */
export async function sliceChains(
  chains: number,
  startUnit: Float64Array,
  startPhysical: Float64Array,
  startLnL: Float64Array,
  threshold: number,
  whitening: Float64Array,
  settings: SliceSettings,
  stream: SeededStream,
  evaluate: UnitBatchEvaluator,
  outUnit: Float64Array,
  outPhysical: Float64Array,
  outLnL: Float64Array,
): Promise<number> {
  const { dim, physicalDim, steps, periodic, widthScale, maxExpansions } = settings;
  const position = Float64Array.from(startUnit.subarray(0, chains * dim));
  const positionPhysical = Float64Array.from(startPhysical.subarray(0, chains * physicalDim));
  const positionLnL = Float64Array.from(startLnL.subarray(0, chains));
  const direction = new Float64Array(chains * dim);
  const lower = new Float64Array(chains);
  const upper = new Float64Array(chains);
  const leftBudget = new Int32Array(chains);
  const rightBudget = new Int32Array(chains);
  const phase = new Uint8Array(chains);
  const moves = new Int32Array(chains);
  const batchUnit = new Float64Array(chains * dim);
  const batchPhysical = new Float64Array(chains * physicalDim);
  const rowChain = new Int32Array(chains);
  const rowStep = new Float64Array(chains);
  const gaussian = new Float64Array(dim);
  const point = new Float64Array(dim);
  let evaluations = 0;

  const startMove = (chain: number) => {
    let norm = 0;
    for (let i = 0; i < dim; i++) {
      gaussian[i] = stream.normal();
      norm += gaussian[i] * gaussian[i];
    }
    const scale = widthScale / Math.sqrt(norm);
    for (let i = 0; i < dim; i++) {
      let sum = 0;
      for (let k = 0; k <= i; k++) sum += whitening[i * dim + k] * gaussian[k];
      direction[chain * dim + i] = sum * scale;
    }
    const offset = stream.uniform();
    lower[chain] = -offset;
    upper[chain] = 1 - offset;
    const budget = Math.floor(maxExpansions * stream.uniform());
    leftBudget[chain] = budget;
    rightBudget[chain] = maxExpansions - 1 - budget;
    phase[chain] = left;
  };

  // Fills `point` with the chain's position moved by step * direction; false if it leaves the cube.
  const place = (chain: number, step: number): boolean => {
    for (let i = 0; i < dim; i++) {
      let value = position[chain * dim + i] + step * direction[chain * dim + i];
      if (periodic !== null && periodic[i] === 1) value -= Math.floor(value);
      else if (value < 0 || value > 1) return false;
      point[i] = value;
    }
    return true;
  };

  for (let chain = 0; chain < chains; chain++) {
    if (steps > 0) startMove(chain);
    else phase[chain] = done;
  }

  for (;;) {
    let rows = 0;
    for (let chain = 0; chain < chains; chain++) {
      for (;;) {
        const current = phase[chain];
        if (current === done) break;
        let step: number;
        if (current === left) {
          if (leftBudget[chain] === 0) {
            phase[chain] = right;
            continue;
          }
          step = lower[chain];
          if (!place(chain, step)) {
            phase[chain] = right;
            continue;
          }
        } else if (current === right) {
          if (rightBudget[chain] === 0) {
            phase[chain] = shrink;
            continue;
          }
          step = upper[chain];
          if (!place(chain, step)) {
            phase[chain] = shrink;
            continue;
          }
        } else {
          if (upper[chain] - lower[chain] < 1e-12) {
            // The bracket has collapsed onto the current point: the move keeps it.
            moves[chain]++;
            if (moves[chain] === steps) phase[chain] = done;
            else startMove(chain);
            continue;
          }
          step = lower[chain] + stream.uniform() * (upper[chain] - lower[chain]);
          if (!place(chain, step)) {
            if (step < 0) lower[chain] = step;
            else upper[chain] = step;
            continue;
          }
        }
        batchUnit.set(point, rows * dim);
        rowChain[rows] = chain;
        rowStep[rows] = step;
        rows++;
        break;
      }
    }
    if (rows === 0) break;
    const lnL = await evaluate(batchUnit, rows, batchPhysical);
    evaluations += rows;
    for (let row = 0; row < rows; row++) {
      const chain = rowChain[row];
      const step = rowStep[row];
      const inside = lnL[row] > threshold;
      const current = phase[chain];
      if (current === left) {
        if (inside) {
          lower[chain] -= 1;
          leftBudget[chain]--;
        } else phase[chain] = right;
      } else if (current === right) {
        if (inside) {
          upper[chain] += 1;
          rightBudget[chain]--;
        } else phase[chain] = shrink;
      } else if (inside) {
        position.set(batchUnit.subarray(row * dim, row * dim + dim), chain * dim);
        positionPhysical.set(batchPhysical.subarray(row * physicalDim, row * physicalDim + physicalDim), chain * physicalDim);
        positionLnL[chain] = lnL[row];
        moves[chain]++;
        if (moves[chain] === steps) phase[chain] = done;
        else startMove(chain);
      } else if (step < 0) lower[chain] = step;
      else upper[chain] = step;
    }
  }
  outUnit.set(position);
  outPhysical.set(positionPhysical);
  outLnL.set(positionLnL);
  return evaluations;
}
