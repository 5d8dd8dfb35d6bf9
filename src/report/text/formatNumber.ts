/**
 * How the report writes numbers: plain decimals with ASCII minus signs (so they can be copied),
 * `digits` after the point; non-finite values as words. Values so small or large that fixed
 * notation would hide them switch to exponent notation with `digits` significant digits.
 */
export function formatNumber(value: number | null | undefined, digits = 2): string {
  if (value === null || value === undefined || Number.isNaN(value)) return 'n/a';
  if (value === Infinity) return 'inf';
  if (value === -Infinity) return '-inf';
  const size = Math.abs(value);
  if (size !== 0 && (size >= 1e7 || size < 10 ** -digits)) return value.toExponential(Math.max(digits - 1, 1));
  return value.toFixed(digits);
}

/** A whole number with thin groups of three digits, e.g. 1 234 567 (common practice in tables). */
export function formatCount(value: number): string {
  if (!Number.isFinite(value)) return formatNumber(value);
  return Math.round(value).toString().replace(/\B(?=(\d{3})+(?!\d))/g, '\u2009');
}

/** Digits after the point that show a quantity known to about `spread` with two significant digits. */
export function digitsForSpread(spread: number): number {
  if (!(spread > 0) || !Number.isFinite(spread)) return 3;
  return Math.min(6, Math.max(0, 1 - Math.floor(Math.log10(spread))));
}
