import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { writeJsonAtomic } from '../io/writeFileAtomic.js';
import { equalWeightResample } from '../numeric/resampling/equalWeightResample.js';
import { weightsFromLogWeights } from '../numeric/statistics/weightsFromLogWeights.js';
import { cornerData, parameterColumn, parameterSummary } from '../results/index.js';
import { writePosteriorTables } from '../records/posteriorTables.js';
import type { ModelEvidence } from './runModelEvidence.js';
import { writeFitImages } from './writeFitImages.js';
import { ImagePlaneSky } from '../data/imagePlaneSky.js';
import { eastOfNorthField } from './positionAngleOnSky.js';
import type { EvidenceRecord, ModelRecord } from '../records/modelRecord.js';
import type { NestedResult } from '../sampling/nested/index.js';

/**
 * Writes one model's posterior tables (weighted and equal-weight, CSV and NPY, posterior.json),
 * corner-plot data, and the best-fit model image, residual and normalised residual as FITS into
 * `folder`; returns its record.
 */
export function writeModelOutputs(
  evidence: ModelEvidence, config: ArcsiftConfig, data: ObservedData, folder: string, seed: number,
): ModelRecord {
  const { result, space, system } = evidence;
  const names = space.names;
  const units = system.parameters.map((p) => p.unit);
  const width = space.physicalDim;
  const weights = weightsFromLogWeights(result.lnWeight);
  const equal = equalWeightResample(result.points, width, weights, seed);
  const files = writePosteriorTables(folder, {
    sampler: 'nested', names, units, lnEvidence: result.lnZ, lnEvidenceError: result.lnZError,
    weighted: { points: result.points, lnWeight: result.lnWeight, lnLikelihood: result.lnL },
    draws: { points: equal.points, lnLikelihood: Float64Array.from(equal.sourceRows, (row) => result.lnL[row]) },
  });

  const freeNames = space.freeNames;
  const freeIndices = Array.from(space.freeIndices);
  const freePoints = new Float64Array(result.count * freeIndices.length);
  for (let r = 0; r < result.count; r++) {
    freeIndices.forEach((index, k) => { freePoints[r * freeIndices.length + k] = result.points[r * width + index]; });
  }
  files.cornerData = join(folder, 'corner.json');
  writeJsonAtomic(files.cornerData, cornerData(freeNames, freeIndices.map((i) => units[i]), freePoints, weights));

  let best = 0;
  for (let r = 1; r < result.count; r++) if (result.lnL[r] > result.lnL[best]) best = r;
  const bestVector = result.points.slice(best * width, (best + 1) * width);
  const images = writeFitImages(config, data, evidence.perturberCount, bestVector, `${evidence.label} model (highest ln L sample)`, folder);
  Object.assign(files, images.files);

  const bestFit: Record<string, number> = {};
  names.forEach((name, i) => { bestFit[name] = bestVector[i]; });
  const bestFitAmplitudes = images.amplitudes;
  return {
    label: evidence.label,
    lnEvidence: result.lnZ,
    lnEvidenceError: result.lnZError,
    lnEvidenceErrorSimulated: result.lnZErrorSimulated,
    informationNats: result.information,
    livePoints: result.livePoints,
    method: result.method,
    iterations: result.iterations,
    evaluations: result.evaluations,
    efficiency: result.efficiency,
    nonFiniteLikelihoods: result.nonFiniteCount,
    ...(evidence.rejections === null ? {} : { likelihoodRejections: evidence.rejections }),
    insertionRankPValue: result.insertionRank.pValue,
    insertionRankWarning: result.insertionRank.biased,
    evidence: evidenceRecordOf(result),
    stopReason: result.stopReason,
    bestLnLikelihood: result.lnL[best],
    bestFit,
    bestFitAmplitudes,
    misfit: images.misfit,
    seconds: evidence.seconds,
    threads: evidence.threads,
    parameters: freeIndices.map((index) => {
      const s = parameterSummary(parameterColumn(result.points, width, index), weights);
      const entry = {
        name: names[index], unit: units[index], median: s.median,
        interval68: [s.interval68.lower, s.interval68.upper] as const,
        interval95: [s.interval95.lower, s.interval95.upper] as const,
      };
      return { ...entry, ...eastOfNorthField(entry.name, entry, ImagePlaneSky.of(data)) };
    }),
    files,
  };
}

/** The record of how ln Z was estimated (see EvidenceRecord). */
function evidenceRecordOf(result: NestedResult): EvidenceRecord {
  const importance = result.importance;
  return {
    method: result.evidenceMethod,
    nestedLnEvidence: result.nestedLnZ,
    nestedLnEvidenceError: result.nestedLnZError,
    importance: importance === null ? null : {
      evaluations: importance.evaluations,
      finalDraws: importance.final.draws,
      effectiveSampleSize: importance.final.effectiveSampleSize,
      largestWeightShare: importance.final.largestWeightShare,
      paretoShape: importance.final.paretoShape,
      paretoShapeLimit: importance.final.paretoShapeLimit,
      proposalComponents: importance.proposal.components.length,
      stages: importance.stages.length,
      repeatZ: importance.repeatZ,
      nestedZ: importance.nestedZ,
      suspect: importance.suspect,
      nestedDisagrees: importance.nestedDisagrees,
    },
  };
}
