/** Tick positions for an axis, with the step they share. */
export interface AxisTicks {
  readonly values: number[];
  readonly step: number;
}

// "Nice numbers for graph labels", Heckbert 1990 (Graphics Gems I): round to 1, 2, 5 or 10 times a power of ten.
function niceNumber(value: number): number {
  const exponent = Math.floor(Math.log10(value));
  const fraction = value / 10 ** exponent;
  const nice = fraction < 1.5 ? 1 : fraction < 3 ? 2 : fraction < 7 ? 5 : 10;
  return nice * 10 ** exponent;
}

// Ticks at multiples of a step rounded as in Heckbert 1990 from (high - low) / (count - 1), inside [low, high].
export function niceTicks(low: number, high: number, count: number): AxisTicks {
  if (!(high > low) || !Number.isFinite(low) || !Number.isFinite(high)) return { values: [low], step: 0 };
  const step = niceNumber((high - low) / Math.max(count - 1, 1));
  const first = Math.ceil(low / step - 1e-9) * step;
  const values: number[] = [];
  for (let k = 0; first + k * step <= high + step * 1e-9; k++) {
    const v = first + k * step;
    values.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  }
  return { values, step };
}

/** A tick label: as many decimals as the step needs, ASCII minus. */
export function formatTick(value: number, step: number): string {
  const decimals = step > 0 ? Math.max(0, -Math.floor(Math.log10(step) + 1e-9)) : 2;
  return value.toFixed(Math.min(decimals, 8));
}
