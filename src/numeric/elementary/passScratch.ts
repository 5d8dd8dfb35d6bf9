/**
 * Scratch arrays for profiles that work through their points in several passes (each pass a
 * short chain of dependent operations, which lets successive points overlap in the processor).
 * Buffer `index` is grown when a call needs more room and never shrunk, so the steady state
 * allocates nothing. Callers must not hold a buffer across a call to another profile.
 */
const buffers: Float64Array[] = [];

/** Scratch buffer number `index`, at least n long (contents undefined). */
export function passScratch(index: number, n: number): Float64Array {
  const buffer = buffers[index];
  if (buffer !== undefined && buffer.length >= n) return buffer;
  const grown = new Float64Array(Math.max(n, 4096));
  buffers[index] = grown;
  return grown;
}
