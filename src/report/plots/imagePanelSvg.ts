import { escapeMarkup } from '../text/escapeMarkup.js';
import { imagePng, type ImageColouring } from './imagePng.js';
import { maskOutline } from './maskOutline.js';
import { formatTick, niceTicks } from './niceTicks.js';
import { reportPalette } from '../colour/reportPalette.js';
import { FIGURE_FONT, px } from '../text/svgText.js';

/**
 * A point drawn over an image: a simulated true position, a posterior median with its 68%
 * interval, or a network flag labelled with its id and coloured by its verdict.
 */
export interface ImageMarker {
  readonly kind: 'truth' | 'posterior' | 'flag';
  /** flag: its id, written beside it. */
  readonly label?: string;
  /** flag: its verdict. */
  readonly verdict?: 'confirmed' | 'inconclusive' | 'disfavoured' | 'not-evidence';
  readonly xArcsec: number;
  readonly yArcsec: number;
  readonly xInterval?: readonly [number, number];
  readonly yInterval?: readonly [number, number];
}

/** A polyline drawn over an image (e.g. a critical curve): flat x0, y0, x1, y1, ... in arcsec. */
export interface ImageLine {
  readonly points: ArrayLike<number>;
  readonly colour: string;
  readonly dashed?: boolean;
}

export interface ImagePanel {
  readonly title: string;
  readonly subtitle?: string;
  readonly colouring: ImageColouring;
  readonly pixelScaleArcsec: number;
  readonly colourBarLabel: string;
  /** When given, the boundary of its used pixels is outlined. */
  readonly mask?: ArrayLike<number>;
  readonly markers?: readonly ImageMarker[];
  /** Drawn over the image and mask outline, under the markers, each on a white halo. */
  readonly lines?: readonly ImageLine[];
  /** Side of the longer image axis on screen, px; default 232. */
  readonly imagePx?: number;
  /** Where the image's centre lies, arcsec; default the origin. */
  readonly centreArcsec?: readonly [number, number];
  /** Thin segments (flat x0, y0, x1, y1, ... in arcsec), e.g. a mesh, drawn under the lines. */
  readonly edges?: { readonly segments: ArrayLike<number>; readonly colour: string };
}

const LEFT = 42;
const TOP = 40;
const BAR_GAP = 12;
const BAR_WIDTH = 11;
const BOTTOM = 36;

/** The colour bar as a 1 x 256 image, low at the bottom. */
export function colourBarPng(colouring: ImageColouring): Buffer {
  const steps = colouring.map.size;
  const values = Float64Array.from({ length: steps }, (_, k) => colouring.low + ((colouring.high - colouring.low) * k) / (steps - 1));
  return imagePng({ values, columns: 1, rows: steps, map: colouring.map, low: colouring.low, high: colouring.high });
}

const dataUri = (png: Buffer): string => `data:image/png;base64,${png.toString('base64')}`;

/**
 * An image panel as a standalone SVG: the PNG (embedded as a data URI, so the SVG needs no
 * other file) on axes of arcsec offsets from the image centre, x right and y up (pixel (i, j) at
 * x = (i - (nx - 1) / 2) * scale, DEVELOPERS.md), with its colour bar, the mask boundary and markers.
 */
