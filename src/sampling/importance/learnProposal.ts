import { equalWeightResample } from '../../numeric/resampling/equalWeightResample.js';
import { fitGaussianMixture } from './fitGaussianMixture.js';
import { studentComponent, type StudentComponent, type StudentMixture } from './studentMixture.js';

/** How a proposal is learned from weighted points. */
export interface ProposalShape {
  /** Student-t degrees of freedom of every component (an integer >= 1). */
  readonly dof: number;
  /** each component's scale matrix is its fitted covariance times this factor. */
  readonly scale: number;
  /** share of the uniform unit-cube component. */
  readonly defensive: number;
  /** share of the wide copies (scale matrices times wideScale) of the fitted components. */
  readonly wide: number;
  readonly maxComponents: number;
  /** rows above this are thinned by systematic resampling before the fit (EM costs rows x components x d^2). */
  readonly maxRows: number;
}

/** Scale-matrix factor of the wide copies (twice the width). */
export const wideScale = 4;

/**
 * A proposal for importance sampling learned from weighted points (frame coordinates): a Gaussian
 * mixture fitted by fitGaussianMixture, each component widened into a Student-t of `dof` degrees of
 * freedom with scale matrix `scale` times its covariance (heavier tails than the fitted posterior,
 * so that the weights keep a finite variance; the multivariate-t mixture proposals of adaptive
 * importance sampling, Cappe, Douc, Guillin, Marin & Robert 2008, Statistics and Computing 18, 447),
 * plus the defensive uniform component, and wide copies of the components (scale matrices times
 * wideScale) with share `wide`: a defensive mixture (Hesterberg 1995; Owen & Zhou 2000) that puts a
 * floor under q where the posterior reaches beyond the fitted shape (measured on the
 * 10-dimensional twisted Gaussian, six seeds: the spread of (ln Z - truth) / error fell from 1.17
 * to 0.80 with a share of 0.1, its mean from -0.53 to 0.08). Rows lighter than 1e-8 of the heaviest are left out, and
 * more than maxRows are thinned by systematic resampling.
 */
export function learnProposal(
  rows: Float64Array, weights: Float64Array, count: number, dim: number, shape: ProposalShape, seed: number,
): StudentMixture {
  let largest = 0;
  for (let i = 0; i < count; i++) if (weights[i] > largest) largest = weights[i];
  const kept: number[] = [];
  for (let i = 0; i < count; i++) if (weights[i] > 1e-8 * largest) kept.push(i);
  let fitRows = new Float64Array(kept.length * dim);
  let fitWeights = new Float64Array(kept.length);
  kept.forEach((row, n) => {
    fitRows.set(rows.subarray(row * dim, row * dim + dim), n * dim);
    fitWeights[n] = weights[row];
  });
  if (kept.length > shape.maxRows) {
    // Systematic resampling keeps each row about maxRows w_i times; the distinct rows, weighted by
    // their multiplicity, keep the Kish effective size honest (copies are not new points).
    const thinned = equalWeightResample(fitRows, dim, fitWeights, seed, shape.maxRows);
    const distinct: number[] = [];
    const multiplicity: number[] = [];
    for (let n = 0; n < thinned.count; n++) {
      const source = thinned.sourceRows[n];
      if (distinct.length > 0 && distinct[distinct.length - 1] === source) multiplicity[multiplicity.length - 1]++;
      else {
        distinct.push(source);
        multiplicity.push(1);
      }
    }
    const rowsBefore = fitRows;
    fitRows = new Float64Array(distinct.length * dim);
    distinct.forEach((source, n) => fitRows.set(rowsBefore.subarray(source * dim, source * dim + dim), n * dim));
    fitWeights = Float64Array.from(multiplicity);
  }
  const fit = fitGaussianMixture(fitRows, fitWeights, fitWeights.length, dim, { maxComponents: shape.maxComponents });
  const components: StudentComponent[] = [];
  for (const [share, factor] of [[1 - shape.wide, shape.scale], [shape.wide, shape.scale * wideScale]]) {
    if (share === 0) continue;
    const rootFactor = Math.sqrt(factor);
    fit.means.forEach((mean, k) => {
      const cholesky = Float64Array.from(fit.choleskys[k], (v) => v * rootFactor);
      components.push(studentComponent(Math.log(fit.shares[k] * share), mean, cholesky, dim));
    });
  }
  return { dim, dof: shape.dof, defensive: shape.defensive, components };
}
