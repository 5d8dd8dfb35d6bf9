import { SeededStream } from '../../numeric/random/seededStream.js';
import { sliceChainSeeds, type SliceSettings, type UnitBatchEvaluator } from './sliceSettings.js';

/** Rows of unit-cube points with their physical rows and ln L (k rows each). */
export interface ChainPoints {
  readonly unit: Float64Array;
  readonly physical: Float64Array;
  readonly lnL: Float64Array;
}

/** k slice chains to run side by side inside the contour ln L > threshold. */
export interface SliceChainsJob {
  readonly chains: number;
  /** Where the chains start (k rows). */
  readonly start: ChainPoints;
  readonly threshold: number;
  /** Lower Cholesky factor of the live points' covariance (dim x dim), one for all chains or one per chain. */
  readonly whitening: Float64Array | readonly Float64Array[];
  readonly settings: SliceSettings;
  /** The run's stream (each chain's seed is drawn from it in chain order), or the chains' seeds. */
  readonly seeds: SeededStream | readonly number[];
  readonly evaluate: UnitBatchEvaluator;
  /** Where the chains end (k rows). */
  readonly out: ChainPoints;
  /** Receives each chain's evaluations, when given. */
  readonly chainEvaluations?: Int32Array;
}

const stepping = 0;
const shrinking = 1;
const done = 2;

const leftEnd = 0;
const rightEnd = 1;
const candidate = 2;

/**
 * k independent slice-sampling chains inside the contour ln L > threshold (Neal 2003, "Slice
 * sampling", Section 4: stepping out with the cap m split at random, then shrinkage; directions
 * drawn isotropically in the space whitened by the live points' covariance, after Handley, Hobson
 * & Lasenby 2015). Each chain draws from its own stream, seeded from the run's stream in chain
 * order (or given its seed: a chain then runs alone exactly as among others, runSliceChain), and
 * sends its points to `evaluate` as soon as its previous answer is back, so the chains keep a
 * worker pool busy without waiting for each other; each chain's path, hence the result, depends on
 * s (points per chain and round) but never on the likelihood's parallelism or timing. With s > 1
 * a call carries up to s points of one chain and the chain stays exact: stepping out tests the
 * left and right ends (and further expansions) at once and keeps the first outside point on each
 * side, as the sequential procedure would; shrinkage draws s candidates uniformly from the bracket
 * and takes them in draw order, a rejected one shrinking the bracket, and a later one counting
 * only if it lies inside the shrunk bracket, where it is a uniform draw from it (rejection
 * sampling), else being discarded. With s = 1 each chain follows Neal's sequential procedure
 * draw for draw. Returns the number of points evaluated.
 */
export async function sliceChains(job: SliceChainsJob): Promise<number> {
  const run = new SliceChainsRun(job);
  job.chainEvaluations?.fill(0);
  const running: Promise<void>[] = [];
  for (let chain = 0; chain < job.chains; chain++) running.push(run.runChain(chain));
  await Promise.all(running);
  job.out.unit.set(run.position);
  job.out.physical.set(run.positionPhysical);
  job.out.lnL.set(run.positionLnL);
  return run.evaluations;
}

/**
 * The state of k chains: position, direction, bracket and stepping-out budgets of the current
 * move, and each round's entries (kind, step along the direction, batch row or -1 when known to
 * lie outside without evaluation, off the cube). Listing a round and taking its answers are
 * synchronous, so the chains, which interleave only while awaiting, share the scratch arrays.
 */
class SliceChainsRun {
  readonly position: Float64Array;
  readonly positionPhysical: Float64Array;
  readonly positionLnL: Float64Array;
  evaluations = 0;
  private readonly job: SliceChainsJob;
  private readonly dim: number;
  private readonly physicalDim: number;
  private readonly perChain: number;
  private readonly direction: Float64Array;
  private readonly lower: Float64Array;
  private readonly upper: Float64Array;
  private readonly leftBudget: Int32Array;
  private readonly rightBudget: Int32Array;
  private readonly phase: Uint8Array;
  private readonly moves: Int32Array;
  private readonly entryKind: Uint8Array;
  private readonly entryStep: Float64Array;
  private readonly entryRow: Int32Array;
  /** Entries and evaluated rows listed in each chain's current round. */
  private readonly roundEntries: Int32Array;
  private readonly roundRows: Int32Array;
  private readonly batchUnit: Float64Array;
  private readonly batchPhysical: Float64Array;
  private readonly gaussian: Float64Array;
  private readonly point: Float64Array;
  /** Stepping out: expansions listed this round and whether each side is still open (by side). */
  private readonly listed = new Int32Array(2);
  private readonly open = new Uint8Array(2);
  private readonly streams: SeededStream[];

