/**
 * The q-quantile (0..1) of the finite values at the selected pixels (all pixels when `selected`
 * is absent), by the nearest-rank rule on the sorted values (common practice for display limits).
 */
export function pixelQuantile(values: ArrayLike<number>, q: number, selected?: ArrayLike<number>): number {
  const kept: number[] = [];
  for (let p = 0; p < values.length; p++) {
    if ((selected === undefined || selected[p]) && Number.isFinite(values[p])) kept.push(values[p]);
  }
  if (kept.length === 0) return NaN;
  kept.sort((a, b) => a - b);
  return kept[Math.min(kept.length - 1, Math.max(0, Math.ceil(q * kept.length) - 1))];
}

/** Display limits of positive-quantity images shown on one scale: 0.5% and 99.8% of all their pixels. */
export function sequentialRange(images: readonly ArrayLike<number>[]): [number, number] {
  const all = concatenate(images);
  let low = pixelQuantile(all, 0.005);
  let high = pixelQuantile(all, 0.998);
  if (!(high > low)) [low, high] = [low - 1, low + 1];
  return [low, high];
}

/** Symmetric limits [-m, m] for residual images: m the 99% point of |value| over the selected pixels, at least `floor`. */
export function symmetricRange(images: readonly ArrayLike<number>[], selected?: ArrayLike<number>, floor = 0): [number, number] {
  const magnitudes = images.map((image) => Float64Array.from(image as ArrayLike<number>, Math.abs));
  const chosen = selected === undefined ? undefined : concatenate(images.map(() => selected));
  let m = pixelQuantile(concatenate(magnitudes), 0.99, chosen);
  if (!(m > floor)) m = floor > 0 ? floor : 1;
  return [-m, m];
}

function concatenate(images: readonly ArrayLike<number>[]): Float64Array {
  const out = new Float64Array(images.reduce((n, image) => n + image.length, 0));
  let offset = 0;
  for (const image of images) {
    out.set(image as ArrayLike<number>, offset);
    offset += image.length;
  }
  return out;
}
