import { pixelText } from '../errors.js';
import { columnToXArcsec, rowToYArcsec, type FlagCandidate, type FlagGrid } from './flagCandidate.js';
import type { ProbabilityMap } from './readProbabilityMap.js';

/** Settings of candidate extraction from a map. */
export interface MapCandidateSettings {
  /** A local maximum is a candidate when its value is at least this (default 0.5). */
  readonly threshold: number;
  /** Maxima closer than this to a higher kept one are merged into it, arcsec (default 0.15). */
  readonly mergeRadiusArcsec: number;
}


/**
 * Candidates from a probability map: the pixels inside the mask whose value is at least the
 * threshold and at least that of each of their 8 neighbours (a plateau keeps its first pixel in
 * row-major order), taken from the highest down and each dropped when it lies within the merge
 * radius of one already kept (greedy non-maximum suppression, common practice). A candidate sits
 * at the value-weighted centroid of the 3 x 3 pixels around its peak (masked pixels count 0) and
 * its score is the peak value. A map with no value at the threshold has no candidates: a valid
 * answer (nothing flagged), not a mistake.
 */
export function mapCandidates(map: ProbabilityMap, mask: Uint8Array, grid: FlagGrid, settings: MapCandidateSettings): FlagCandidate[] {
  const { columns, rows, values } = map;
  const peaks: number[] = [];
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < columns; i++) {
      const p = i + columns * j;
      const v = values[p];
      if (mask[p] === 0 || v < settings.threshold) continue;
      let peak = true;
      for (let dj = -1; dj <= 1 && peak; dj++) {
        for (let di = -1; di <= 1; di++) {
          const ii = i + di;
          const jj = j + dj;
          if ((di === 0 && dj === 0) || ii < 0 || jj < 0 || ii >= columns || jj >= rows) continue;
          const q = ii + columns * jj;
          // Strictly above neighbours that come earlier in row-major order, at least those after.
          if (q < p ? values[q] >= v : values[q] > v) { peak = false; break; }
        }
      }
      if (peak) peaks.push(p);
    }
  }
  peaks.sort((a, b) => values[b] - values[a] || a - b);
  const kept: FlagCandidate[] = [];
  const radius2 = settings.mergeRadiusArcsec * settings.mergeRadiusArcsec;
  for (const p of peaks) {
    const i = p % columns;
    const j = Math.floor(p / columns);
    let sum = 0;
    let sumI = 0;
    let sumJ = 0;
    for (let jj = Math.max(0, j - 1); jj <= Math.min(rows - 1, j + 1); jj++) {
      for (let ii = Math.max(0, i - 1); ii <= Math.min(columns - 1, i + 1); ii++) {
        const w = values[ii + columns * jj];
        sum += w;
        sumI += w * ii;
        sumJ += w * jj;
      }
    }
    const xArcsec = columnToXArcsec(sumI / sum, grid);
    const yArcsec = rowToYArcsec(sumJ / sum, grid);
    if (kept.some((c) => (c.xArcsec - xArcsec) ** 2 + (c.yArcsec - yArcsec) ** 2 <= radius2)) continue;
    kept.push({ id: String(kept.length + 1), xArcsec, yArcsec, score: values[p], origin: `${map.file} ${pixelText(i, j)}` });
  }
  return kept;
}
