import { midpointStencilWeights } from './midpointStencil.js';
import type { PixelLattice } from './pixelLattice.js';
import { HOPELESS, REFINE, STRAIGHT_TO_FULL, type PixelMeanState } from './pixelMeanState.js';
import type { StencilMemory } from './stencilKernel.js';

/** Weight of the lower-order correction in the lattice error indicator (see LatticeStencil). */
const LATTICE_GUARD = 0.03;

/**
 * The lattice level of the adaptive pixel means: for each listed pixel, the tensor product of the
 * 5-point midpoint stencil (midpointStencil.ts) over its 5 x 5 lattice neighbourhood predicts its
 * S x S mean exactly for every polynomial of degree <= 4 in x and y. The error indicator is the
 * size of the fourth-order part of that stencil (|x part| + |y part| + |mixed part|, what the
 * 3-point stencil would have missed) and, as a guard against those parts cancelling by chance
 * where the light is not smooth on the pixel scale, LATTICE_GUARD times the second-order
 * correction. The stencils run in two passes: along x at every row point, then along y at the
 * pixels. Given a StencilMemory (whose views the lattice and the state then hold), both passes run
 * as its WebAssembly functions, the same operations in the same order.
 */
export class LatticeStencil {
  private readonly lattice: PixelLattice;
  private readonly state: PixelMeanState;
  /** 3-point weights (w3[1] centre, w3[0] neighbours) and the fourth-order part of the 5-point ones. */
  private readonly w3: Float64Array;
  private readonly d5: Float64Array;
  private readonly rowSecond: Float64Array;
  private readonly rowFourth: Float64Array;
  /** The listed pixels not yet sent to S x S by an earlier basis (see pixelStencils). */
  private readonly live: Int32Array;
  private readonly memory: StencilMemory | null;

  constructor(lattice: PixelLattice, state: PixelMeanState, supersampling: number, memory?: StencilMemory) {
    this.lattice = lattice;
    this.state = state;
    this.w3 = midpointStencilWeights(supersampling, 1);
    const w5 = midpointStencilWeights(supersampling, 2);
    // Fourth-order part of the 5-point weights: w5 minus w3 padded with zeros.
    this.d5 = Float64Array.from([w5[2] - this.w3[1], w5[1] - this.w3[0], w5[0]]);
    this.memory = memory ?? null;
    const planeSize = lattice.count === 0 || memory !== undefined ? 0 : lattice.planeSize;
    this.rowSecond = new Float64Array(planeSize);
    this.rowFourth = new Float64Array(planeSize);
    if (memory !== undefined) {
      memory.weights.set([this.w3[1], this.w3[0], this.d5[0], this.d5[1], this.d5[2], LATTICE_GUARD, HOPELESS]);
      memory.pixelsPadded.set(lattice.pixelsPadded);
      memory.rowPoints.set(lattice.rowPoints);
      memory.padded.set(lattice.padded);
      memory.listed.set(lattice.listed);
      this.live = memory.live;
      return;
    }
    this.live = new Int32Array(lattice.pixelsPadded.length);
  }

  /** Before the first basis of an evaluation: every listed pixel is live; returns their number. */
  startBases(): number {
    const live = this.live;
    for (let e = 0; e < live.length; e++) live[e] = e;
    return live.length;
  }

  /**
   * Basis k's lattice light onto its plane at `base` with its brightest listed pixel (the
   * lattice's scatterValues), then the stencils along x (rowStencils).
   */
  plane(k: number, base: number): void {
    if (this.memory !== null) this.lattice.brightest = this.memory.scatterPlane(k, base, this.lattice.count);
    else this.lattice.scatterValues(k, base);
    this.rowStencils(base);
  }

  /** The stencils along x (3-point part and 5-point correction) at every row point (basis at `base`). */
  rowStencils(base: number): void {
    if (this.memory !== null) {
      this.memory.rowStencils(this.lattice.rowPoints.length, base);
      return;
    }
    const values = this.lattice.values;
    const rowSecond = this.rowSecond, rowFourth = this.rowFourth;
    const rowPoints = this.lattice.rowPoints;
    const w30 = this.w3[1], w31 = this.w3[0];
    const d0 = this.d5[0], d1 = this.d5[1], d2 = this.d5[2];
    for (let e = 0; e < rowPoints.length; e++) {
      const r = rowPoints[e];
      const q = base + r;
      const centre = values[q];
      const near = values[q - 1] + values[q + 1];
      rowSecond[r] = w30 * centre + w31 * near;
      rowFourth[r] = d0 * centre + d1 * near + d2 * (values[q - 2] + values[q + 2]);
    }
  }

  /**
   * The stencils along y of basis k at the first liveCount live pixels: the predicted mean into
   * `means`, the centre value into `previous`, and pixels whose error indicator exceeds the
   * tolerance flagged REFINE (or STRAIGHT_TO_FULL above HOPELESS tolerances). A pixel flagged
   * STRAIGHT_TO_FULL leaves the live list: the S x S rays will give all its means, so no later
   * basis needs its stencil. Bases are best taken in the reverse of their listed order: a
   * many-basis source lists its slowly varying bases first (shapelets by increasing order), so
   * the fast ones, which send most pixels to S x S, come first and shorten the list for the
   * rest. Returns the number of pixels left live.
   */
  pixelStencils(k: number, base: number, liveCount: number): number {
    if (this.memory !== null) return this.memory.pixelStencils(k, base, liveCount, this.lattice.width);
    const state = this.state;
    const scale = state.scale[k];
    const values = this.lattice.values;
    const pixelsPadded = this.lattice.pixelsPadded;
    const count = pixelsPadded.length;
    const width = this.lattice.width;
    const w30 = this.w3[1], w31 = this.w3[0];
    const d0 = this.d5[0], d1 = this.d5[1], d2 = this.d5[2];
    const rowSecond = this.rowSecond, rowFourth = this.rowFourth;
    const means = state.means, previous = state.previous, flagged = state.flags;
    const relativeTolerance = state.relativeTolerance;
    const out = k * count;
    const live = this.live;
    let kept = 0;
    for (let t = 0; t < liveCount; t++) {
      const e = live[t];
      const q = pixelsPadded[e];
      const centre = values[base + q];
      const s0 = rowSecond[q], s1 = rowSecond[q - width] + rowSecond[q + width];
      const s2 = rowSecond[q - 2 * width] + rowSecond[q + 2 * width];
      const f0 = rowFourth[q], f1 = rowFourth[q - width] + rowFourth[q + width];
      const f2 = rowFourth[q - 2 * width] + rowFourth[q + 2 * width];
      const second = w30 * s0 + w31 * s1;
      const partX = w30 * f0 + w31 * f1;
      const partY = d0 * s0 + d1 * s1 + d2 * s2;
      const partXY = d0 * f0 + d1 * f1 + d2 * f2;
      means[out + e] = second + partX + partY + partXY;
      previous[out + e] = centre;
      const indicator = Math.max(
        Math.abs(partX) + Math.abs(partY) + Math.abs(partXY), LATTICE_GUARD * Math.abs(second - centre),
      );
      const tolerance = scale * relativeTolerance[e];
      if (indicator > HOPELESS * tolerance) {
        flagged[e] = STRAIGHT_TO_FULL;
        continue;
      }
      if (indicator > tolerance) flagged[e] = REFINE;
      live[kept++] = e;
    }
    return kept;
  }
}
