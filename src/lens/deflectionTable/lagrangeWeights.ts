// Lagrange interpolation weights (Abramowitz & Stegun 1972, 25.2.2) at position u of the nodes
// 0, 1, ..., count - 1 (count from 1 to 4), written to out[0..count).
export function lagrangeWeights(u: number, count: number, out: Float64Array): void {
  for (let a = 0; a < count; a++) {
    let weight = 1;
    for (let b = 0; b < count; b++) if (b !== a) weight *= (u - b) / (a - b);
    out[a] = weight;
  }
}
