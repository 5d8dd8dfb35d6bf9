/**
 * Typed arrays on a SharedArrayBuffer. A worker thread that receives one through postMessage
 * (node:worker_threads, or a browser Worker) gets a view of the same memory, not a copy, so a
 * data set loaded once can be read by every worker of a fit without being copied per worker.
 * Writes from any thread are seen by all of them: treat arrays shared this way as read-only.
 */

/** A zero-filled Float64Array of `length` values on a new SharedArrayBuffer. */
export function sharedFloat64Array(length: number): Float64Array<SharedArrayBuffer> {
  return new Float64Array(new SharedArrayBuffer(length * Float64Array.BYTES_PER_ELEMENT));
}

/** A zero-filled Uint8Array of `length` values on a new SharedArrayBuffer. */
export function sharedUint8Array(length: number): Uint8Array<SharedArrayBuffer> {
  return new Uint8Array(new SharedArrayBuffer(length * Uint8Array.BYTES_PER_ELEMENT));
}

/** A zero-filled Int32Array of `length` values on a new SharedArrayBuffer. */
export function sharedInt32Array(length: number): Int32Array<SharedArrayBuffer> {
  return new Int32Array(new SharedArrayBuffer(length * Int32Array.BYTES_PER_ELEMENT));
}
