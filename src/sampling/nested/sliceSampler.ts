import { SeededStream } from '../../numeric/random/seededStream.js';

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
  /**
   * Points each chain puts into one round (s >= 1; default 1): bracket ends of both sides and the
   * next expansions while stepping out, s candidates at once while shrinking. Only the number of
   * evaluations and rounds depends on it, never the law of the draws.
   */
  readonly pointsPerChain?: number;
}

const stepping = 0;
const shrinking = 1;
const done = 2;

const leftEnd = 0;
const rightEnd = 1;
const candidate = 2;

/** Seeds of k slice chains' own streams, drawn from `stream` in chain order (as sliceChains does). */
export function sliceChainSeeds(stream: SeededStream, chains: number): number[] {
  const seeds: number[] = [];
  for (let chain = 0; chain < chains; chain++) seeds.push(1 + Math.floor(stream.uniform() * 0xfffffffe));
  return seeds;
}

/** One slice chain, as plain data that can be posted to a worker thread. */
export interface SliceChainRequest {
  readonly seed: number;
  readonly startUnit: Float64Array;
  readonly startPhysical: Float64Array;
  readonly startLnL: number;
  readonly threshold: number;
  readonly whitening: Float64Array;
  readonly settings: SliceSettings;
}

/** Where a slice chain ended, and what it cost. */
export interface SliceChainResult {
  readonly unit: Float64Array;
  readonly physical: Float64Array;
  readonly lnL: number;
  readonly evaluations: number;
  /** Evaluations whose ln L was NaN or infinite (counted by the evaluator that ran the chain). */
  readonly nonFinite: number;
}

/** The chain of `request` run alone, exactly as it would run among others in sliceChains. */
export async function runSliceChain(
  request: SliceChainRequest, evaluate: UnitBatchEvaluator,
): Promise<Omit<SliceChainResult, 'nonFinite'>> {
  const { dim, physicalDim } = request.settings;
  const unit = new Float64Array(dim);
  const physical = new Float64Array(physicalDim);
  const lnL = new Float64Array(1);
  const evaluations = await sliceChains(
    1, request.startUnit, request.startPhysical, Float64Array.of(request.startLnL), request.threshold, request.whitening,
    request.settings, [request.seed], evaluate, unit, physical, lnL,
  );
  return { unit, physical, lnL: lnL[0], evaluations };
}

/**
 * k independent slice-sampling chains inside the contour ln L > threshold (Neal 2003, "Slice
 * sampling", Section 4: stepping out with the cap m split at random, then shrinkage; directions
 * drawn isotropically in the space whitened by the live points' covariance, after Handley, Hobson
 * & Lasenby 2015). Each chain draws from its own stream, seeded from `stream` in chain order, and
 * sends its points to `evaluate` as soon as its previous answer is back, so the chains keep a
 * worker pool busy without waiting for each other, and each chain's path, hence the result,
 * depends on s but never on the likelihood's parallelism or timing. Each call carries up to s
 * points of one chain; with s > 1 they are speculative and the chain stays exact: stepping out
 * tests the left and right ends (and further expansions) at once and keeps the first outside
 * point on each side, as the sequential procedure would; shrinkage draws s candidates uniformly
 * from the bracket and takes them in draw order, a rejected one shrinking the bracket, and a later
 * one counting only if it lies inside the shrunk bracket, where it is a uniform draw from it
 * (rejection sampling), else being discarded. With s = 1 each chain follows Neal's sequential
 * procedure draw for draw. Instead of `stream`, the chains' seeds may be given (sliceChainSeeds):
 * a chain then runs alone exactly as it would among others (runSliceChain).
 * Chains start at `start*` (k rows) and end in `out*`. `whitening` is
 * the lower Cholesky factor of the live points' covariance (dim x dim). Returns the number of
 * points evaluated; `chainEvaluations`, when given, receives each chain's share.
 */
