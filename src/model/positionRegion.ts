import type { ObservedData } from '../data/observedData.js';
import type { LensSystem } from './lensSystem.js';
import type { ParameterSpace } from '../priors/parameterSpace.js';

/**
 * Unit-square maps onto a perturber's position region, applied after the usual unit-cube
 * transform: each map sends the two unit coordinates of the centre to a point uniformly
 * distributed over the region, so the position prior is 1 / (region area) there and the
 * evidence stays normalised.
 * - disc: r = R sqrt(u1), phi = 2 pi u2 (the area-preserving polar map);
 * - mask: u1 picks a used pixel in proportion to its (equal) area and, with its remainder, the
 *   x offset inside it; u2 gives the y offset: uniform over the union of the used pixels' squares.
 */
export function positionRegionTransform(
  system: LensSystem, space: ParameterSpace, data: ObservedData,
): ((unit: Float64Array, physical: Float64Array) => void) | undefined {
  const maps = system.perturbers.filter((p) => p.positionPrior !== undefined).map((binding) => {
    const ux = Array.from(space.freeIndices).indexOf(binding.centerXIndex);
    const uy = Array.from(space.freeIndices).indexOf(binding.centerYIndex);
    const region = binding.positionPrior!;
    const xi = binding.centerXIndex;
    const yi = binding.centerYIndex;
    if (region.region === 'disc') {
      const { centerXArcsec: cx, centerYArcsec: cy, radiusArcsec: radius } = region;
      return (unit: Float64Array, out: Float64Array): void => {
        const r = radius * Math.sqrt(unit[ux]);
        const phi = 2 * Math.PI * unit[uy];
        out[xi] = cx + r * Math.cos(phi);
        out[yi] = cy + r * Math.sin(phi);
      };
    }
    const used = data.usedPixels;
    const count = used.length;
    const scale = data.pixelScaleArcsec;
    const columns = data.columns;
    const x0 = -((data.columns - 1) / 2) * scale;
    const y0 = -((data.rows - 1) / 2) * scale;
    return (unit: Float64Array, out: Float64Array): void => {
      const position = Math.min(unit[ux], 1 - 1e-16) * count;
      const k = Math.floor(position);
      const pixel = used[k];
      const j = Math.floor(pixel / columns);
      const i = pixel - j * columns;
      out[xi] = x0 + (i - 0.5 + (position - k)) * scale;
      out[yi] = y0 + (j - 0.5 + unit[uy]) * scale;
    };
  });
  if (maps.length === 0) return undefined;
  return (unit, physical) => {
    for (const map of maps) map(unit, physical);
  };
}
