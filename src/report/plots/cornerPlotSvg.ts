import type { CornerData, CornerPair, CornerParameter } from '../../results/cornerData.js';
import { cornerPairRegions } from './cornerPairRegions.js';
import type { ContourRegion } from '../../numeric/contour/contourRegion.js';
import { escapeMarkup } from '../text/escapeMarkup.js';
import { digitsForSpread, formatNumber } from '../text/formatNumber.js';
import { formatTick, niceTicks } from './niceTicks.js';
import { parameterLabel } from '../text/parameterLabel.js';
import { modelColours, reportPalette, type ModelTone } from '../colour/reportPalette.js';
import { FIGURE_FONT, px, textWidthPx } from '../text/svgText.js';

/** One model's posterior drawn in a corner plot. */
export interface CornerLayer {
  readonly tone: ModelTone;
  readonly label: string;
  readonly data: CornerData;
}

export interface CornerPlotOptions {
  /** Parameter names to draw, in order; a name missing from a layer is left out of that layer. */
  readonly parameters: readonly string[];
  /** Posteriors, drawn in order (the first underneath). */
  readonly layers: readonly CornerLayer[];
  /** True values by parameter name, drawn as dashed lines and a diamond. */
  readonly truth?: ReadonlyMap<string, number>;
  /** Side of each panel in px; default 150 for up to 4 parameters, else 88. */
  readonly panelPx?: number;
  readonly title?: string;
  /**
   * Gaussian smoothing of the 2-D densities, in bins, before the regions are traced (only for
   * corner data not smoothed already); default 0.
   */
  readonly smoothingSigmaBins?: number;
}

interface Axis {
  readonly name: string;
  readonly unit: string;
  readonly low: number;
  readonly high: number;
  /** Per layer: index of this parameter in the layer's corner data, or -1. */
  readonly indexInLayer: number[];
}

const GAP_PX = 5;
/** Shortest step between drawn contour points, px. */
const MIN_STEP_PX = 0.8;
/** Each axis shows every model's 95% interval with this fraction of its width added on both sides. */
const ZOOM_MARGIN = 0.35;
const TICK_FONT_PX = 8.5;
const LABEL_FONT_PX = 9.5;
const TITLE_FONT_PX = 10;

/**
 * A corner plot as a standalone SVG string: 1-D marginal histograms on the diagonal with each
 * model's median, 68% and 95% intervals as a whisker below; 2-D marginals under it with the 86.5%
 * and 39.3% highest-density regions filled and outlined (the 2-D 2 and 1 sigma masses, see
 * densityLevels), one colour per model; truth values as dashed lines. Each diagonal panel is
 * titled with the parameter's component, quantity, unit and median with its 68% interval.
 */
export function cornerPlotSvg(options: CornerPlotOptions): string {
  const { layers, truth } = options;
  const axes = options.parameters.map((name) => axisOf(name, layers, truth));
  const n = axes.length;
  const panel = options.panelPx ?? (n <= 4 ? 150 : 88);
  const titleLines = 1 + layers.length;
  const titleHeight = titleLines * (TITLE_FONT_PX + 3) + 4;
  const left = 48;
  const top = Math.max(titleHeight + 6, options.title === undefined ? 0 : 30) + (options.title === undefined ? 0 : 22);
  const bottom = 44;
  const grid = n * panel + (n - 1) * GAP_PX;
  const titles = axes.map((axis, k) => diagonalTitle(axis, k, layers));
  let width = left + grid + 12;
  titles.forEach((t, k) => { width = Math.max(width, left + k * (panel + GAP_PX) + t.widthPx + 8); });
  const height = top + grid + bottom;
  const x0 = (col: number): number => left + col * (panel + GAP_PX);
  const y0 = (row: number): number => top + row * (panel + GAP_PX);

  const parts: string[] = [];
  parts.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${px(width)}" height="${px(height)}" viewBox="0 0 ${px(width)} ${px(height)}" font-family="${escapeMarkup(FIGURE_FONT)}" role="img">`);
  parts.push(`<rect width="100%" height="100%" fill="${reportPalette.card}"/>`);
  if (options.title !== undefined) {
    parts.push(`<text x="${left}" y="18" font-size="13" font-weight="600" fill="${reportPalette.ink}">${escapeMarkup(options.title)}</text>`);
  }
  parts.push(legend(layers, truth !== undefined && truth.size > 0, left + grid, top - titleHeight + 2 - (options.title === undefined ? 0 : 0), n, panel));

  for (let row = 0; row < n; row++) {
    for (let col = 0; col <= row; col++) {
      const frame = { x: x0(col), y: y0(row), size: panel };
      parts.push(`<svg x="${px(frame.x)}" y="${px(frame.y)}" width="${panel}" height="${panel}" overflow="hidden">`);
      parts.push(`<rect width="${panel}" height="${panel}" fill="#ffffff"/>`);
      if (row === col) parts.push(...diagonalPanel(axes[col], layers, truth, panel));
      else parts.push(...pairPanel(axes[col], axes[row], layers, truth, panel, options.smoothingSigmaBins ?? 0));
      parts.push(`<rect x="0.5" y="0.5" width="${panel - 1}" height="${panel - 1}" fill="none" stroke="${reportPalette.rule}"/>`);
      parts.push('</svg>');
      if (row === n - 1) parts.push(xAxis(axes[col], frame.x, frame.y + panel, panel));
      if (col === 0 && row > 0) parts.push(yAxis(axes[row], frame.x, frame.y, panel));
      if (row === col) parts.push(titles[col].svg(frame.x, frame.y - 4));
    }
  }
  parts.push('</svg>');
  return parts.join('\n');
}

