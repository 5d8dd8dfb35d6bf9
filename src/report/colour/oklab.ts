/** A colour in OKLab: lightness L (0 black .. 1 white), and the opponent axes a (green-red) and b (blue-yellow). */
export type Oklab = readonly [lightness: number, a: number, b: number];

/** A colour as linear-light or gamma-encoded sRGB components, each 0..1 inside the gamut. */
export type Rgb = readonly [red: number, green: number, blue: number];

// sRGB electro-optical transfer function, IEC 61966-2-1:1999 (encoded component to linear light).
export function linearFromSrgb(encoded: number): number {
  return encoded <= 0.04045 ? encoded / 12.92 : ((encoded + 0.055) / 1.055) ** 2.4;
}

// Inverse sRGB transfer function, IEC 61966-2-1:1999 (linear light to encoded component).
export function srgbFromLinear(linear: number): number {
  return linear <= 0.0031308 ? 12.92 * linear : 1.055 * linear ** (1 / 2.4) - 0.055;
}

// Linear sRGB to OKLab, Ottosson 2020 ("A perceptual color space for image processing"): M1, cube root, M2.
export function oklabFromLinearSrgb([r, g, b]: Rgb): Oklab {
  const l = Math.cbrt(0.4122214708 * r + 0.5363325363 * g + 0.0514459929 * b);
  const m = Math.cbrt(0.2119034982 * r + 0.6806995451 * g + 0.1073969566 * b);
  const s = Math.cbrt(0.0883024619 * r + 0.2817188376 * g + 0.6299787005 * b);
  return [
    0.2104542553 * l + 0.793617785 * m - 0.0040720468 * s,
    1.9779984951 * l - 2.428592205 * m + 0.4505937099 * s,
    0.0259040371 * l + 0.7827717662 * m - 0.808675766 * s,
  ];
}

// OKLab to linear sRGB, Ottosson 2020: inverse M2, cube, inverse M1. Components may leave 0..1 outside the gamut.
export function linearSrgbFromOklab([lightness, a, b]: Oklab): Rgb {
  const l = (lightness + 0.3963377774 * a + 0.2158037573 * b) ** 3;
  const m = (lightness - 0.1055613458 * a - 0.0638541728 * b) ** 3;
  const s = (lightness - 0.0894841775 * a - 1.291485548 * b) ** 3;
  return [
    4.0767416621 * l - 3.3077115913 * m + 0.2309699292 * s,
    -1.2684380046 * l + 2.6097574011 * m - 0.3413193965 * s,
    -0.0041960863 * l - 0.7034186147 * m + 1.707614701 * s,
  ];
}

/** OKLab from its polar form OKLCh: lightness, chroma and hue angle in degrees (Ottosson 2020). */
export function oklabFromOklch(lightness: number, chroma: number, hueDeg: number): Oklab {
  const hue = (hueDeg * Math.PI) / 180;
  return [lightness, chroma * Math.cos(hue), chroma * Math.sin(hue)];
}