  constructor(job: SliceChainsJob) {
    const { chains, settings } = job;
    const { dim, physicalDim } = settings;
    this.job = job;
    this.dim = dim;
    this.physicalDim = physicalDim;
    this.perChain = settings.pointsPerChain ?? 1;
    this.position = Float64Array.from(job.start.unit.subarray(0, chains * dim));
    this.positionPhysical = Float64Array.from(job.start.physical.subarray(0, chains * physicalDim));
    this.positionLnL = Float64Array.from(job.start.lnL.subarray(0, chains));
    this.direction = new Float64Array(chains * dim);
    this.lower = new Float64Array(chains);
    this.upper = new Float64Array(chains);
    this.leftBudget = new Int32Array(chains);
    this.rightBudget = new Int32Array(chains);
    this.phase = new Uint8Array(chains);
    this.moves = new Int32Array(chains);
    this.entryKind = new Uint8Array(chains * this.perChain);
    this.entryStep = new Float64Array(chains * this.perChain);
    this.entryRow = new Int32Array(chains * this.perChain);
    this.roundEntries = new Int32Array(chains);
    this.roundRows = new Int32Array(chains);
    this.batchUnit = new Float64Array(chains * this.perChain * dim);
    this.batchPhysical = new Float64Array(chains * this.perChain * physicalDim);
    this.gaussian = new Float64Array(dim);
    this.point = new Float64Array(dim);
    const seeds = job.seeds instanceof SeededStream ? sliceChainSeeds(job.seeds, chains) : job.seeds;
    this.streams = Array.from({ length: chains }, (_, chain) => SeededStream.fromSeed(seeds[chain]));
    for (let chain = 0; chain < chains; chain++) {
      if (settings.steps > 0) this.startMove(chain);
      else this.phase[chain] = done;
    }
  }

  /** One chain to the end of its moves: list its next points, evaluate them in one call, take the answers. */
  async runChain(chain: number): Promise<void> {
    const base = chain * this.perChain;
    const chainUnit = this.batchUnit.subarray(base * this.dim, (base + this.perChain) * this.dim);
    const chainPhysical = this.batchPhysical.subarray(base * this.physicalDim, (base + this.perChain) * this.physicalDim);
    for (;;) {
      this.listRound(chain, chainUnit);
      const rows = this.roundRows[chain];
      if (rows === 0) return;
      const lnL = await this.job.evaluate(chainUnit, rows, chainPhysical);
      this.evaluations += rows;
      if (this.job.chainEvaluations !== undefined) this.job.chainEvaluations[chain] += rows;
      if (this.entryKind[base] !== candidate) this.takeStepping(chain, lnL);
      else this.takeShrinking(chain, lnL, chainUnit, chainPhysical);
    }
  }

  /** A new move: an isotropic direction in the whitened space, a random bracket offset and split budget. */
  private startMove(chain: number): void {
    const { dim, gaussian, direction } = this;
    const { widthScale, maxExpansions } = this.job.settings;
    const whitening = this.job.whitening instanceof Float64Array ? this.job.whitening : this.job.whitening[chain];
    const stream = this.streams[chain];
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
    this.lower[chain] = -offset;
    this.upper[chain] = 1 - offset;
    const budget = Math.floor(maxExpansions * stream.uniform());
    this.leftBudget[chain] = budget;
    this.rightBudget[chain] = maxExpansions - 1 - budget;
    this.phase[chain] = stepping;
  }

  /** The chain has accepted a point (or kept its own): next move, or done. */
  private endMove(chain: number): void {
    this.moves[chain]++;
    if (this.moves[chain] === this.job.settings.steps) this.phase[chain] = done;
    else this.startMove(chain);
  }

  /** Fills `point` with the chain's position moved by step * direction; false if it leaves the cube. */
  private place(chain: number, step: number): boolean {
    const { dim, position, direction, point } = this;
    const periodic = this.job.settings.periodic;
    for (let i = 0; i < dim; i++) {
      let value = position[chain * dim + i] + step * direction[chain * dim + i];
      if (periodic !== null && periodic[i] === 1) value -= Math.floor(value);
      else if (value < 0 || value > 1) return false;
      point[i] = value;
    }
    return true;
  }

  /** Lists a step as the chain's next entry; `evaluated`: `point` holds it and goes to the call. */
  private addEntry(chain: number, chainUnit: Float64Array, kind: number, step: number, evaluated: boolean): void {
    const at = chain * this.perChain + this.roundEntries[chain];
    this.entryKind[at] = kind;
    this.entryStep[at] = step;
    if (evaluated) {
      chainUnit.set(this.point, this.roundRows[chain] * this.dim);
      this.entryRow[at] = this.roundRows[chain]++;
    } else this.entryRow[at] = -1;
    this.roundEntries[chain]++;
  }

