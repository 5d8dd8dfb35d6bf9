import { escapeMarkup } from '../text/escapeMarkup.js';
import { formatTick, niceTicks } from './niceTicks.js';
import { reportPalette } from '../colour/reportPalette.js';
import { FIGURE_FONT, px } from '../text/svgText.js';

/** One line of a panel, optionally with a shaded band (e.g. a 68% range across walkers). */
export interface LineSeries {
  readonly x: ArrayLike<number>;
  readonly y: ArrayLike<number>;
  readonly colour: string;
  readonly widthPx?: number;
  readonly opacity?: number;
  readonly dashed?: boolean;
  readonly band?: { readonly lower: ArrayLike<number>; readonly upper: ArrayLike<number> };
}

/** One panel of a line plot. */
export interface LinePanel {
  readonly title: string;
  readonly xLabel: string;
  readonly yLabel: string;
  readonly series: readonly LineSeries[];
  /** Horizontal reference lines. */
  readonly references?: readonly { readonly y: number; readonly colour: string; readonly label?: string }[];
  /** Fixed y range; default: every finite value of the series, bands and references. */
  readonly yRange?: readonly [number, number];
}

export interface LinePlotOptions {
  readonly columns?: number;
  readonly panelWidthPx?: number;
  readonly panelHeightPx?: number;
  /** Legend entries under the panels. */
  readonly legend?: readonly { readonly colour: string; readonly label: string }[];
}

/** Points drawn per line at most; longer series are thinned to evenly spaced indices. */
const MAX_POINTS = 400;
const MARGIN = { left: 46, right: 10, top: 20, bottom: 32 };
const FONT_PX = 9;

function range(values: number[]): [number, number] {
  let low = Infinity;
  let high = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    if (v < low) low = v;
    if (v > high) high = v;
  }
  if (!(high >= low)) return [0, 1];
  if (high === low) return [low - 0.5, high + 0.5];
  const pad = 0.04 * (high - low);
  return [low - pad, high + pad];
}

function thinned(length: number): number[] {
  if (length <= MAX_POINTS) return Array.from({ length }, (_, k) => k);
  return Array.from({ length: MAX_POINTS }, (_, k) => Math.round((k * (length - 1)) / (MAX_POINTS - 1)));
}

/**
 * Small multiples of line plots as one standalone SVG: each panel with its own axes, ticks
 * (Heckbert 1990 nice numbers), title and labels, lines thinned to at most 400 points.
 */
