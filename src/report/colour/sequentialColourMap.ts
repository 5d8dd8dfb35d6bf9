import { colourMapFromStops, type ColourMap } from './colourMap.js';

/**
 * arcsift's sequential map "ink to straw", for images of positive quantities. Its five control
 * points in OKLCh (Ottosson 2020) climb in lightness L from 0.20 to 0.96 in steps of 0.19 or so,
 * so lightness alone orders the values (monotonic lightness, common practice for sequential maps);
 * the hue turns from deep indigo (285 deg) through blue and teal to a pale straw yellow (102 deg),
 * along the blue-yellow direction that red-green colour-blind viewers still see. Chroma stays
 * inside the sRGB gamut all along (checked in the tests).
 */
export const sequentialColourMap: ColourMap = colourMapFromStops('ink to straw', [
  { position: 0, lightness: 0.2, chroma: 0.075, hueDeg: 285 },
  { position: 0.25, lightness: 0.4, chroma: 0.1, hueDeg: 255 },
  { position: 0.5, lightness: 0.6, chroma: 0.09, hueDeg: 198 },
  { position: 0.75, lightness: 0.79, chroma: 0.13, hueDeg: 128 },
  { position: 1, lightness: 0.96, chroma: 0.075, hueDeg: 102 },
]);