  /**
   * The chain's entries of one round. Known outcomes (an end or candidate off the cube) are
   * applied at once while nothing is pending, and listed as unevaluated entries behind pending ones.
   */
  private listRound(chain: number, chainUnit: Float64Array): void {
    this.roundEntries[chain] = 0;
    this.roundRows[chain] = 0;
    while (this.roundEntries[chain] < this.perChain && this.phase[chain] !== done) {
      if (this.phase[chain] === stepping) {
        if (this.listSteppingOut(chain, chainUnit)) return;
        // Both sides closed without an evaluation: the bracket is final.
        this.phase[chain] = shrinking;
        continue;
      }
      if (this.roundRows[chain] === 0 && this.upper[chain] - this.lower[chain] < 1e-12) {
        // The bracket has collapsed onto the current point: the move keeps it.
        this.endMove(chain);
        continue;
      }
      const step = this.lower[chain] + this.streams[chain].uniform() * (this.upper[chain] - this.lower[chain]);
      if (this.place(chain, step)) this.addEntry(chain, chainUnit, candidate, step, true);
      else if (this.roundRows[chain] === 0) {
        if (step < 0) this.lower[chain] = step;
        else this.upper[chain] = step;
      } else this.addEntry(chain, chainUnit, candidate, step, false);
    }
  }

  /**
   * Stepping out: alternates the sides, listing each side's next expansions until it is closed
   * (its budget used, or a step off the cube). True when it listed entries for this round.
   */
  private listSteppingOut(chain: number, chainUnit: Float64Array): boolean {
    const { listed, open } = this;
    listed[leftEnd] = listed[rightEnd] = 0;
    open[leftEnd] = this.leftBudget[chain] > 0 ? 1 : 0;
    open[rightEnd] = this.rightBudget[chain] > 0 ? 1 : 0;
    let side = leftEnd;
    while (this.roundEntries[chain] < this.perChain && (open[leftEnd] === 1 || open[rightEnd] === 1)) {
      if (open[side] === 0) side = 1 - side;
      const budget = side === leftEnd ? this.leftBudget : this.rightBudget;
      const step = side === leftEnd ? this.lower[chain] - listed[side] : this.upper[chain] + listed[side];
      if (!this.place(chain, step)) {
        open[side] = 0;
        if (this.roundRows[chain] === 0) budget[chain] = 0;
        else this.addEntry(chain, chainUnit, side, step, false);
      } else {
        this.addEntry(chain, chainUnit, side, step, true);
        listed[side]++;
        if (listed[side] === budget[chain]) open[side] = 0;
      }
      side = 1 - side;
    }
    return this.roundEntries[chain] > 0;
  }

  /** Stepping-out answers in order: each side widens while inside, and closes at its first outside point. */
  private takeStepping(chain: number, lnL: Float64Array): void {
    const base = chain * this.perChain;
    const end = base + this.roundEntries[chain];
    const threshold = this.job.threshold;
    let leftClosed = this.leftBudget[chain] === 0;
    let rightClosed = this.rightBudget[chain] === 0;
    for (let e = base; e < end; e++) {
      const row = this.entryRow[e];
      const inside = row >= 0 && lnL[row] > threshold;
      if (this.entryKind[e] === leftEnd) {
        if (leftClosed) continue;
        if (inside) {
          this.lower[chain] -= 1;
          leftClosed = --this.leftBudget[chain] === 0;
        } else {
          this.leftBudget[chain] = 0;
          leftClosed = true;
        }
      } else {
        if (rightClosed) continue;
        if (inside) {
          this.upper[chain] += 1;
          rightClosed = --this.rightBudget[chain] === 0;
        } else {
          this.rightBudget[chain] = 0;
          rightClosed = true;
        }
      }
    }
    if (leftClosed && rightClosed) this.phase[chain] = shrinking;
  }

  /** Shrinkage answers in draw order: the first inside candidate is the move's new point; outside ones shrink the bracket. */
  private takeShrinking(chain: number, lnL: Float64Array, chainUnit: Float64Array, chainPhysical: Float64Array): void {
    const { dim, physicalDim } = this;
    const base = chain * this.perChain;
    const end = base + this.roundEntries[chain];
    for (let e = base; e < end; e++) {
      const step = this.entryStep[e];
      // A candidate outside the shrunk bracket is discarded (it was drawn from a wider one).
      if (step < this.lower[chain] || step > this.upper[chain]) continue;
      const row = this.entryRow[e];
      if (row >= 0 && lnL[row] > this.job.threshold) {
        this.position.set(chainUnit.subarray(row * dim, row * dim + dim), chain * dim);
        this.positionPhysical.set(chainPhysical.subarray(row * physicalDim, row * physicalDim + physicalDim), chain * physicalDim);
        this.positionLnL[chain] = lnL[row];
        this.endMove(chain);
        return;
      }
      if (step < 0) this.lower[chain] = step;
      else this.upper[chain] = step;
    }
  }
}