function axisOf(name: string, layers: readonly CornerLayer[], truth: ReadonlyMap<string, number> | undefined): Axis {
  const indexInLayer = layers.map((layer) => layer.data.parameters.findIndex((p) => p.name === name));
  let low = Infinity;
  let high = -Infinity;
  let unit = '';
  indexInLayer.forEach((index, l) => {
    if (index < 0) return;
    const p = layers[l].data.parameters[index];
    // Zoom on the 95% interval widened by ZOOM_MARGIN of its width each side, inside the histogram's range.
    const { lower, upper } = p.summary.interval95;
    const margin = ZOOM_MARGIN * (upper - lower);
    const zoomed = upper > lower && p.range[1] > p.range[0];
    low = Math.min(low, zoomed ? Math.max(p.range[0], lower - margin) : p.range[0]);
    high = Math.max(high, zoomed ? Math.min(p.range[1], upper + margin) : p.range[1]);
    unit = p.unit;
  });
  if (!(high > low)) throw new Error(`corner plot: parameter ${name} is in none of the posteriors`);
  const t = truth?.get(name);
  if (t !== undefined && Number.isFinite(t) && (t < low || t > high)) {
    const pad = 0.04 * (Math.max(high, t) - Math.min(low, t));
    low = Math.min(low, t - pad);
    high = Math.max(high, t + pad);
  }
  return { name, unit, low, high, indexInLayer };
}

const scale = (axis: Axis, size: number) => (v: number): number => ((v - axis.low) / (axis.high - axis.low)) * size;