export async function sliceChains(
  chains: number,
  startUnit: Float64Array,
  startPhysical: Float64Array,
  startLnL: Float64Array,
  threshold: number,
  whitening: Float64Array,
  settings: SliceSettings,
  stream: SeededStream | readonly number[],
  evaluate: UnitBatchEvaluator,
  outUnit: Float64Array,
  outPhysical: Float64Array,
  outLnL: Float64Array,
  chainEvaluations?: Int32Array,
): Promise<number> {
  const { dim, physicalDim, steps, periodic, widthScale, maxExpansions } = settings;
  const perChain = settings.pointsPerChain ?? 1;
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
  // The round's entries of each chain in order: kind, step along the direction, batch row (-1:
  // known to be outside without evaluation, because it leaves the cube).
  const entryCount = new Int32Array(chains);
  const entryKind = new Uint8Array(chains * perChain);
  const entryStep = new Float64Array(chains * perChain);
  const entryRow = new Int32Array(chains * perChain);
  const batchUnit = new Float64Array(chains * perChain * dim);
  const batchPhysical = new Float64Array(chains * perChain * physicalDim);
  const gaussian = new Float64Array(dim);
  const point = new Float64Array(dim);
  // Stepping out: expansions listed this round and whether each side is still open (by side).
  const listed = new Int32Array(2);
  const open = new Uint8Array(2);
  const seeds = stream instanceof SeededStream ? sliceChainSeeds(stream, chains) : stream;
  const streams = Array.from({ length: chains }, (_, chain) => SeededStream.fromSeed(seeds[chain]));
  let evaluations = 0;

  const startMove = (chain: number) => {
    const stream = streams[chain];
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
    phase[chain] = stepping;
  };

  // The chain has accepted a point (or kept its own): next move, or done.
  const endMove = (chain: number) => {
    moves[chain]++;
    if (moves[chain] === steps) phase[chain] = done;
    else startMove(chain);
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

  // One chain to the end of its moves: list its next points (entries), evaluate them in one
  // call, take the answers in order. Listing and taking are synchronous, so the chains, which
  // interleave only while awaiting, can share the scratch `point`, `gaussian`, `listed`, `open`.
  const runChain = async (chain: number): Promise<void> => {
    const base = chain * perChain;
    const chainUnit = batchUnit.subarray(base * dim, (base + perChain) * dim);
    const chainPhysical = batchPhysical.subarray(base * physicalDim, (base + perChain) * physicalDim);
    let entries = 0;
    let rows = 0;
    // Lists a step as the chain's next entry; `evaluated`: `point` holds it and goes to the call.
    const addEntry = (kind: number, step: number, evaluated: boolean) => {
      entryKind[base + entries] = kind;
      entryStep[base + entries] = step;
      if (evaluated) {
        chainUnit.set(point, rows * dim);
        entryRow[base + entries] = rows++;
      } else entryRow[base + entries] = -1;
      entries++;
    };
    for (;;) {
      entries = 0;
      rows = 0;
      // Known outcomes (an end or candidate off the cube) are applied at once while nothing is
      // pending, and listed as unevaluated entries behind pending ones.
      while (entries < perChain && phase[chain] !== done) {
        if (phase[chain] === stepping) {
          // Alternate the sides, listing each side's next expansions until it is closed (its
          // budget used, or a step off the cube).
          listed[leftEnd] = listed[rightEnd] = 0;
          open[leftEnd] = leftBudget[chain] > 0 ? 1 : 0;
          open[rightEnd] = rightBudget[chain] > 0 ? 1 : 0;
          let side = leftEnd;
          while (entries < perChain && (open[leftEnd] === 1 || open[rightEnd] === 1)) {
            if (open[side] === 0) side = 1 - side;
            const budget = side === leftEnd ? leftBudget : rightBudget;
            const step = side === leftEnd ? lower[chain] - listed[side] : upper[chain] + listed[side];
            if (!place(chain, step)) {
              open[side] = 0;
              if (rows === 0) budget[chain] = 0;
              else addEntry(side, step, false);
            } else {
              addEntry(side, step, true);
              listed[side]++;
              if (listed[side] === budget[chain]) open[side] = 0;
            }
            side = 1 - side;
          }
          if (entries > 0) break;
          // Both sides closed without an evaluation: the bracket is final.
          phase[chain] = shrinking;
          continue;
        }
        if (rows === 0 && upper[chain] - lower[chain] < 1e-12) {
          // The bracket has collapsed onto the current point: the move keeps it.
          endMove(chain);
          continue;
        }
        const step = lower[chain] + streams[chain].uniform() * (upper[chain] - lower[chain]);
        if (place(chain, step)) addEntry(candidate, step, true);
        else if (rows === 0) {
          if (step < 0) lower[chain] = step;
          else upper[chain] = step;
        } else addEntry(candidate, step, false);
      }
      if (rows === 0) return;
      const lnL = await evaluate(chainUnit, rows, chainPhysical);
      evaluations += rows;
      if (chainEvaluations !== undefined) chainEvaluations[chain] += rows;
      if (entryKind[base] !== candidate) {
        let leftClosed = leftBudget[chain] === 0;
        let rightClosed = rightBudget[chain] === 0;
        for (let e = base; e < base + entries; e++) {
          const row = entryRow[e];
          const inside = row >= 0 && lnL[row] > threshold;
          if (entryKind[e] === leftEnd) {
            if (leftClosed) continue;
            if (inside) {
              lower[chain] -= 1;
              leftClosed = --leftBudget[chain] === 0;
            } else {
              leftBudget[chain] = 0;
              leftClosed = true;
            }
          } else {
            if (rightClosed) continue;
            if (inside) {
              upper[chain] += 1;
              rightClosed = --rightBudget[chain] === 0;
            } else {
              rightBudget[chain] = 0;
              rightClosed = true;
            }
          }
        }
        if (leftClosed && rightClosed) phase[chain] = shrinking;
        continue;
      }
      for (let e = base; e < base + entries; e++) {
        const step = entryStep[e];
        // A candidate outside the shrunk bracket is discarded (it was drawn from a wider one).
        if (step < lower[chain] || step > upper[chain]) continue;
        const row = entryRow[e];
        if (row >= 0 && lnL[row] > threshold) {
          position.set(chainUnit.subarray(row * dim, row * dim + dim), chain * dim);
          positionPhysical.set(chainPhysical.subarray(row * physicalDim, row * physicalDim + physicalDim), chain * physicalDim);
          positionLnL[chain] = lnL[row];
          endMove(chain);
          break;
        }
        if (step < 0) lower[chain] = step;
        else upper[chain] = step;
      }
    }
  };

  chainEvaluations?.fill(0);
  const running: Promise<void>[] = [];
  for (let chain = 0; chain < chains; chain++) running.push(runChain(chain));
  await Promise.all(running);
  outUnit.set(position);
  outPhysical.set(positionPhysical);
  outLnL.set(positionLnL);
  return evaluations;
}
