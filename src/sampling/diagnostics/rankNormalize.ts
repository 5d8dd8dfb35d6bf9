import { standardNormalQuantile } from '../priors/standardNormal.js';
import type { Draws } from './splitChains.js';

// Rank normalisation (Vehtari, Gelman, Simpson, Carpenter & Buerkner 2021, eq. 14): pooled ranks r
// (ties share their average rank) mapped to z = Phi^{-1}((r - 3/8) / (S + 1/4)), Blom's offset.
export function rankNormalize(draws: Draws): Draws {
  const values = draws.values;
  const total = values.length;
  const order = new Int32Array(total);
  for (let i = 0; i < total; i++) order[i] = i;
  order.sort((a, b) => values[a] - values[b]);
  const z = new Float64Array(total);
  let start = 0;
  while (start < total) {
    let end = start + 1;
    while (end < total && values[order[end]] === values[order[start]]) end++;
    const rank = (start + 1 + end) / 2; // average of the 1-based ranks start+1 .. end
    const score = standardNormalQuantile((rank - 0.375) / (total + 0.25));
    for (let i = start; i < end; i++) z[order[i]] = score;
    start = end;
  }
  return { values: z, chains: draws.chains, drawsPerChain: draws.drawsPerChain };
}
