import { gaussLegendre } from '../../../numeric/quadrature/gaussLegendre.js';
import { logSumExp } from '../../../numeric/statistics/logSumExp.js';
import type { NestedProblem } from '../nestedProblem.js';

/** Side of the egg-box prior square [0, 10 pi]. */
export const eggBoxSide = 10 * Math.PI;

/**
 * The egg-box likelihood of Feroz, Hobson & Bridges 2009, Section 7.2, eq. 33:
 * ln L = (2 + cos(x/2) cos(y/2))^5, uniform prior on [0, 10 pi]^2.
 */
export function eggBoxProblem(): NestedProblem {
  return {
    dim: 2,
    physicalDim: 2,
    transform(unit, out) {
      out[0] = unit[0] * eggBoxSide;
      out[1] = unit[1] * eggBoxSide;
    },
    logLikelihood(points, count) {
      const lnL = new Float64Array(count);
      for (let n = 0; n < count; n++) lnL[n] = (2 + Math.cos(points[2 * n] / 2) * Math.cos(points[2 * n + 1] / 2)) ** 5;
      return lnL;
    },
  };
}

/**
 * ln Z of the egg-box by a tensor Gauss-Legendre rule: `panels` equal panels per axis with
 * `order` nodes each, summed with log-sum-exp, divided by the prior area (10 pi)^2.
 */
export function eggBoxLnEvidence(panels = 80, order = 16): number {
  const { nodes, weights } = gaussLegendre(order);
  const width = eggBoxSide / panels;
  const axis = new Float64Array(panels * order);
  const lnAxisWeight = new Float64Array(panels * order);
  const cosine = new Float64Array(panels * order);
  for (let p = 0; p < panels; p++) {
    for (let q = 0; q < order; q++) {
      axis[p * order + q] = (p + 0.5) * width + 0.5 * width * nodes[q];
      lnAxisWeight[p * order + q] = Math.log(0.5 * width * weights[q]);
      cosine[p * order + q] = Math.cos(axis[p * order + q] / 2);
    }
  }
  const size = panels * order;
  const terms = new Float64Array(size * size);
  for (let i = 0; i < size; i++) {
    for (let j = 0; j < size; j++) {
      terms[i * size + j] = lnAxisWeight[i] + lnAxisWeight[j] + (2 + cosine[i] * cosine[j]) ** 5;
    }
  }
  return logSumExp(terms) - 2 * Math.log(eggBoxSide);
}
