import { describe, expect, it } from 'vitest';
import { AdaptiveMesh } from '../../src/inversion/adaptiveMesh.js';
import { MappingMatrix } from '../../src/inversion/mappingMatrix.js';
import { RegularMesh } from '../../src/inversion/regularMesh.js';
import { SparseRows } from '../../src/inversion/sparseRows.js';
import { NaturalNeighbourKernel, naturalNeighbourModule } from '../../src/numeric/geometry/naturalNeighbourKernel.js';
import { SeededStream } from '../../src/numeric/random/seededStream.js';

// The adaptive mesh weighs rays in WebAssembly when they are its own ray buffers (views on the
// kernel's memory), with the JavaScript twin otherwise; the twin is the reference (the kernel's
// bit-for-bit test is test/numeric/geometry/naturalNeighbourKernel.test.ts). The mapping
// matrix's rows are merged there too; MappingMatrix's JavaScript merge is their reference.
function cloud(stream: SeededStream, n: number): { x: Float64Array; y: Float64Array } {
  const x = new Float64Array(n), y = new Float64Array(n);
  for (let k = 0; k < n; k++) { x[k] = stream.normal(); y[k] = 0.5 * stream.normal(); }
  return { x, y };
}

function bytes(array: Int32Array | Float64Array): Buffer {
  return Buffer.from(array.buffer, array.byteOffset, array.byteLength);
}

/** Which weighed the mesh's last interpolation (a private field, read for the test). */
function lastWeigher(mesh: AdaptiveMesh): unknown {
  return (mesh as unknown as { lastWeigher: unknown }).lastWeigher;
}

describe.runIf(naturalNeighbourModule !== null)('AdaptiveMesh ray buffers', () => {
  it('are the kernel\'s memory, weighed there to the twin\'s bits; a larger mesh takes the twin into them', () => {
    const stream = SeededStream.fromSeed(11);
    const rays = cloud(stream, 4000);
    const fast = new AdaptiveMesh(), plain = new AdaptiveMesh('javaScript');
    const buffers = fast.rayBuffers(rays.x.length, 300);
    const reference = plain.rayBuffers(rays.x.length, 300);
    expect(buffers.cells.length).toBe(fast.entriesPerRay * rays.x.length);
    expect(reference.cells.buffer).not.toBe(buffers.cells.buffer);
    for (const n of [300, 200, 301]) {
      const vertices = cloud(stream, n);
      fast.build(vertices.x, vertices.y, n);
      plain.build(vertices.x, vertices.y, n);
      const outside = fast.interpolate(rays.x, rays.y, rays.x.length, buffers.cells, buffers.weights);
      expect(lastWeigher(fast) instanceof NaturalNeighbourKernel).toBe(n <= 300);
      expect(outside).toBe(plain.interpolate(rays.x, rays.y, rays.x.length, reference.cells, reference.weights));
      expect(fast.interpolationFallbacks).toBe(plain.interpolationFallbacks);
      expect(bytes(buffers.cells).equals(bytes(reference.cells))).toBe(true);
      expect(bytes(buffers.weights).equals(bytes(reference.weights))).toBe(true);
    }
  });
});

describe.runIf(naturalNeighbourModule !== null)('AdaptiveMesh mapping rows', () => {
  it('are merged in the kernel\'s memory to MappingMatrix\'s bits; other arrays or a larger mesh decline', () => {
    // Four rays per pixel a few hundredths apart, so that a pixel's rays share cells and merge.
    const stream = SeededStream.fromSeed(12);
    const pixels = 1500, raysPerPixel = 4, scale = 0.0025;
    const centres = cloud(stream, pixels);
    const rays = { x: new Float64Array(pixels * raysPerPixel), y: new Float64Array(pixels * raysPerPixel) };
    for (let q = 0; q < pixels; q++) {
      for (let r = 0; r < raysPerPixel; r++) {
        rays.x[q * raysPerPixel + r] = centres.x[q] + 0.02 * ((r & 1) - 0.5);
        rays.y[q * raysPerPixel + r] = centres.y[q] + 0.02 * ((r >> 1) - 0.5);
      }
    }
    const mesh = new AdaptiveMesh();
    const buffers = mesh.rayBuffers(rays.x.length, 300);
    const plainArrays = new AdaptiveMesh('javaScript').rayBuffers(rays.x.length, 300);
    for (const n of [300, 120, 301]) {
      const vertices = cloud(stream, n);
      mesh.build(vertices.x, vertices.y, n);
      mesh.interpolate(rays.x, rays.y, rays.x.length, buffers.cells, buffers.weights);
      const merged = new SparseRows();
      const made = mesh.mappingRows(buffers.cells, buffers.weights, pixels, raysPerPixel, scale / raysPerPixel, merged);
      // A mesh larger than the kernel was sized for is weighed by the twin and merged by MappingMatrix.
      expect(made, `${n} vertices`).toBe(n <= 300);
      if (!made) continue;
      const reference = new SparseRows();
      new MappingMatrix().build(buffers.cells, buffers.weights, pixels, raysPerPixel, mesh.entriesPerRay, n, scale, reference);
      const entries = reference.entries;
      let weighed = 0;
      for (let k = 0; k < buffers.cells.length; k++) if (buffers.cells[k] >= 0) weighed++;
      expect(entries).toBeLessThan(weighed);
      expect(merged.rowCount).toBe(pixels);
      expect(bytes(merged.rowStart.subarray(0, pixels + 1)).equals(bytes(reference.rowStart.subarray(0, pixels + 1)))).toBe(true);
      expect(bytes(merged.column.subarray(0, entries)).equals(bytes(reference.column.subarray(0, entries)))).toBe(true);
      expect(bytes(merged.value.subarray(0, entries)).equals(bytes(reference.value.subarray(0, entries)))).toBe(true);
      // Through MappingMatrix.build with the mesh: the same views.
      const built = new SparseRows();
      new MappingMatrix().build(buffers.cells, buffers.weights, pixels, raysPerPixel, mesh.entriesPerRay, n, scale, built, mesh);
      expect(built.value.buffer).toBe(merged.value.buffer);
    }
    expect(mesh.mappingRows(plainArrays.cells, plainArrays.weights, pixels, raysPerPixel, scale / raysPerPixel, new SparseRows())).toBe(false);
  });
});

describe('RegularMesh ray buffers', () => {
  it('are plain arrays of four entries per ray', () => {
    const { cells, weights } = new RegularMesh(8).rayBuffers(10);
    expect([cells.length, weights.length]).toEqual([40, 40]);
  });
});
