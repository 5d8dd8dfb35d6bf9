import type { ImageMarker } from './imagePanelSvg.js';

/** Simulated perturber positions (truth.json values by parameter name) as image markers. */
export function perturberTruthMarkers(perturbers: readonly { readonly key: string }[], truth: ReadonlyMap<string, number>): ImageMarker[] {
  return perturbers.flatMap((p) => {
    const x = truth.get(`${p.key}.centerXArcsec`);
    const y = truth.get(`${p.key}.centerYArcsec`);
    return x === undefined || y === undefined ? [] : [{ kind: 'truth' as const, xArcsec: x, yArcsec: y }];
  });
}