function diagonalPanel(axis: Axis, layers: readonly CornerLayer[], truth: ReadonlyMap<string, number> | undefined, size: number): string[] {
  const out: string[] = [];
  const sx = scale(axis, size);
  const whiskerSpace = 7 * layers.filter((_, l) => axis.indexInLayer[l] >= 0).length + 4;
  const plotHeight = size - whiskerSpace - 6;
  let peak = 0;
  layers.forEach((layer, l) => {
    const index = axis.indexInLayer[l];
    if (index >= 0) for (const d of layer.data.parameters[index].densities) peak = Math.max(peak, d);
  });
  const overlay = layers.length > 1;
  const baseline = size - whiskerSpace;
  const lines: string[] = [];
  layers.forEach((layer, l) => {
    const index = axis.indexInLayer[l];
    if (index < 0) return;
    const p = layer.data.parameters[index];
    const colours = modelColours(layer.tone);
    let d = `M${px(sx(p.edges[0]))},${px(baseline)}`;
    for (let b = 0; b < p.densities.length; b++) {
      const y = baseline - (peak > 0 ? (p.densities[b] / peak) * plotHeight : 0);
      d += `V${px(y)}H${px(sx(p.edges[b + 1]))}`;
    }
    d += `V${px(baseline)}`;
    out.push(`<path d="${d}Z" fill="${colours.outer}" fill-opacity="${overlay ? 0.55 : 0.9}" stroke="none"/>`);
    lines.push(`<path d="${d}" fill="none" stroke="${colours.line}" stroke-width="1.3" stroke-linejoin="round"/>`);
  });
  out.push(...lines);
  out.push(`<line x1="0" x2="${size}" y1="${px(baseline + 0.5)}" y2="${px(baseline + 0.5)}" stroke="${reportPalette.rule}"/>`);
  let row = 0;
  layers.forEach((layer, l) => {
    const index = axis.indexInLayer[l];
    if (index < 0) return;
    const s = layer.data.parameters[index].summary;
    const y = baseline + 6 + 7 * row++;
    const colour = modelColours(layer.tone).line;
    out.push(`<line x1="${px(sx(s.interval95.lower))}" x2="${px(sx(s.interval95.upper))}" y1="${y}" y2="${y}" stroke="${colour}" stroke-width="1.2"/>`);
    out.push(`<line x1="${px(sx(s.interval68.lower))}" x2="${px(sx(s.interval68.upper))}" y1="${y}" y2="${y}" stroke="${colour}" stroke-width="3.6" stroke-linecap="butt"/>`);
    out.push(`<circle cx="${px(sx(s.median))}" cy="${y}" r="2.6" fill="#ffffff" stroke="${colour}" stroke-width="1.2"/>`);
  });
  const t = truth?.get(axis.name);
  if (t !== undefined) {
    out.push(`<line x1="${px(sx(t))}" x2="${px(sx(t))}" y1="0" y2="${px(baseline)}" stroke="${reportPalette.truth}" stroke-width="1.1" stroke-dasharray="3 2"/>`);
  }
  return out;
}

/** The pair of `layer` for parameters (x, y) and whether it is stored transposed (y across). */
function pairOf(data: CornerData, xIndex: number, yIndex: number): { pair: CornerPair; transposed: boolean } | undefined {
  const [a, b, transposed] = xIndex < yIndex ? [xIndex, yIndex, false] : [yIndex, xIndex, true];
  const pair = data.pairs.find((p) => p.xIndex === a && p.yIndex === b);
  return pair === undefined ? undefined : { pair, transposed };
}

function pairPanel(
  xAxisInfo: Axis, yAxisInfo: Axis, layers: readonly CornerLayer[], truth: ReadonlyMap<string, number> | undefined, size: number,
  smoothingSigmaBins: number,
): string[] {
  const sx = scale(xAxisInfo, size);
  const sy = scale(yAxisInfo, size);
  const fills: string[] = [];
  const lines: string[] = [];
  const overlay = layers.length > 1;
  layers.forEach((layer, l) => {
    const xi = xAxisInfo.indexInLayer[l];
    const yi = yAxisInfo.indexInLayer[l];
    if (xi < 0 || yi < 0) return;
    const found = pairOf(layer.data, xi, yi);
    if (found === undefined) return;
    const { pair, transposed } = found;
    const regions = cornerPairRegions(pair, layer.data.smoothingSigmaBins > 0 ? 0 : smoothingSigmaBins);
    const colours = modelColours(layer.tone);
    const toPath = (region: ContourRegion): string => {
      let d = '';
      for (const loop of region.loops) {
        // Points closer than MIN_STEP_PX to the last one drawn are skipped: invisible, and they triple the file.
        let lastX = NaN;
        let lastY = NaN;
        for (let k = 0; k < loop.length; k += 2) {
          const [u, v] = transposed ? [loop[k + 1], loop[k]] : [loop[k], loop[k + 1]];
          const x = sx(u);
          const y = size - sy(v);
          if (k > 0 && Math.hypot(x - lastX, y - lastY) < MIN_STEP_PX) continue;
          d += `${k === 0 ? 'M' : 'L'}${px(x)},${px(y)}`;
          lastX = x;
          lastY = y;
        }
        d += 'Z';
      }
      return d;
    };
    const outer = toPath(regions.outer);
    const inner = toPath(regions.inner);
    const opacity = overlay ? 0.5 : 1;
    if (outer !== '') fills.push(`<path d="${outer}" fill="${colours.outer}" fill-opacity="${opacity}" fill-rule="evenodd"/>`);
    if (inner !== '') fills.push(`<path d="${inner}" fill="${colours.inner}" fill-opacity="${opacity}" fill-rule="evenodd"/>`);
    if (outer !== '') lines.push(`<path d="${outer}" fill="none" stroke="${colours.line}" stroke-width="0.9" stroke-linejoin="round"/>`);
    if (inner !== '') lines.push(`<path d="${inner}" fill="none" stroke="${colours.line}" stroke-width="1.4" stroke-linejoin="round"/>`);
  });
  const out = [...fills, ...lines];
  const tx = truth?.get(xAxisInfo.name);
  const ty = truth?.get(yAxisInfo.name);
  const dash = `stroke="${reportPalette.truth}" stroke-width="1" stroke-dasharray="3 2"`;
  if (tx !== undefined) out.push(`<line x1="${px(sx(tx))}" x2="${px(sx(tx))}" y1="0" y2="${size}" ${dash}/>`);
  if (ty !== undefined) out.push(`<line x1="0" x2="${size}" y1="${px(size - sy(ty))}" y2="${px(size - sy(ty))}" ${dash}/>`);
  if (tx !== undefined && ty !== undefined) {
    const cx = sx(tx);
    const cy = size - sy(ty);
    out.push(`<path d="M${px(cx)},${px(cy - 4.5)}L${px(cx + 4.5)},${px(cy)}L${px(cx)},${px(cy + 4.5)}L${px(cx - 4.5)},${px(cy)}Z" fill="${reportPalette.truth}" stroke="#ffffff" stroke-width="1"/>`);
  }
  return out;
}

