import { escapeMarkup } from '../text/escapeMarkup.js';
import { formatTick, niceTicks } from './niceTicks.js';
import { reportPalette } from '../colour/reportPalette.js';
import { FIGURE_FONT, px, textWidthPx } from '../text/svgText.js';

/** One family's row of the plot. */
export interface FamilyBayesFactorRow {
  readonly name: string;
  readonly lnBayesFactor: number;
  readonly lnBayesFactorError: number;
  /** Acceptable (smooth model passes the misfit test): a filled dot; set aside: a hollow grey one. */
  readonly acceptable: boolean;
}

const ROW_PX = 26;
const FONT_PX = 10;
const MARGIN = { right: 16, top: 26, bottom: 34 };

/**
 * ln B of each family with its 1-sigma error bar, one row per family, beside the detection
 * threshold and zero (dashed): filled vermilion dots for the acceptable families, on which the
 * verdict rests, hollow grey ones for the families set aside. A standalone SVG.
 */
export function familyBayesFactorSvg(rows: readonly FamilyBayesFactorRow[], thresholdLnB: number, widthPx = 640): string {
  const left = Math.min(260, Math.max(90, ...rows.map((r) => textWidthPx(r.name, FONT_PX) + 14)));
  const plotW = widthPx - left - MARGIN.right;
  const height = MARGIN.top + rows.length * ROW_PX + MARGIN.bottom;
  const values = rows.flatMap((r) => [r.lnBayesFactor - r.lnBayesFactorError, r.lnBayesFactor + r.lnBayesFactorError]).filter(Number.isFinite);
  let low = Math.min(0, thresholdLnB, ...values);
  let high = Math.max(0, thresholdLnB, ...values);
  const pad = 0.06 * (high - low || 1);
  low -= pad;
  high += pad;
  const X = (v: number): number => left + ((Math.min(Math.max(v, low), high) - low) / (high - low)) * plotW;
  const parts: string[] = [];
  const bottom = MARGIN.top + rows.length * ROW_PX;
  parts.push(`<rect x="${px(left)}" y="${MARGIN.top}" width="${px(plotW)}" height="${rows.length * ROW_PX}" fill="${reportPalette.card}" stroke="${reportPalette.rule}"/>`);
  const ticks = niceTicks(low, high, 6);
  for (const v of ticks.values) {
    parts.push(`<line x1="${px(X(v))}" x2="${px(X(v))}" y1="${MARGIN.top}" y2="${bottom + 3}" stroke="${reportPalette.rule}" stroke-width="0.5"/>`);
    parts.push(`<text x="${px(X(v))}" y="${bottom + 14}" text-anchor="middle">${formatTick(v, ticks.step)}</text>`);
  }
  parts.push(`<text x="${px(left + plotW / 2)}" y="${height - 6}" text-anchor="middle" fill="${reportPalette.muted}">ln B = ln Z perturbed &#8722; ln Z smooth (&#177;1&#963;)</text>`);
  for (const [value, label, colour] of [[0, 'ln B = 0', reportPalette.muted], [thresholdLnB, `threshold ${thresholdLnB}`, reportPalette.perturbed]] as const) {
    parts.push(`<line x1="${px(X(value))}" x2="${px(X(value))}" y1="${MARGIN.top - 4}" y2="${bottom}" stroke="${colour}" stroke-dasharray="4 3"/>`);
    parts.push(`<text x="${px(X(value))}" y="${MARGIN.top - 8}" text-anchor="middle" fill="${colour}">${escapeMarkup(label)}</text>`);
  }
  rows.forEach((r, k) => {
    const y = MARGIN.top + (k + 0.5) * ROW_PX;
    const colour = r.acceptable ? reportPalette.perturbed : reportPalette.muted;
    parts.push(`<text x="${px(left - 8)}" y="${px(y + 3.5)}" text-anchor="end"${r.acceptable ? '' : ` fill="${reportPalette.muted}"`}>${escapeMarkup(r.name)}</text>`);
    if (!Number.isFinite(r.lnBayesFactor)) return;
    parts.push(`<line x1="${px(X(r.lnBayesFactor - r.lnBayesFactorError))}" x2="${px(X(r.lnBayesFactor + r.lnBayesFactorError))}" y1="${px(y)}" y2="${px(y)}" stroke="${colour}" stroke-width="1.6"/>`);
    parts.push(`<circle cx="${px(X(r.lnBayesFactor))}" cy="${px(y)}" r="4.2" fill="${r.acceptable ? colour : reportPalette.card}" stroke="${colour}" stroke-width="1.6"/>`);
  });
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${widthPx}" height="${height}" viewBox="0 0 ${widthPx} ${height}" font-family="${FIGURE_FONT}" font-size="${FONT_PX}" fill="${reportPalette.ink}">${parts.join('')}</svg>`;
}
