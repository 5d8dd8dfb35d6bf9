import { dirname, relative, resolve, sep } from 'node:path';
import type { ColourMap } from '../colour/colourMap.js';
import { divergingColourMap } from '../colour/divergingColourMap.js';
import { escapeMarkup } from '../text/escapeMarkup.js';
import { imagePng } from '../plots/imagePng.js';
import { reportStyle } from './reportStyle.js';
import { sequentialColourMap } from '../colour/sequentialColourMap.js';
import type { ReportFigure } from '../plots/reportFigure.js';

/** A link from the page to `file`, relative to the page's folder, so the pair can be moved together. */
export function pageLink(pageFile: string, file: string): string {
  const path = relative(dirname(resolve(pageFile)), resolve(file)).split(sep).join('/');
  return encodeURI(path);
}

/** A figure inline, with its caption and links to its SVG and PNG files. */
export function figureHtml(figure: ReportFigure, pageFile: string): string {
  const links = figure.files.map((f) => `<a href="${pageLink(pageFile, f)}">${escapeMarkup(f.slice(f.lastIndexOf('.') + 1).toUpperCase())}</a>`).join(' &middot; ');
  return `<figure id="figure-${figure.key}"><div class="art">${figure.svg}</div><figcaption>${figure.caption} <span class="files-inline">(${links})</span></figcaption></figure>`;
}

/** One card of the page. */
export function pageSection(id: string, heading: string, body: string): string {
  return `<section class="card" id="${id}"><h2>${heading}</h2>\n${body}\n</section>`;
}

/** The page's caution box (the run's own caution sentence). */
export function cautionBox(caution: string): string {
  return `<aside class="caution" id="caution" role="note"><div class="mark">!</div><div><p><strong>CAUTION</strong></p><p>${escapeMarkup(caution)}</p></div></aside>`;
}

/**
 * A warning that the run was cut short (summary.finished false): its ln Z, Bayes factors and
 * intervals are not final. Empty for a finished run, and for summaries older than the field.
 */
export function unfinishedBox(summary: { readonly finished?: boolean; readonly unfinishedRuns?: readonly string[] }): string {
  if (summary.finished !== false) return '';
  const runs = (summary.unfinishedRuns ?? []).join(', ');
  return `<aside class="caution" id="unfinished" role="alert"><div class="mark">!</div><div><p><strong>UNFINISHED RUN</strong></p><p>${escapeMarkup(
    `A limit cut ${runs === '' ? 'a sampler run' : runs} short before it converged: every ln Z, Bayes factor, verdict and interval below is not final. Continue the run with --resume and a larger limit.`,
  )}</p></div></aside>`;
}

function colourMapRow(map: ColourMap, use: string): string {
  const values = Float64Array.from({ length: map.size }, (_, k) => k / (map.size - 1));
  const png = imagePng({ values, columns: map.size, rows: 1, map, low: 0, high: 1 });
  const stops = map.stops.map((s) => `L ${s.lightness.toFixed(2)}, C ${s.chroma.toFixed(3)}, h ${s.hueDeg}&deg;`).join(' &rarr; ');
  return `<img alt="${escapeMarkup(map.name)} colour map" src="data:image/png;base64,${png.toString('base64')}"><div><strong>${escapeMarkup(map.name)}</strong> &mdash; ${use}<br><span class="muted">OKLCh control points: ${stops}</span></div>`;
}

/** The two colour maps of the images, shown with their control points. */
export function colourMapRows(): string {
  return `<div class="maps">${colourMapRow(sequentialColourMap, 'data, models and noise: lightness rises steadily from dark to light, so brightness reads the same in grey and for colour-blind readers.')}
${colourMapRow(divergingColourMap, 'residuals: blue below zero, rust above, equally light at equal distance from the near-white zero.')}</div>`;
}

export interface PageFrame {
  /** The run's name (its folder). */
  readonly name: string;
  /** Line above the heading, e.g. `arcsift · fit of one model`. */
  readonly brand: string;
  readonly subtitle?: string;
  /** HTML of the line under the heading. */
  readonly meta: string;
  /** HTML of the main column. */
  readonly body: string;
  readonly arcsiftVersion: string;
  readonly folder: string;
}

/** A whole report page: inline style, no script and no network. */
export function pageFrame(frame: PageFrame): string {
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="arcsift ${escapeMarkup(frame.arcsiftVersion)}">
<title>arcsift report: ${escapeMarkup(frame.name)}</title>
<style>${reportStyle()}</style>
</head>
<body>
<header class="masthead"><div class="wrap">
<div class="brand">${frame.brand}</div>
<h1>${escapeMarkup(frame.name)}${frame.subtitle === undefined ? '' : ` <span style="font-weight:400;opacity:.7">&mdash; ${escapeMarkup(frame.subtitle)}</span>`}</h1>
<p class="meta">${frame.meta}</p>
</div></header>
<main class="wrap">
${frame.body}
</main>
<footer>arcsift ${escapeMarkup(frame.arcsiftVersion)} &middot; report of ${escapeMarkup(resolve(frame.folder))}</footer>
</body>
</html>
`;
}