function shortLabel(axis: Axis, widthPx: number): { text: string; fontPx: number } {
  const text = parameterLabel(axis.name, axis.unit).quantity;
  let fontPx = LABEL_FONT_PX;
  while (fontPx > 7.5 && textWidthPx(text, fontPx) > widthPx) fontPx -= 0.5;
  if (textWidthPx(text, fontPx) <= widthPx) return { text, fontPx };
  const keep = Math.max(3, Math.floor(widthPx / (0.56 * fontPx)) - 1);
  return { text: `${text.slice(0, keep)}\u2026`, fontPx };
}

/** Ticks at least 7% of the axis away from its ends, so labels of neighbouring panels never touch. */
function awayFromEdges(values: readonly number[], axis: Axis): number[] {
  const margin = 0.07 * (axis.high - axis.low);
  return values.filter((v) => v >= axis.low + margin && v <= axis.high - margin);
}

function xAxis(axis: Axis, x: number, y: number, size: number): string {
  const sx = scale(axis, size);
  const ticks = niceTicks(axis.low, axis.high, size > 120 ? 5 : 4);
  const out: string[] = [];
  for (const v of awayFromEdges(ticks.values, axis)) {
    const u = x + sx(v);
    out.push(`<line x1="${px(u)}" x2="${px(u)}" y1="${px(y)}" y2="${px(y + 3)}" stroke="${reportPalette.muted}"/>`);
    out.push(`<text x="${px(u)}" y="${px(y + 12)}" font-size="${TICK_FONT_PX}" text-anchor="middle" fill="${reportPalette.muted}">${formatTick(v, ticks.step)}</text>`);
  }
  const label = shortLabel(axis, size);
  out.push(`<text x="${px(x + size / 2)}" y="${px(y + 27)}" font-size="${label.fontPx}" text-anchor="middle" fill="${reportPalette.ink}">${escapeMarkup(label.text)}</text>`);
  return out.join('');
}

function yAxis(axis: Axis, x: number, y: number, size: number): string {
  const sy = scale(axis, size);
  const ticks = niceTicks(axis.low, axis.high, size > 120 ? 5 : 4);
  const out: string[] = [];
  for (const v of awayFromEdges(ticks.values, axis)) {
    const u = y + size - sy(v);
    out.push(`<line x1="${px(x - 3)}" x2="${px(x)}" y1="${px(u)}" y2="${px(u)}" stroke="${reportPalette.muted}"/>`);
    out.push(`<text x="${px(x - 5)}" y="${px(u + 3)}" font-size="${TICK_FONT_PX}" text-anchor="end" fill="${reportPalette.muted}">${formatTick(v, ticks.step)}</text>`);
  }
  const label = shortLabel(axis, size);
  out.push(`<text transform="translate(${px(x - 36)},${px(y + size / 2)}) rotate(-90)" font-size="${label.fontPx}" text-anchor="middle" fill="${reportPalette.ink}">${escapeMarkup(label.text)}</text>`);
  return out.join('');
}

