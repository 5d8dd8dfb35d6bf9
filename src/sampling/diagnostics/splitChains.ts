/** Chain-major draws of one quantity: value i of chain j at draws[j * drawsPerChain + i]. */
export interface Draws {
  readonly values: Float64Array;
  readonly chains: number;
  readonly drawsPerChain: number;
}

// Split chains (Gelman et al. 2013, BDA3 sec. 11.4; Vehtari et al. 2021, sec. 3): each chain's
// first and second halves become two chains (the middle draw is dropped when n is odd), so
// a trend within one chain shows up as disagreement between chains.
export function splitChains(draws: Draws): Draws {
  const { values, chains, drawsPerChain } = draws;
  const half = Math.floor(drawsPerChain / 2);
  const out = new Float64Array(2 * chains * half);
  const skip = drawsPerChain - half;
  for (let j = 0; j < chains; j++) {
    const base = j * drawsPerChain;
    for (let i = 0; i < half; i++) {
      out[2 * j * half + i] = values[base + i];
      out[(2 * j + 1) * half + i] = values[base + skip + i];
    }
  }
  return { values: out, chains: 2 * chains, drawsPerChain: half };
}
