import type { AngleSummary, ImagePlaneSky } from '../data/imagePlaneSky.js';

/**
 * For a position-angle parameter (a name ending in `AngleDeg`: counter-clockwise from +x, the
 * README's convention) of an image with a celestial WCS, the field `eastOfNorthDeg` of its run
 * record: the same summary east of north at the image centre (ImagePlaneSky.eastOfNorthSummary).
 * Nothing for other parameters or without a WCS.
 */
export function eastOfNorthField(name: string, summary: AngleSummary, sky: ImagePlaneSky | undefined): { eastOfNorthDeg?: AngleSummary } {
  if (sky === undefined || !name.endsWith('AngleDeg')) return {};
  return { eastOfNorthDeg: sky.eastOfNorthSummary(summary) };
}
