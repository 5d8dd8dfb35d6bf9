/**
 * ln(e^a + e^b) without overflow (the log-sum-exp identity, common practice). Either argument may
 * be -Infinity (a zero term).
 */
export function logAddExp(a: number, b: number): number {
  if (a === -Infinity) return b;
  if (b === -Infinity) return a;
  return a > b ? a + Math.log1p(Math.exp(b - a)) : b + Math.log1p(Math.exp(a - b));
}

/** ln(sum_i e^{values_i}) over values[0..count) by the log-sum-exp identity (common practice). */
export function logSumExp(values: ArrayLike<number>, count: number = values.length): number {
  let largest = -Infinity;
  for (let i = 0; i < count; i++) if (values[i] > largest) largest = values[i];
  if (largest === -Infinity || largest === Infinity) return largest;
  let sum = 0;
  for (let i = 0; i < count; i++) sum += Math.exp(values[i] - largest);
  return largest + Math.log(sum);
}

/** ln(1 - e^{-delta}) for delta > 0, accurate for small and large delta (Maechler 2012, log1mexp). */
export function logOneMinusExpNegative(delta: number): number {
  return delta < Math.LN2 ? Math.log(-Math.expm1(-delta)) : Math.log1p(-Math.exp(-delta));
}
