import { linearSrgbFromOklab, oklabFromOklch, srgbFromLinear, type Oklab } from './oklab.js';

/** One control point of a colour map, in OKLCh (Ottosson 2020): where it sits on 0..1 and its colour. */
export interface ColourStop {
  readonly position: number;
  readonly lightness: number;
  readonly chroma: number;
  readonly hueDeg: number;
}

/** A colour map sampled into a table; entry k is the colour at k / (size - 1). */
export interface ColourMap {
  readonly name: string;
  readonly stops: readonly ColourStop[];
  readonly size: number;
  /** size * 3 OKLab components, the interpolated colours before conversion to sRGB. */
  readonly oklab: Float64Array;
  /** size * 3 gamma-encoded sRGB components in 0..1, before rounding to bytes. */
  readonly srgb: Float64Array;
  /** size * 3 sRGB bytes (red, green, blue). */
  readonly bytes: Uint8Array;
  /** Table entries whose linear sRGB left 0..1 by more than 1e-6 and were clipped. */
  readonly clippedEntries: number;
}

/** Entries of every colour map table (common practice: 256, one per byte value). */
export const COLOUR_MAP_SIZE = 256;

/**
 * Builds a colour map from OKLCh control points, interpolated piecewise linearly in OKLab's
 * Cartesian coordinates (so lightness, linear between stops, is monotonic wherever the stops' is),
 * and converted to sRGB (IEC 61966-2-1). Positions must start at 0, end at 1 and increase.
 */
export function colourMapFromStops(name: string, stops: readonly ColourStop[], size = COLOUR_MAP_SIZE): ColourMap {
  if (stops.length < 2 || stops[0].position !== 0 || stops[stops.length - 1].position !== 1) {
    throw new Error(`colour map ${name}: stops must run from position 0 to position 1`);
  }
  for (let k = 1; k < stops.length; k++) {
    if (!(stops[k].position > stops[k - 1].position)) throw new Error(`colour map ${name}: stop positions must increase`);
  }
  const lab = stops.map((s) => oklabFromOklch(s.lightness, s.chroma, s.hueDeg));
  const oklab = new Float64Array(size * 3);
  const srgb = new Float64Array(size * 3);
  const bytes = new Uint8Array(size * 3);
  let clippedEntries = 0;
  let segment = 0;
  for (let k = 0; k < size; k++) {
    const t = k / (size - 1);
    while (segment < stops.length - 2 && t > stops[segment + 1].position) segment++;
    const t0 = stops[segment].position;
    const f = (t - t0) / (stops[segment + 1].position - t0);
    const a = lab[segment];
    const b = lab[segment + 1];
    const colour: Oklab = [a[0] + f * (b[0] - a[0]), a[1] + f * (b[1] - a[1]), a[2] + f * (b[2] - a[2])];
    const linear = linearSrgbFromOklab(colour);
    let clipped = false;
    for (let c = 0; c < 3; c++) {
      oklab[k * 3 + c] = colour[c];
      if (linear[c] < -1e-6 || linear[c] > 1 + 1e-6) clipped = true;
      const encoded = srgbFromLinear(Math.min(1, Math.max(0, linear[c])));
      srgb[k * 3 + c] = encoded;
      bytes[k * 3 + c] = Math.round(encoded * 255);
    }
    if (clipped) clippedEntries++;
  }
  return { name, stops, size, oklab, srgb, bytes, clippedEntries };
}

/** Index into a colour map's table of value t in 0..1 (clamped; NaN gives -1). */
export function colourIndex(map: ColourMap, t: number): number {
  if (Number.isNaN(t)) return -1;
  const k = Math.round(t * (map.size - 1));
  return k < 0 ? 0 : k >= map.size ? map.size - 1 : k;
}

/** CSS hex colour of table entry k. */
export function colourHex(map: ColourMap, k: number): string {
  let hex = '#';
  for (let c = 0; c < 3; c++) hex += map.bytes[k * 3 + c].toString(16).padStart(2, '0');
  return hex;
}
