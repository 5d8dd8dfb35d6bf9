import { linearSrgbFromOklab, oklabFromOklch, srgbFromLinear } from './oklab.js';

/** CSS hex of an OKLCh colour (Ottosson 2020), clipped into the sRGB gamut. */
export function hexFromOklch(lightness: number, chroma: number, hueDeg: number): string {
  const linear = linearSrgbFromOklab(oklabFromOklch(lightness, chroma, hueDeg));
  let hex = '#';
  for (const c of linear) hex += Math.round(255 * srgbFromLinear(Math.min(1, Math.max(0, c)))).toString(16).padStart(2, '0');
  return hex;
}

/**
 * The report's colours, chosen in OKLCh for this tool: a cool paper ground, slate ink, and one
 * colour per model, a deep blue for the smooth model and a vermilion for the perturbed one (a
 * pair red-green colour-blind readers tell apart), each with a pale tint for filled regions.
 */
export const reportPalette = {
  ground: hexFromOklch(0.965, 0.006, 250),
  card: hexFromOklch(0.995, 0.002, 250),
  rule: hexFromOklch(0.88, 0.012, 250),
  ink: hexFromOklch(0.26, 0.03, 260),
  muted: hexFromOklch(0.52, 0.025, 260),
  smooth: hexFromOklch(0.5, 0.13, 258),
  smoothTint: hexFromOklch(0.86, 0.05, 258),
  smoothDeep: hexFromOklch(0.7, 0.09, 258),
  perturbed: hexFromOklch(0.6, 0.17, 38),
  perturbedTint: hexFromOklch(0.9, 0.05, 45),
  perturbedDeep: hexFromOklch(0.76, 0.11, 42),
  truth: hexFromOklch(0.3, 0.02, 150),
  caution: hexFromOklch(0.8, 0.13, 80),
  cautionTint: hexFromOklch(0.97, 0.035, 85),
  outsideMask: hexFromOklch(0.8, 0.0, 0),
} as const;

export type ModelTone = 'smooth' | 'perturbed';

/** Line colour, and the tints of the 86.5% and 39.3% regions, of one model. */
export function modelColours(tone: ModelTone): { line: string; outer: string; inner: string } {
  return tone === 'smooth'
    ? { line: reportPalette.smooth, outer: reportPalette.smoothTint, inner: reportPalette.smoothDeep }
    : { line: reportPalette.perturbed, outer: reportPalette.perturbedTint, inner: reportPalette.perturbedDeep };
}
