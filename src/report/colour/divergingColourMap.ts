import { colourMapFromStops, type ColourMap } from './colourMap.js';

/** An odd table size, so that 0 (the middle of a symmetric range) falls on one entry, the near-white centre. */
export const DIVERGING_MAP_SIZE = 257;

/**
 * arcsift's diverging map "tide and rust", for residuals centred on 0. Its control points in
 * OKLCh (Ottosson 2020) are mirror images in lightness: L 0.35 at both ends, 0.66 a quarter in,
 * and a near-white 0.97 at the centre, so |value| is read from lightness alone and the two signs
 * weigh the same; negative values are blue (hue 262 to 245 deg), positive ones rust (50 to 33 deg),
 * a pair that red-green colour-blind viewers tell apart.
 */
export const divergingColourMap: ColourMap = colourMapFromStops('tide and rust', [
  { position: 0, lightness: 0.35, chroma: 0.12, hueDeg: 262 },
  { position: 0.25, lightness: 0.66, chroma: 0.1, hueDeg: 245 },
  { position: 0.5, lightness: 0.97, chroma: 0.006, hueDeg: 90 },
  { position: 0.75, lightness: 0.66, chroma: 0.115, hueDeg: 50 },
  { position: 1, lightness: 0.35, chroma: 0.11, hueDeg: 33 },
], DIVERGING_MAP_SIZE);
