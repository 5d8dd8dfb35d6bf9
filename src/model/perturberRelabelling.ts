import type { LensSystem } from './lensSystem.js';
import type { ParameterSpace } from '../priors/parameterSpace.js';

/**
 * Removes label switching between identical perturbers: after the unit-cube transform, the
 * perturbers' parameter blocks are reordered so that their x positions increase. Sorting maps
 * the cube K!-to-1 onto the ordered region with uniform density, so the prior there is the
 * original one times K!, normalised, and the evidence of a likelihood that is symmetric under
 * relabelling is unchanged (the "forced identifiability" ordering of e.g. Handley, Hobson &
 * Lasenby 2015). It applies only when every perturber has the same kind and the same priors;
 * otherwise the labels mean something and undefined is returned.
 */
export function perturberRelabelling(system: LensSystem, space: ParameterSpace): ((physical: Float64Array) => void) | undefined {
  const perturbers = system.perturbers;
  if (perturbers.length < 2) return undefined;
  const blocks = perturbers.map((binding) => space.names
    .map((name, index) => ({ name, index }))
    .filter(({ name }) => name.startsWith(`${binding.key}.`)));
  const suffixes = (k: number): string => blocks[k].map(({ name }) => name.slice(perturbers[k].key.length)).join(',');
  const priorsOf = (k: number): string => JSON.stringify(blocks[k].map(({ index }) => space.priors[index].spec));
  for (let k = 1; k < perturbers.length; k++) {
    if (perturbers[k].kind !== perturbers[0].kind || suffixes(k) !== suffixes(0) || priorsOf(k) !== priorsOf(0)) return undefined;
  }
  const blockIndices = blocks.map((block) => Int32Array.from(block, ({ index }) => index));
  const xIndices = perturbers.map((binding) => binding.centerXIndex);
  const count = perturbers.length;
  const width = blockIndices[0].length;
  const order = Array.from({ length: count }, (_, k) => k);
  const scratch = new Float64Array(count * width);
  return (physical) => {
    for (let k = 0; k < count; k++) order[k] = k;
    order.sort((a, b) => physical[xIndices[a]] - physical[xIndices[b]]);
    for (let k = 0; k < count; k++) {
      const from = blockIndices[order[k]];
      for (let c = 0; c < width; c++) scratch[k * width + c] = physical[from[c]];
    }
    for (let k = 0; k < count; k++) {
      const to = blockIndices[k];
      for (let c = 0; c < width; c++) physical[to[c]] = scratch[k * width + c];
    }
  };
}
