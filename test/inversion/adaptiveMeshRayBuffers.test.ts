import { describe, expect, it } from 'vitest';
import { AdaptiveMesh } from '../../src/inversion/adaptiveMesh.js';
import { RegularMesh } from '../../src/inversion/regularMesh.js';
import { NaturalNeighbourKernel, naturalNeighbourModule } from '../../src/numeric/geometry/naturalNeighbourKernel.js';
import { SeededStream } from '../../src/numeric/random/seededStream.js';

// The adaptive mesh weighs rays in WebAssembly when they are its own ray buffers (views on the
// kernel's memory), with the JavaScript twin otherwise; the twin is the reference (the kernel's
// bit-for-bit test is test/numeric/geometry/naturalNeighbourKernel.test.ts).
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

describe('RegularMesh ray buffers', () => {
  it('are plain arrays of four entries per ray', () => {
    const { cells, weights } = new RegularMesh(8).rayBuffers(10);
    expect([cells.length, weights.length]).toEqual([40, 40]);
  });
});
