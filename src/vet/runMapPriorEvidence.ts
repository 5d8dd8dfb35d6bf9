import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { runModelEvidence, type EvidenceSettings, type ModelEvidence } from '../inference/runModelEvidence.js';
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
  return runModelEvidence(boxed, data, 1, settings, {
    label: 'map prior',
    transform: (system, space) => {
      const { centerXIndex: xIndex, centerYIndex: yIndex } = system.perturbers[0];
      const xUnit = space.freeIndices.indexOf(xIndex);
      const yUnit = space.freeIndices.indexOf(yIndex);
      return (unit, out) => prior.fromUnit(unit[xUnit], unit[yUnit], out, xIndex, yIndex);
    },
  });
}