function summaryText(p: CornerParameter): string {
  const s = p.summary;
  const digits = digitsForSpread(0.5 * (s.interval68.upper - s.interval68.lower));
  const up = formatNumber(s.interval68.upper - s.median, digits);
  const down = formatNumber(s.median - s.interval68.lower, digits);
  return `${formatNumber(s.median, digits)} +${up} -${down}`;
}

function diagonalTitle(axis: Axis, k: number, layers: readonly CornerLayer[]): { widthPx: number; svg: (x: number, yBottom: number) => string } {
  void k;
  const label = parameterLabel(axis.name, axis.unit);
  const head = `${label.quantity}${label.unit === '' ? '' : ` [${label.unit}]`}`;
  const component = label.component === '' ? '' : `${label.component} \u00b7`;
  const rows = layers.flatMap((layer, l) => {
    const index = axis.indexInLayer[l];
    return index < 0 ? [] : [{ text: summaryText(layer.data.parameters[index]), colour: modelColours(layer.tone).line }];
  });
  const widthPx = Math.max(
    textWidthPx(component, TITLE_FONT_PX - 1) + 4 + textWidthPx(head, TITLE_FONT_PX),
    ...rows.map((r) => textWidthPx(r.text, TITLE_FONT_PX)),
  );
  return {
    widthPx,
    svg: (x, yBottom) => {
      const lineHeight = TITLE_FONT_PX + 3;
      const out: string[] = [];
      let y = yBottom - lineHeight * rows.length;
      out.push(`<text x="${px(x)}" y="${px(y)}" font-size="${TITLE_FONT_PX}" fill="${reportPalette.ink}"><tspan fill="${reportPalette.muted}" font-size="${TITLE_FONT_PX - 1}">${escapeMarkup(component)}</tspan><tspan font-weight="600" dx="${component === '' ? 0 : 4}">${escapeMarkup(head)}</tspan></text>`);
      for (const r of rows) {
        y += lineHeight;
        out.push(`<text x="${px(x)}" y="${px(y)}" font-size="${TITLE_FONT_PX}" fill="${r.colour}" style="font-variant-numeric: tabular-nums">${escapeMarkup(r.text)}</text>`);
      }
      return out.join('');
    },
  };
}

function legend(layers: readonly CornerLayer[], withTruth: boolean, right: number, top: number, n: number, panel: number): string {
  const entries: string[] = [];
  const lineHeight = 16;
  const width = 190;
  const x = right - width;
  let y = top + 2 + (n > 3 ? panel * 0.25 : 0);
  for (const layer of layers) {
    const c = modelColours(layer.tone);
    entries.push(`<rect x="${px(x)}" y="${px(y)}" width="22" height="10" fill="${c.outer}" stroke="${c.line}" stroke-width="0.9"/><rect x="${px(x + 5)}" y="${px(y + 2.5)}" width="12" height="5" fill="${c.inner}" stroke="${c.line}" stroke-width="1.2"/>`);
    entries.push(`<text x="${px(x + 30)}" y="${px(y + 9)}" font-size="10.5" fill="${reportPalette.ink}">${escapeMarkup(layer.label)}</text>`);
    y += lineHeight;
  }
  if (withTruth) {
    entries.push(`<line x1="${px(x)}" x2="${px(x + 22)}" y1="${px(y + 5)}" y2="${px(y + 5)}" stroke="${reportPalette.truth}" stroke-dasharray="3 2"/><path d="M${px(x + 11)},${px(y + 1)}l4,4l-4,4l-4,-4Z" fill="${reportPalette.truth}"/>`);
    entries.push(`<text x="${px(x + 30)}" y="${px(y + 9)}" font-size="10.5" fill="${reportPalette.ink}">simulated truth</text>`);
    y += lineHeight;
  }
  entries.push(`<text x="${px(x)}" y="${px(y + 9)}" font-size="9" fill="${reportPalette.muted}">inner / outer region: 39.3% / 86.5% of the mass</text>`);
  entries.push(`<text x="${px(x)}" y="${px(y + 21)}" font-size="9" fill="${reportPalette.muted}">whisker: median, 68% and 95% intervals</text>`);
  return entries.join('');
}
