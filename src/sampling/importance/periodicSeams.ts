/**
 * Where to cut each periodic unit coordinate so that the posterior does not straddle the cut: the
 * middle of the widest circular gap between the coordinate values of the rows that carry the
 * posterior (the heaviest rows holding all but 1e-6 of the weight). 0 for a coordinate that does
 * not wrap. A proposal is then fitted and drawn in frame coordinates f = (u - seam) mod 1, a
 * measure-preserving map of the unit circle onto [0, 1), so the prior stays uniform on [0, 1).
 */
export function periodicSeams(
  unitRows: Float64Array, weights: Float64Array, count: number, dim: number, periodic: readonly boolean[],
): Float64Array {
  const seams = new Float64Array(dim);
  if (!periodic.some((p) => p)) return seams;
  const order = Array.from({ length: count }, (_, i) => i).sort((a, b) => weights[b] - weights[a] || a - b);
  let total = 0;
  for (let i = 0; i < count; i++) total += weights[i];
  const carrying: number[] = [];
  let held = 0;
  for (const row of order) {
    if (held >= (1 - 1e-6) * total || !(weights[row] > 0)) break;
    carrying.push(row);
    held += weights[row];
  }
  for (let j = 0; j < dim; j++) {
    if (!periodic[j] || carrying.length === 0) continue;
    const values = Float64Array.from(carrying, (row) => unitRows[row * dim + j]).sort();
    let widest = values[0] + 1 - values[values.length - 1];
    let seam = (values[values.length - 1] + widest / 2) % 1;
    for (let n = 1; n < values.length; n++) {
      const gap = values[n] - values[n - 1];
      if (gap > widest) {
        widest = gap;
        seam = values[n - 1] + gap / 2;
      }
    }
    seams[j] = seam;
  }
  return seams;
}

/** Frame coordinates f = (u - seam) mod 1 of a unit row (see periodicSeams). */
export function toFrame(unit: ArrayLike<number>, unitOffset: number, seams: Float64Array, out: Float64Array, outOffset: number): void {
  for (let j = 0; j < seams.length; j++) {
    const shifted = unit[unitOffset + j] - seams[j];
    out[outOffset + j] = seams[j] === 0 ? shifted : shifted - Math.floor(shifted);
  }
}

/** Unit coordinates u = (f + seam) mod 1 of a frame row inside [0, 1)^d. */
export function fromFrame(frame: ArrayLike<number>, frameOffset: number, seams: Float64Array, out: Float64Array, outOffset: number): void {
  for (let j = 0; j < seams.length; j++) {
    const shifted = frame[frameOffset + j] + seams[j];
    out[outOffset + j] = shifted >= 1 ? shifted - 1 : shifted;
  }
}