export function imagePanelSvg(panel: ImagePanel, png: Buffer): string {
  const { columns, rows } = panel.colouring;
  const side = panel.imagePx ?? 232;
  const pxPerPixel = side / Math.max(columns, rows);
  const w = columns * pxPerPixel;
  const h = rows * pxPerPixel;
  const halfX = (columns / 2) * panel.pixelScaleArcsec;
  const halfY = (rows / 2) * panel.pixelScaleArcsec;
  const [centreX, centreY] = panel.centreArcsec ?? [0, 0];
  const toX = (xArcsec: number): number => LEFT + ((xArcsec - centreX + halfX) / (2 * halfX)) * w;
  const toY = (yArcsec: number): number => TOP + h - ((yArcsec - centreY + halfY) / (2 * halfY)) * h;
  const barX = LEFT + w + BAR_GAP;
  const width = barX + BAR_WIDTH + 44;
  const height = TOP + h + BOTTOM;
  const ink = reportPalette.ink;
  const muted = reportPalette.muted;
  const out: string[] = [];
  out.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${px(width)}" height="${px(height)}" viewBox="0 0 ${px(width)} ${px(height)}" font-family="${escapeMarkup(FIGURE_FONT)}" role="img">`);
  out.push(`<rect width="100%" height="100%" fill="${reportPalette.card}"/>`);
  out.push(`<text x="${LEFT}" y="15" font-size="12" font-weight="600" fill="${ink}">${escapeMarkup(panel.title)}</text>`);
  if (panel.subtitle !== undefined) out.push(`<text x="${LEFT}" y="29" font-size="9.5" fill="${muted}">${escapeMarkup(panel.subtitle)}</text>`);
  out.push(`<image x="${px(LEFT)}" y="${px(TOP)}" width="${px(w)}" height="${px(h)}" preserveAspectRatio="none" style="image-rendering:pixelated" href="${dataUri(png)}"/>`);

  if (panel.mask !== undefined) {
    const s = maskOutline(panel.mask, columns, rows);
    let d = '';
    for (let k = 0; k < s.length; k += 4) {
      d += `M${px(LEFT + s[k] * pxPerPixel)},${px(TOP + h - s[k + 1] * pxPerPixel)}L${px(LEFT + s[k + 2] * pxPerPixel)},${px(TOP + h - s[k + 3] * pxPerPixel)}`;
    }
    if (d !== '') out.push(`<path d="${d}" fill="none" stroke="#ffffff" stroke-opacity="0.75" stroke-width="0.8" stroke-dasharray="2 2"/>`);
  }
  // Lines and edges are clipped to the image frame (a caustic may reach beyond a source window).
  out.push(`<clipPath id="frame"><rect x="${px(LEFT)}" y="${px(TOP)}" width="${px(w)}" height="${px(h)}"/></clipPath><g clip-path="url(#frame)">`);
  if (panel.edges !== undefined) {
    const e = panel.edges.segments;
    let d = '';
    for (let k = 0; k + 3 < e.length; k += 4) d += `M${px(toX(e[k]))},${px(toY(e[k + 1]))}L${px(toX(e[k + 2]))},${px(toY(e[k + 3]))}`;
    if (d !== '') out.push(`<path d="${d}" fill="none" stroke="${panel.edges.colour}" stroke-opacity="0.45" stroke-width="0.35"/>`);
  }
  for (const l of panel.lines ?? []) out.push(line(l, toX, toY));
  out.push('</g>');
  for (const m of panel.markers ?? []) out.push(marker(m, toX, toY));
  out.push(`<rect x="${px(LEFT)}" y="${px(TOP)}" width="${px(w)}" height="${px(h)}" fill="none" stroke="${muted}" stroke-width="0.8"/>`);

  const xTicks = niceTicks(centreX - halfX, centreX + halfX, 5);
  for (const v of xTicks.values) {
    const x = toX(v);
    out.push(`<line x1="${px(x)}" x2="${px(x)}" y1="${px(TOP + h)}" y2="${px(TOP + h + 3)}" stroke="${muted}"/><text x="${px(x)}" y="${px(TOP + h + 13)}" font-size="9" text-anchor="middle" fill="${muted}">${formatTick(v, xTicks.step)}</text>`);
  }
  const yTicks = niceTicks(centreY - halfY, centreY + halfY, 5);
  for (const v of yTicks.values) {
    const y = toY(v);
    out.push(`<line x1="${px(LEFT - 3)}" x2="${px(LEFT)}" y1="${px(y)}" y2="${px(y)}" stroke="${muted}"/><text x="${px(LEFT - 5)}" y="${px(y + 3)}" font-size="9" text-anchor="end" fill="${muted}">${formatTick(v, yTicks.step)}</text>`);
  }
  out.push(`<text x="${px(LEFT + w / 2)}" y="${px(TOP + h + 28)}" font-size="9.5" text-anchor="middle" fill="${ink}">x [arcsec]</text>`);
  out.push(`<text transform="translate(${px(12)},${px(TOP + h / 2)}) rotate(-90)" font-size="9.5" text-anchor="middle" fill="${ink}">y [arcsec]</text>`);

  const { low, high } = panel.colouring;
  out.push(`<image x="${px(barX)}" y="${px(TOP)}" width="${BAR_WIDTH}" height="${px(h)}" preserveAspectRatio="none" href="${dataUri(colourBarPng(panel.colouring))}"/>`);
  out.push(`<rect x="${px(barX)}" y="${px(TOP)}" width="${BAR_WIDTH}" height="${px(h)}" fill="none" stroke="${muted}" stroke-width="0.8"/>`);
  const barTicks = niceTicks(low, high, 5);
  for (const v of barTicks.values) {
    const y = TOP + h - ((v - low) / (high - low)) * h;
    out.push(`<line x1="${px(barX + BAR_WIDTH)}" x2="${px(barX + BAR_WIDTH + 3)}" y1="${px(y)}" y2="${px(y)}" stroke="${muted}"/><text x="${px(barX + BAR_WIDTH + 5)}" y="${px(y + 3)}" font-size="9" fill="${muted}">${formatTick(v, barTicks.step)}</text>`);
  }
  out.push(`<text x="${px(barX + BAR_WIDTH)}" y="${px(TOP - 6)}" font-size="9" text-anchor="end" fill="${muted}">${escapeMarkup(panel.colourBarLabel)}</text>`);
  out.push('</svg>');
  return out.join('\n');
}

