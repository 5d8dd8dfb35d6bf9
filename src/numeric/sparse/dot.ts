/**
 * sum_t a[p + t] b[q + t]: four partial sums, so that consecutive additions do not wait for one
 * another (the loop is bound by add latency otherwise); the last length mod 4 terms first.
 */
export function dot(a: Float64Array, p: number, b: Float64Array, q: number, length: number): number {
  const end = length - (length & 3);
  let s0 = dotRemainder(a, p, b, q, end, length);
  let s1 = 0;
  let s2 = 0;
  let s3 = 0;
  for (let i = p, j = q, stop = p + end; i < stop; i += 4, j += 4) {
    s0 += a[i] * b[j];
    s1 += a[i + 1] * b[j + 1];
    s2 += a[i + 2] * b[j + 2];
    s3 += a[i + 3] * b[j + 3];
  }
  return s0 + s1 + s2 + s3;
}

function dotRemainder(a: Float64Array, p: number, b: Float64Array, q: number, from: number, length: number): number {
  let s = 0;
  for (let t = from; t < length; t++) s += a[p + t] * b[q + t];
  return s;
}