export function linePlotSvg(panels: readonly LinePanel[], options: LinePlotOptions = {}): string {
  const columns = Math.max(1, Math.min(options.columns ?? 2, panels.length));
  const w = options.panelWidthPx ?? 300;
  const h = options.panelHeightPx ?? 170;
  const rows = Math.ceil(panels.length / columns);
  const legendHeight = options.legend === undefined || options.legend.length === 0 ? 0 : 20;
  const width = columns * w;
  const height = rows * h + legendHeight;
  const parts: string[] = [];
  panels.forEach((panel, k) => {
    const ox = (k % columns) * w;
    const oy = Math.floor(k / columns) * h;
    const plotW = w - MARGIN.left - MARGIN.right;
    const plotH = h - MARGIN.top - MARGIN.bottom;
    const xs: number[] = [];
    const ys: number[] = [];
    for (const s of panel.series) {
      for (let i = 0; i < s.x.length; i++) xs.push(s.x[i]);
      for (let i = 0; i < s.y.length; i++) ys.push(s.y[i]);
      if (s.band !== undefined) for (let i = 0; i < s.band.lower.length; i++) ys.push(s.band.lower[i], s.band.upper[i]);
    }
    for (const r of panel.references ?? []) ys.push(r.y);
    const [x0, x1] = range(xs);
    const [y0, y1] = panel.yRange ?? range(ys);
    const X = (v: number): number => ox + MARGIN.left + ((v - x0) / (x1 - x0)) * plotW;
    const Y = (v: number): number => oy + MARGIN.top + (1 - (Math.min(Math.max(v, y0), y1) - y0) / (y1 - y0)) * plotH;
    parts.push(`<rect x="${px(ox + MARGIN.left)}" y="${px(oy + MARGIN.top)}" width="${px(plotW)}" height="${px(plotH)}" fill="${reportPalette.card}" stroke="${reportPalette.rule}"/>`);
    const xt = niceTicks(x0, x1, 5);
    const yt = niceTicks(y0, y1, 4);
    for (const v of xt.values) {
      parts.push(`<line x1="${px(X(v))}" x2="${px(X(v))}" y1="${px(oy + MARGIN.top + plotH)}" y2="${px(oy + MARGIN.top + plotH + 3)}" stroke="${reportPalette.muted}"/>`);
      parts.push(`<text x="${px(X(v))}" y="${px(oy + MARGIN.top + plotH + 12)}" text-anchor="middle">${formatTick(v, xt.step)}</text>`);
    }
    for (const v of yt.values) {
      parts.push(`<line x1="${px(ox + MARGIN.left - 3)}" x2="${px(ox + MARGIN.left + plotW)}" y1="${px(Y(v))}" y2="${px(Y(v))}" stroke="${reportPalette.rule}" stroke-width="0.5"/>`);
      parts.push(`<text x="${px(ox + MARGIN.left - 5)}" y="${px(Y(v) + 3)}" text-anchor="end">${formatTick(v, yt.step)}</text>`);
    }
    parts.push(`<text x="${px(ox + MARGIN.left)}" y="${px(oy + 13)}" font-weight="600">${escapeMarkup(panel.title)}</text>`);
    parts.push(`<text x="${px(ox + MARGIN.left + plotW / 2)}" y="${px(oy + h - 6)}" text-anchor="middle" fill="${reportPalette.muted}">${escapeMarkup(panel.xLabel)}</text>`);
    parts.push(`<text transform="translate(${px(ox + 10)} ${px(oy + MARGIN.top + plotH / 2)}) rotate(-90)" text-anchor="middle" fill="${reportPalette.muted}">${escapeMarkup(panel.yLabel)}</text>`);
    for (const s of panel.series) {
      const keep = thinned(Math.min(s.x.length, s.y.length));
      if (s.band !== undefined) {
        const band = s.band;
        const upper = keep.map((i) => `${px(X(s.x[i]))},${px(Y(band.upper[i]))}`);
        const lower = keep.slice().reverse().map((i) => `${px(X(s.x[i]))},${px(Y(band.lower[i]))}`);
        parts.push(`<polygon points="${[...upper, ...lower].join(' ')}" fill="${s.colour}" fill-opacity="0.18" stroke="none"/>`);
      }
      const points = keep.filter((i) => Number.isFinite(s.x[i]) && Number.isFinite(s.y[i])).map((i) => `${px(X(s.x[i]))},${px(Y(s.y[i]))}`);
      if (points.length > 1) {
        parts.push(`<polyline points="${points.join(' ')}" fill="none" stroke="${s.colour}" stroke-width="${s.widthPx ?? 1.2}"${s.opacity === undefined ? '' : ` stroke-opacity="${s.opacity}"`}${s.dashed === true ? ' stroke-dasharray="4 3"' : ''}/>`);
      }
    }
    for (const r of panel.references ?? []) {
      parts.push(`<line x1="${px(ox + MARGIN.left)}" x2="${px(ox + MARGIN.left + plotW)}" y1="${px(Y(r.y))}" y2="${px(Y(r.y))}" stroke="${r.colour}" stroke-dasharray="2 3"/>`);
      if (r.label !== undefined) parts.push(`<text x="${px(ox + MARGIN.left + plotW - 3)}" y="${px(Y(r.y) - 3)}" text-anchor="end" fill="${r.colour}">${escapeMarkup(r.label)}</text>`);
    }
  });
  (options.legend ?? []).forEach((entry, k) => {
    const x = MARGIN.left + k * 150;
    const y = rows * h + 12;
    parts.push(`<line x1="${x}" x2="${x + 18}" y1="${y - 3}" y2="${y - 3}" stroke="${entry.colour}" stroke-width="2"/>`);
    parts.push(`<text x="${x + 23}" y="${y}">${escapeMarkup(entry.label)}</text>`);
  });
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="${FIGURE_FONT}" font-size="${FONT_PX}" fill="${reportPalette.ink}">${parts.join('')}</svg>`;
}
