import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { writeJsonAtomic } from '../io/writeFileAtomic.js';
import { cornerData, parameterColumn, parameterSummary } from '../results/index.js';
import { writePosteriorTables } from '../records/posteriorTables.js';
import type { ModelEnsemble } from './runModelEnsemble.js';
import { writeFitImages } from './writeFitImages.js';
import { ImagePlaneSky } from '../data/imagePlaneSky.js';
import { eastOfNorthField } from './positionAngleOnSky.js';
import type { EnsembleParameterDiagnostics, EnsembleRecord } from '../records/ensembleRecord.js';
import type { ModelRecord } from '../records/modelRecord.js';

const finiteOrNull = (v: number): number | null => (Number.isFinite(v) ? v : null);

/**
 * Writes one model's ensemble chain after burn-in (walker-paths.csv and .npy, walker by walker,
 * with posterior.json), its corner-plot data over the free parameters, and the images of its
 * highest-ln L retained sample into `folder`; returns its record.
 */
export function writeEnsembleOutputs(
  ensemble: ModelEnsemble, config: ArcsiftConfig, data: ObservedData, folder: string,
): EnsembleRecord {
  const { result, space, system } = ensemble;
  const { walkers, dim } = result;
  const width = space.physicalDim;
  const units = system.parameters.map((p) => p.unit);
  const freeIndices = Array.from(space.freeIndices);
  const freeUnits = freeIndices.map((i) => units[i]);
  const count = (result.steps - result.retainedFrom) * walkers;
  const free = result.chain.subarray(result.retainedFrom * walkers * dim);
  const physical = new Float64Array(count * width);
  const lnLikelihood = new Float64Array(count);
  let best = 0;
  for (let r = 0; r < count; r++) {
    space.toPhysical(free, physical, r * dim, r * width);
    lnLikelihood[r] = result.logPosterior[result.retainedFrom * walkers + r] - space.logPrior(physical, r * width);
    if (lnLikelihood[r] > lnLikelihood[best]) best = r;
  }
  const steps = result.steps - result.retainedFrom;
  const files = writePosteriorTables(folder, {
    sampler: 'ensemble', names: space.names, units,
    walkerPaths: {
      walkers,
      sweeps: Float64Array.from({ length: steps }, (_, s) => (result.retainedFrom + s + 1) * result.thin),
      points: physical,
      lnPosterior: result.logPosterior.subarray(result.retainedFrom * walkers),
      lnLikelihood,
    },
  });
  const weights = new Float64Array(count).fill(1);
  files.cornerData = join(folder, 'corner.json');
  writeJsonAtomic(files.cornerData, cornerData(space.freeNames, freeUnits, free, weights));

  const bestVector = physical.slice(best * width, (best + 1) * width);
  const images = writeFitImages(config, data, ensemble.perturberCount, bestVector, `${ensemble.label} model (highest ln L sample after burn-in)`, folder);
  Object.assign(files, images.files);
  const bestFit: Record<string, number> = {};
  space.names.forEach((name, i) => { bestFit[name] = bestVector[i]; });

  const diagnostics = space.freeNames.map((name, k): EnsembleParameterDiagnostics => ({
    name,
    unit: freeUnits[k],
    autocorrelationTime: finiteOrNull(result.autocorrelationTime[k]),
    rHat: finiteOrNull(result.rHat[k]),
    bulkEffectiveSampleSize: finiteOrNull(result.effectiveSampleSize[k]),
    tailEffectiveSampleSize: finiteOrNull(result.tailEffectiveSampleSize[k]),
  }));
  const smallestEss = finiteOrNull(Math.min(...result.effectiveSampleSize, ...result.tailEffectiveSampleSize));
  const maxRHat = finiteOrNull(Math.max(...result.rHat));
  return {
    label: ensemble.label,
    start: ensemble.start,
    walkers,
    sweeps: result.sweeps,
    storedSweeps: result.steps,
    thin: result.thin,
    burnInSweeps: result.retainedFrom * result.thin,
    retainedSamples: count,
    evaluations: result.evaluations,
    nonFiniteProposals: result.nonFiniteProposals,
    ...(ensemble.rejections === null ? {} : { likelihoodRejections: ensemble.rejections }),
    stopRule: ensemble.stopRule,
    converged: result.converged,
    stopped: result.stopped,
    acceptanceFraction: { mean: mean(result.acceptanceFraction), min: Math.min(...result.acceptanceFraction) },
    autocorrelationReliable: result.autocorrelationReliable,
    smallestEffectiveSampleSize: smallestEss,
    maxRHat,
    diagnostics,
    warnings: chainWarnings(diagnostics, ensemble.stopRule, result.converged, result.sweeps, result.autocorrelationReliable),
    bestLnLikelihood: lnLikelihood[best],
    bestFit,
    bestFitAmplitudes: images.amplitudes,
    misfit: images.misfit,
    seconds: ensemble.seconds,
    threads: ensemble.threads,
    parameters: space.freeNames.map((name, k) => {
      const s = parameterSummary(parameterColumn(free, dim, k), weights);
      const entry = {
        name, unit: freeUnits[k], median: s.median,
        interval68: [s.interval68.lower, s.interval68.upper] as const,
        interval95: [s.interval95.lower, s.interval95.upper] as const,
      };
      return { ...entry, ...eastOfNorthField(entry.name, entry, ImagePlaneSky.of(data)) };
    }),
    files,
  };
}

/** The reasons, in words, not to trust a chain yet. */
function chainWarnings(
  diagnostics: readonly EnsembleParameterDiagnostics[], rule: ModelEnsemble['stopRule'], converged: boolean, sweeps: number,
  autocorrelationReliable: boolean,
): string[] {
  const warnings: string[] = [];
  if (!converged) {
    const few = diagnostics.filter((d) => !(Math.min(d.bulkEffectiveSampleSize ?? 0, d.tailEffectiveSampleSize ?? 0) >= rule.minEffectiveSampleSize));
    const unmixed = diagnostics.filter((d) => !((d.rHat ?? Infinity) <= rule.maxRHat));
    const ess = (d: EnsembleParameterDiagnostics): string => (d.bulkEffectiveSampleSize === null || d.tailEffectiveSampleSize === null
      ? 'n/a' : Math.min(d.bulkEffectiveSampleSize, d.tailEffectiveSampleSize).toFixed(0));
    const reasons = [
      ...(few.length > 0 ? [`bulk or tail ESS below ${rule.minEffectiveSampleSize} for ${few.map((d) => `${d.name} (${ess(d)})`).join(', ')}`] : []),
      ...(unmixed.length > 0 ? [`R-hat above ${rule.maxRHat} for ${unmixed.map((d) => `${d.name} (${d.rHat === null ? 'n/a' : d.rHat.toFixed(3)})`).join(', ')}`] : []),
    ];
    warnings.push(`the walkers have not mixed after ${sweeps} sweeps (${reasons.join('; ') || 'the rule was not checked'}): the intervals are not final; resume with --resume and a larger --max-sweeps`);
  }
  if (!autocorrelationReliable) {
    warnings.push('some autocorrelation time comes from a series too short for Sokal\'s window to close: read tau as a lower bound');
  }
  return warnings;
}

function mean(values: Float64Array): number {
  let sum = 0;
  for (let i = 0; i < values.length; i++) sum += values[i];
  return sum / values.length;
}
