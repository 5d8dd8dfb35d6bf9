// Reusable work buffers of the sparse kernel: a buffer is replaced only when a call needs more
// room than it has, so repeated calls of similar size allocate nothing. Growth is by at least
// half the old length, so a slowly growing size reallocates O(log n) times.

/** `buffer` if it holds at least `length` entries, else a larger one holding a copy of it. */
export function ensureInt32Capacity(buffer: Int32Array<ArrayBuffer>, length: number): Int32Array<ArrayBuffer> {
  if (buffer.length >= length) return buffer;
  const grown = new Int32Array(Math.max(length, Math.ceil(buffer.length * 1.5)));
  grown.set(buffer);
  return grown;
}

/** `buffer` if it holds at least `length` entries, else a larger one holding a copy of it. */
export function ensureFloat64Capacity(buffer: Float64Array<ArrayBuffer>, length: number): Float64Array<ArrayBuffer> {
  if (buffer.length >= length) return buffer;
  const grown = new Float64Array(Math.max(length, Math.ceil(buffer.length * 1.5)));
  grown.set(buffer);
  return grown;
}
