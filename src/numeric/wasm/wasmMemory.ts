/** Bytes in one page of a WebAssembly memory (Core Specification 2.0, 4.2.8). */
export const WASM_PAGE_BYTES = 65536;

/**
 * A fresh (zeroed) memory holding regions of the given byte lengths one after the other, each
 * starting on a 16-byte boundary (so f64x2 loads of a region's pairs are aligned), and the
 * byte offset of each region.
 */
export function memoryWithRegions(byteLengths: readonly number[]): { memory: WebAssembly.Memory; starts: number[] } {
  const starts: number[] = [];
  let bytes = 0;
  for (const length of byteLengths) {
    starts.push(bytes);
    bytes += Math.ceil(length / 16) * 16;
  }
  return { memory: new WebAssembly.Memory({ initial: Math.max(1, Math.ceil(bytes / WASM_PAGE_BYTES)) }), starts };
}

/**
 * Entries to reserve for `n` in a memory that is replaced, not grown, when a call needs more: a
 * quarter more than asked (at least 1), so that slowly growing sizes replace it rarely.
 */
export function withHeadroom(n: number): number {
  return Math.ceil(1.25 * Math.max(n, 1));
}
