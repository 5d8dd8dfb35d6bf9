import { pixelText } from '../errors.js';
import { pixelOfPosition, type FlagCandidate, type FlagGrid } from './flagCandidate.js';
import { mapCandidates, type MapCandidateSettings } from './mapCandidates.js';
import { readFlagList } from './readFlagList.js';
import { isProbabilityMapFile, readProbabilityMap, type ProbabilityMap } from './readProbabilityMap.js';
import { runDefaults } from '../settings/runDefaults.js';

/** The flags of one file: a list, or a probability map and the candidates found in it. */
export interface FlagSet {
  readonly file: string;
  readonly kind: 'list' | 'map';
  readonly candidates: readonly FlagCandidate[];
  /** Present for a map. */
  readonly map: ProbabilityMap | undefined;
  /** The extraction settings used, for a map. */
  readonly mapSettings: MapCandidateSettings | undefined;
  /** Things the user should know (e.g. a flag outside the mask). */
  readonly notices: readonly string[];
}

/**
 * Reads flags from a CSV list (readFlagList) or a FITS or NPY probability map aligned with the
 * image (readProbabilityMap, then mapCandidates), chosen by the file's extension. A map with no
 * value at the threshold gives no candidates and a notice saying so.
 */
export function readFlags(
  file: string, data: FlagGrid & { readonly mask: Uint8Array }, mapSettings: MapCandidateSettings = { threshold: runDefaults.vet.mapThreshold, mergeRadiusArcsec: runDefaults.vet.mergeRadiusArcsec },
): FlagSet {
  const notices: string[] = [];
  if (isProbabilityMapFile(file)) {
    const map = readProbabilityMap(file, data, data.mask);
    const candidates = mapCandidates(map, data.mask, data, mapSettings);
    if (candidates.length === 0) {
      let highest = 0;
      for (let p = 0; p < map.values.length; p++) if (data.mask[p] !== 0) highest = Math.max(highest, map.values[p]);
      notices.push(`no candidates: no map value inside the mask reaches the threshold ${mapSettings.threshold} (the highest is ${highest}); nothing to vet`);
    }
    return { file, kind: 'map', candidates, map, mapSettings, notices };
  }
  const candidates = readFlagList(file, data);
  for (const c of candidates) {
    const pixel = pixelOfPosition(c.xArcsec, c.yArcsec, data);
    if (pixel !== undefined && data.mask[pixel[0] + data.columns * pixel[1]] === 0) {
      notices.push(`${c.origin}: flag ${c.id} lies outside the mask (${pixelText(pixel[0], pixel[1])}); it is vetted all the same`);
    }
  }
  return { file, kind: 'list', candidates, map: undefined, mapSettings: undefined, notices };
}
