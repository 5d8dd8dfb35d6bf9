import { describe, expect, it } from 'vitest';
import { WASM_PAGE_BYTES, memoryWithRegions } from '../../../src/numeric/wasm/wasmMemory.js';

// The page size is the WebAssembly Core Specification 2.0's (section 4.2.8: 64 KiB); the
// 16-byte boundaries are what aligned f64x2 loads want (common practice).
describe('memoryWithRegions', () => {
  it('lays the regions one after the other on 16-byte boundaries, in a zeroed memory of whole pages that holds them all', () => {
    const lengths = [24, 8, 0, 100, 70000];
    const { memory, starts } = memoryWithRegions(lengths);
    expect(WASM_PAGE_BYTES).toBe(65536);
    expect(starts).toEqual([0, 32, 48, 48, 160]); // 24 -> 32, 8 -> 16, 0 -> 0, 100 -> 112 bytes
    for (let j = 1; j < lengths.length; j++) expect(starts[j]).toBeGreaterThanOrEqual(starts[j - 1] + lengths[j - 1]);
    expect(memory.buffer.byteLength % WASM_PAGE_BYTES).toBe(0);
    expect(memory.buffer.byteLength).toBeGreaterThanOrEqual(starts[4] + lengths[4]);
    expect(new Uint8Array(memory.buffer).every((b) => b === 0)).toBe(true);
  });
});
