// The lattice level in WebAssembly (src/forward/stencilKernel.ts) against its JavaScript twin
// (PixelLattice.scatterValues and LatticeStencil), bit for bit: the planes, each basis's brightest
// listed pixel, the predicted means, the centre values, the flags and the live list after every
// basis. The twin itself is checked against the brute-force S x S model in
// forwardAccuracy.test.ts; here the light is made so that every outcome occurs (pixels done at the
// lattice, flagged for refinement, sent straight to S x S).
import { describe, expect, it } from 'vitest';
import { pixelGrid } from '../../src/imaging/pixelGrid.js';
import { PixelLattice } from '../../src/forward/pixelLattice.js';
import { PixelMeanState, REFINE, STRAIGHT_TO_FULL } from '../../src/forward/pixelMeanState.js';
import { LatticeStencil } from '../../src/forward/latticeStencil.js';
import { RichardsonRefinement } from '../../src/forward/richardsonRefinement.js';
import { StencilMemory, stencilModule } from '../../src/forward/stencilKernel.js';

const grid = pixelGrid(31, 23, 0.05);
// A ring of pixels (an annular mask), in raster order.
const pixels = Int32Array.from(
  Array.from({ length: grid.columns * grid.rows }, (_, p) => p).filter((p) => {
    const x = (p % grid.columns) - 15, y = Math.floor(p / grid.columns) - 11;
    const r = Math.hypot(x, y);
    return r > 4 && r < 10.5;
  }),
);
const bases = 5;
const supersampling = 8;

/** Light of basis k at a lattice ray: blobs whose width falls with k, a spike and an exact zero. */
function light(k: number, x: number, y: number): number {
  const width = 0.4 / (1 + k);
  let value = Math.exp(-((x - 0.1) ** 2 + (y + 0.05) ** 2) / (2 * width * width)) * Math.cos(7 * k * x);
  if (x > 0.28) value += 0.5 * (1 + k);
  if (Math.abs(x + 0.2) < 0.01 && Math.abs(y) < 0.01) value = 0;
  return value;
}

function bits(values: ArrayLike<number>): bigint[] {
  return Array.from(new BigUint64Array(Float64Array.from(values).buffer));
}

function runStencils(memory: StencilMemory | undefined) {
  const tolerance = Float64Array.from(pixels, (_, e) => 2e-4 * (1 + (e % 3)));
  const state = new PixelMeanState(pixels.length, bases, tolerance, memory);
  const lattice = new PixelLattice(grid, pixels, bases, true, memory);
  const stencil = new LatticeStencil(lattice, state, supersampling, memory);
  for (let k = 0; k < bases; k++) {
    for (let e = 0; e < lattice.count; e++) lattice.out[k * lattice.count + e] = light(k, lattice.x[e], lattice.y[e]);
  }
  state.flags.fill(0);
  const liveCounts: number[] = [];
  const brightest: number[] = [];
  let live = stencil.startBases();
  for (let k = bases - 1; k >= 0; k--) {
    const base = k * lattice.planeSize;
    stencil.plane(k, base);
    brightest.push(lattice.brightest);
    state.scale[k] = Math.abs(lattice.values[base + lattice.brightest]);
    live = stencil.pixelStencils(k, base, live);
    liveCounts.push(live);
  }
  return {
    state, means: bits(state.means), previous: bits(state.previous), flags: Array.from(state.flags), liveCounts, brightest,
    planes: bits(lattice.values),
  };
}

/**
 * The Richardson levels m = 2 and 4 after the lattice, with made-up sub-pixel means: the current
 * prediction plus a change that falls as m^-2 and differs from pixel to pixel by orders of
 * magnitude, so that each level finishes some, keeps some and gives up on some.
 */
function runRefinement(memory: StencilMemory | undefined) {
  const { state } = runStencils(memory);
  const refinement = new RichardsonRefinement(state, supersampling, true, memory);
  const all = Int32Array.from(pixels, (_, e) => e);
  state.directCount = state.collectFlagged(STRAIGHT_TO_FULL, all, pixels.length, state.direct, 0);
  const directAtLattice = state.directCount;
  let pending = state.collectFlagged(REFINE, all, pixels.length, state.pending, 0);
  const levels: Array<{ pending: number[]; flags: number[]; direct: number }> = [];
  [2, 4].forEach((m, level) => {
    for (let t = 0; t < pending; t++) {
      const e = state.pending[t];
      for (let k = 0; k < bases; k++) {
        const index = k * pixels.length + e;
        state.current[index] = state.means[index] + [0, 2e-4, 3e-3, 0.3][e % 4] * (1 + k) / (m * m);
      }
    }
    pending = refinement.refine(m, level, pending);
    levels.push({ pending: Array.from(state.pending.subarray(0, pending)), flags: Array.from(state.flags), direct: state.directCount });
  });
  return {
    levels, directAtLattice, means: bits(state.means), previous: bits(state.previous), byLevel: Array.from(refinement.pixelsByLevel),
  };
}

describe('the lattice stencils in WebAssembly', () => {
  it('compiles where the engine has WebAssembly SIMD (Node 20 has it, from memory; checked here)', () => {
    expect(stencilModule).not.toBeNull();
  });

  it('give the JavaScript twin\'s planes, brightest pixels, means, centre values, flags and live list to the bit', () => {
    const twin = runStencils(undefined);
    const kernel = runStencils(new StencilMemory(pixels.length, bases, PixelLattice.planeSizeOf(grid)));
    // Every outcome occurs, and pixels leave the live list basis by basis.
    expect(twin.flags).toContain(0);
    expect(twin.flags).toContain(REFINE);
    expect(twin.flags).toContain(STRAIGHT_TO_FULL);
    expect(twin.liveCounts[0]).toBeLessThan(pixels.length);
    expect(twin.liveCounts.at(-1)).toBeLessThan(twin.liveCounts[0]);
    expect(new Set(twin.brightest).size).toBeGreaterThan(1);
    expect(kernel.brightest).toEqual(twin.brightest);
    expect(kernel.planes).toEqual(twin.planes);
    expect(kernel.liveCounts).toEqual(twin.liveCounts);
    expect(kernel.flags).toEqual(twin.flags);
    expect(kernel.previous).toEqual(twin.previous);
    expect(kernel.means).toEqual(twin.means);
  });

  it('extrapolate as RichardsonRefinement\'s JavaScript does, to the bit, flags and pending lists included', () => {
    const memory = (): StencilMemory => new StencilMemory(pixels.length, bases, PixelLattice.planeSizeOf(grid));
    const twin = runRefinement(undefined);
    const kernel = runRefinement(memory());
    // Across the two levels pixels are kept, finished, and sent straight to S x S.
    const [first, second] = twin.levels;
    expect(first.pending.length).toBeGreaterThan(0);
    expect(first.direct).toBeGreaterThan(twin.directAtLattice);
    expect(twin.byLevel[2]).toBeGreaterThan(0);
    expect(second.pending.length).toBeGreaterThan(0);
    expect(second.pending.length).toBeLessThan(first.pending.length);
    expect(kernel.levels).toEqual(twin.levels);
    expect(kernel.byLevel).toEqual(twin.byLevel);
    expect(kernel.directAtLattice).toBe(twin.directAtLattice);
    expect(kernel.previous).toEqual(twin.previous);
    expect(kernel.means).toEqual(twin.means);
  });
});