function line(l: ImageLine, toX: (x: number) => number, toY: (y: number) => number): string {
  let d = '';
  for (let k = 0; k + 1 < l.points.length; k += 2) d += `${k === 0 ? 'M' : 'L'}${px(toX(l.points[k]))},${px(toY(l.points[k + 1]))}`;
  if (d === '') return '';
  const dash = l.dashed === true ? ' stroke-dasharray="4 3"' : '';
  return `<path d="${d}" fill="none" stroke="#ffffff" stroke-opacity="0.8" stroke-width="3" stroke-linejoin="round"${dash}/><path d="${d}" fill="none" stroke="${l.colour}" stroke-width="1.4" stroke-linejoin="round"${dash}/>`;
}

function marker(m: ImageMarker, toX: (x: number) => number, toY: (y: number) => number): string {
  const x = toX(m.xArcsec);
  const y = toY(m.yArcsec);
  if (m.kind === 'truth') {
    return `<circle cx="${px(x)}" cy="${px(y)}" r="6" fill="none" stroke="#ffffff" stroke-width="3"/><circle cx="${px(x)}" cy="${px(y)}" r="6" fill="none" stroke="${reportPalette.truth}" stroke-width="1.4"/>`;
  }
  if (m.kind === 'flag') {
    const colour = m.verdict === 'confirmed' ? reportPalette.perturbed : m.verdict === 'disfavoured' ? reportPalette.smooth : m.verdict === 'not-evidence' ? reportPalette.muted : reportPalette.caution;
    const d = `M${px(x)},${px(y - 6)}L${px(x + 6)},${px(y)}L${px(x)},${px(y + 6)}L${px(x - 6)},${px(y)}Z`;
    const text = m.label === undefined ? '' : `<text x="${px(x + 8)}" y="${px(y - 5)}" font-size="10" font-weight="600" fill="${colour}" stroke="#ffffff" stroke-width="2.5" paint-order="stroke">${escapeMarkup(m.label)}</text>`;
    return `<path d="${d}" fill="none" stroke="#ffffff" stroke-width="3.4"/><path d="${d}" fill="none" stroke="${colour}" stroke-width="1.8"/>${text}`;
  }
  const parts: string[] = [];
  const stroke = `stroke="${reportPalette.perturbed}" stroke-width="1.6"`;
  const halo = 'stroke="#ffffff" stroke-width="3.6" stroke-opacity="0.9"';
  let d = '';
  if (m.xInterval !== undefined) d += `M${px(toX(m.xInterval[0]))},${px(y)}H${px(toX(m.xInterval[1]))}`;
  if (m.yInterval !== undefined) d += `M${px(x)},${px(toY(m.yInterval[0]))}V${px(toY(m.yInterval[1]))}`;
  if (d !== '') parts.push(`<path d="${d}" fill="none" ${halo}/><path d="${d}" fill="none" ${stroke}/>`);
  parts.push(`<circle cx="${px(x)}" cy="${px(y)}" r="2.8" fill="${reportPalette.perturbed}" stroke="#ffffff" stroke-width="1.2"/>`);
  return parts.join('');
}
