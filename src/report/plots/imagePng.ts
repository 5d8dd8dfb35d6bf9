import { PNG } from 'pngjs';
import { colourIndex, type ColourMap } from '../colour/colourMap.js';

/** A row-major image (index i + columns * j, row 0 at the bottom) and how to colour it. */
export interface ImageColouring {
  readonly values: ArrayLike<number>;
  readonly columns: number;
  readonly rows: number;
  readonly map: ColourMap;
  /** Values mapped to the ends of the colour map; values beyond are clipped to the ends. */
  readonly low: number;
  readonly high: number;
  /** Pixels with hidden[p] = 1 are painted `hiddenColour` instead (e.g. outside the mask). */
  readonly hidden?: ArrayLike<number>;
  /** sRGB bytes; default a neutral grey. */
  readonly hiddenColour?: readonly [number, number, number];
  /** Each image pixel becomes a block of upscale x upscale PNG pixels (nearest neighbour); default 1. */
  readonly upscale?: number;
}

/**
 * Encodes an image as an RGB PNG through pngjs. PNG stores scanlines top first (PNG
 * specification, W3C 2003, sec. 7.2), so image row 0, arcsift's bottom row, becomes the last
 * scanline: the picture appears the way DEVELOPERS.md orients the sky (y up).
 */
export function imagePng(colouring: ImageColouring): Buffer {
  const { values, columns, rows, map, low, high, hidden } = colouring;
  const upscale = colouring.upscale ?? 1;
  const hiddenColour = colouring.hiddenColour ?? [204, 204, 204];
  const width = columns * upscale;
  const height = rows * upscale;
  const png = new PNG({ width, height, colorType: 2, inputColorType: 6, inputHasAlpha: true });
  const span = high - low;
  const toUnit = span > 0 ? 1 / span : 0;
  const table = map.bytes;
  for (let j = 0; j < rows; j++) {
    const top = (rows - 1 - j) * upscale;
    for (let i = 0; i < columns; i++) {
      const p = i + columns * j;
      let r: number;
      let g: number;
      let b: number;
      const k = hidden !== undefined && hidden[p] ? -1 : colourIndex(map, span > 0 ? (values[p] - low) * toUnit : 0.5);
      if (k < 0) {
        [r, g, b] = hiddenColour;
      } else {
        r = table[3 * k];
        g = table[3 * k + 1];
        b = table[3 * k + 2];
      }
      for (let dy = 0; dy < upscale; dy++) {
        let o = ((top + dy) * width + i * upscale) * 4;
        for (let dx = 0; dx < upscale; dx++, o += 4) {
          png.data[o] = r;
          png.data[o + 1] = g;
          png.data[o + 2] = b;
          png.data[o + 3] = 255;
        }
      }
    }
  }
  return PNG.sync.write(png, { colorType: 2, inputColorType: 6, inputHasAlpha: true });
}
