/**
 * Shape of an ensemble chain stored row-major as steps x walkers x dim:
 * value of parameter k of walker w at step s is chain[(s * walkers + w) * dim + k].
 */
export interface ChainLayout {
  readonly steps: number;
  readonly walkers: number;
  readonly dim: number;
}

/**
 * Copies parameter k of steps [fromStep, steps) into chain-major draws, one chain per walker:
 * draws[w * n + i], n = steps - fromStep. Every diagnostic that treats walkers as chains reads this.
 */
export function parameterDraws(
  chain: Float64Array, layout: ChainLayout, parameter: number, fromStep = 0,
  out = new Float64Array(layout.walkers * (layout.steps - fromStep)),
): Float64Array {
  const { steps, walkers, dim } = layout;
  const n = steps - fromStep;
  for (let w = 0; w < walkers; w++) {
    for (let i = 0; i < n; i++) out[w * n + i] = chain[((fromStep + i) * walkers + w) * dim + parameter];
  }
  return out;
}
