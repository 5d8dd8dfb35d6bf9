import type { ModelEvidence } from './runModelEvidence.js';
import { weightsFromLogWeights } from '../numeric/statistics/weightsFromLogWeights.js';
import { parameterColumn, parameterSummary, upperLimit, type ParameterSummary } from '../results/index.js';
import type { PerturberSummary } from '../records/perturberSummary.js';
import type { ImagePlaneSky } from '../data/imagePlaneSky.js';
import { perturberSkyPosition } from './perturberSkyPosition.js';

/** Summarises every perturber of a perturbed model's weighted posterior; with `sky`, its RA and Dec too. */
export function summarisePerturbers(evidence: ModelEvidence, sky?: ImagePlaneSky): PerturberSummary[] {
  const { result, system, space } = evidence;
  const weights = weightsFromLogWeights(result.lnWeight);
  const width = space.physicalDim;
  return system.perturbers.map((binding) => {
    const mass = parameterColumn(result.points, width, binding.massIndex);
    const x = parameterColumn(result.points, width, binding.centerXIndex);
    const y = parameterColumn(result.points, width, binding.centerYIndex);
    const m200 = new Float64Array(result.count);
    const total = new Float64Array(result.count);
    const row = new Float64Array(width);
    for (let r = 0; r < result.count; r++) {
      if (weights[r] === 0) continue;
      for (let c = 0; c < width; c++) row[c] = result.points[r * width + c];
      const derived = binding.derived(row);
      m200[r] = Math.log10(derived.massM200Solar ?? Number.NaN);
      total[r] = Math.log10(derived.totalMassSolar);
    }
    const usable = (values: Float64Array): boolean => values.every((v, r) => weights[r] === 0 || Number.isFinite(v));
    const prior = space.priors[binding.massIndex];
    return {
      key: binding.key,
      kind: binding.kind,
      log10Mass: parameterSummary(mass, weights),
      log10MassUpperLimit95: upperLimit(mass, weights, 0.95),
      centerXArcsec: parameterSummary(x, weights),
      centerYArcsec: parameterSummary(y, weights),
      log10M200: usable(m200) ? parameterSummary(m200, weights) : null,
      log10TotalMass: usable(total) ? parameterSummary(total, weights) : null,
      massPriorRange: prior.isFixed ? null : [prior.lower, prior.upper],
      ...(sky === undefined ? {} : { sky: perturberSkyPosition(x, y, weights, sky) }),
    };
  });
}
