/** Fonts of every figure; a figure opened on its own falls back to the reader's sans-serif. */
export const FIGURE_FONT = "'Inter', 'Segoe UI', 'Helvetica Neue', Arial, sans-serif";

/** Rough width of a label in this font: 0.56 em per character (common practice for sans-serif estimates). */
export function textWidthPx(text: string, fontSizePx: number): number {
  return 0.56 * fontSizePx * text.length;
}

/** One coordinate for SVG path data, to a tenth of a pixel. */
export function px(value: number): string {
  return (Math.round(value * 10) / 10).toString();
}
