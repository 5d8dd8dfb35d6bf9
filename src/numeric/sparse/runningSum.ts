/** Turns the counts a[1 .. n] into running sums in place, a[i] += a[i - 1] (a[0] is kept). */
export function runningSum(a: Int32Array, n: number): void {
  for (let i = 1; i <= n; i++) a[i] += a[i - 1];
}
