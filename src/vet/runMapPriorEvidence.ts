import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { modelParameterSpace } from '../inference/modelParameterSpace.js';
import { lensModelMethod, type EvidenceSettings, type ModelEvidence } from '../inference/runModelEvidence.js';
import { buildLensSystem } from '../model/lensSystem.js';
import { LikelihoodPool } from '../parallel/likelihoodPool.js';
import { runNested } from '../sampling/nested/index.js';
import type { MapPositionPrior } from './mapPositionPrior.js';
import { perturberPositionConfig } from './perturberPositionConfig.js';

/**
 * Nested sampling of the model with the config's first perturber whose position prior is a
 * probability map (MapPositionPrior) instead of two one-dimensional priors. The model's
 * ParameterSpace is built with uniform centre priors over the map's bounding box, which fixes
 * the two unit-cube coordinates of the centre; the transform then overwrites the centre with
 * the map's two-dimensional transform of those coordinates. The evidence is then that of a
 * model whose prior includes the network's map.
 */
export async function runMapPriorEvidence(
  config: ArcsiftConfig, data: ObservedData, prior: MapPositionPrior, settings: EvidenceSettings,
): Promise<ModelEvidence> {
  const { xMin, xMax, yMin, yMax } = prior.bounds;
  const boxed = perturberPositionConfig(config, [xMin, xMax], [yMin, yMax]);
  const system = buildLensSystem(boxed, { perturberCount: 1 });
  const space = modelParameterSpace(system);
  const binding = system.perturbers[0];
  const xIndex = binding.centerXIndex;
  const yIndex = binding.centerYIndex;
  const xUnit = space.freeIndices.indexOf(xIndex);
  const yUnit = space.freeIndices.indexOf(yIndex);
  const started = performance.now();
  const pool = await LikelihoodPool.start({ config: boxed, data, perturberCount: 1 }, settings.threads);
  try {
    const result = await runNested(
      {
        dim: space.dim,
        physicalDim: space.physicalDim,
        transform: (unit, out) => {
          space.fromUnitCube(unit, out);
          prior.fromUnit(unit[xUnit], unit[yUnit], out, xIndex, yIndex);
        },
        periodic: space.periodic,
        logLikelihood: (points, count) => pool.evaluate(points, count),
      },
      {
        livePoints: settings.livePoints,
        seed: settings.seed,
        method: lensModelMethod(settings.method, space.dim, 1),
        slice: {
          steps: settings.sliceSteps ?? Math.max(1, Math.round((settings.sliceStepsPerParameter ?? 2) * space.dim)),
          pointsPerChain: settings.slicePointsPerChain,
        },
        replacementsPerStep: settings.replacementsPerStep,
        lnZTolerance: settings.lnZTolerance,
        maxEvaluations: settings.maxEvaluations,
        checkpoint: settings.checkpointPath === undefined ? undefined : { path: settings.checkpointPath, everySeconds: settings.checkpointSeconds ?? 30 },
        resume: settings.resume,
        onProgress: settings.onProgress,
        signal: settings.signal,
      },
    );
    return {
      label: 'map prior', perturberCount: 1, system, space, result,
      seconds: (performance.now() - started) / 1000, threads: pool.threads, relabelled: false, occupancy: pool.occupancy,
    };
  } finally {
    await pool.close();
  }
}
