import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { InputError } from '../../errors.js';
import { readSourceFile } from '../../records/readSourceFile.js';
import type { SourceFile } from '../../records/sourceFile.js';
import { divergingColourMap } from '../colour/divergingColourMap.js';
import { pixelQuantile, sequentialRange } from '../colour/displayRange.js';
import { reportPalette, type ModelTone } from '../colour/reportPalette.js';
import { sequentialColourMap } from '../colour/sequentialColourMap.js';
import { imagePanelSvg, type ImagePanel } from './imagePanelSvg.js';
import { imagePng, type ImageColouring } from './imagePng.js';
import { writeSvgFigure, type ReportFigure } from './reportFigure.js';
import { meshEdges, rasterizeSource, significantWindowOf, sourceWindowOf, type SourceRaster } from './sourceRaster.js';

/** Raster cells along each side of a reconstruction panel. */
export const RECONSTRUCTION_CELLS = 160;
/** The signal-to-noise panel's colour limits are at least +-this. */
const SIGNIFICANCE_FLOOR = 3;
/** The reconstruction and S/N panels zoom on cells at least this many standard deviations from zero. */
const ZOOM_SIGNIFICANCE = 5;

export type SourcePanelKind = 'reconstruction' | 'uncertainty' | 'significance';

/** Reads a model folder's source.json; null (with a notice when it is damaged) when there is none to show. */
export function readModelSource(folder: string, notices: string[]): SourceFile | null {
  const file = join(folder, 'source.json');
  if (!existsSync(file)) return null;
  try {
    return readSourceFile(file);
  } catch (error) {
    if (!(error instanceof InputError)) throw error;
    notices.push(`${error.message}: the reconstructed source panels are left out`);
    return null;
  }
}

const upscale = (cells: number): number => Math.max(1, Math.ceil(232 / cells));

function panelColouring(values: Float64Array, raster: SourceRaster, low: number, high: number, diverging: boolean): ImageColouring {
  return {
    values, columns: raster.cells, rows: raster.cells, map: diverging ? divergingColourMap : sequentialColourMap,
    low, high, hidden: raster.outside, hiddenColour: [236, 236, 236], upscale: upscale(raster.cells),
  };
}

/**
 * Panels of a pixelated source reconstructed at a model's best fit (source.json): the
 * reconstruction, its posterior standard deviation with the mesh drawn over it, and their ratio,
 * which tells which features the data hold (|S/N| above about 3) and which the regularisation
 * made. `kinds` picks the panels; the keys are `<tone>-source-<kind>`.
 */
export function pixelatedSourceFigures(
  source: SourceFile, tone: ModelTone, modelTitle: string, figuresFolder: string, kinds: readonly SourcePanelKind[],
): ReportFigure[] {
  const whole = rasterizeSource(source, sourceWindowOf(source), RECONSTRUCTION_CELLS);
  const zoomWindow = significantWindowOf(source, ZOOM_SIGNIFICANCE);
  const zoomed = rasterizeSource(source, zoomWindow, RECONSTRUCTION_CELLS);
  const zoomWords = zoomWindow.half < whole.window.half
    ? ` Zoomed on the cells at least ${ZOOM_SIGNIFICANCE} standard deviations from zero; the uncertainty panel shows the whole mesh.`
    : '';
  const meshWords = source.mesh === 'regular'
    ? `a regular ${source.side} &times; ${source.side} grid, bilinear between its nodes`
    : `an adaptive mesh of ${source.values.length} cells (Delaunay triangles on traced image pixels${source.brightCells === undefined ? '' : `, ${source.brightCells.count} of them on the pixels whose data exceed ${source.brightCells.signalToNoise} times their noise`}), interpolated with Laplace natural-neighbour weights as in the fit`;
  const common = `at the best fit of the ${tone} model (highest-likelihood sample): the cells' posterior given that lens and the ${source.regularisation} regularisation at its sampled strength. Mesh: ${meshWords}; drawn on a ${RECONSTRUCTION_CELLS} &times; ${RECONSTRUCTION_CELLS} raster in source-plane arcsec (&beta;), grey off the mesh, where the source is taken to vanish${source.raysOutside > 0 ? ` (${source.raysOutside} rays of the fit fell there)` : ''}.`;
  const figures: ReportFigure[] = [];
  for (const kind of kinds) {
    const raster = kind === 'uncertainty' ? whole : zoomed;
    const window = raster.window;
    const inside = Uint8Array.from(raster.outside, (o) => 1 - o);
    let colouring: ImageColouring;
    let panel: Omit<ImagePanel, 'colouring'>;
    let caption: string;
    if (kind === 'reconstruction') {
      const [low, high] = sequentialRange([raster.values.filter((_, p) => inside[p] === 1)]);
      colouring = panelColouring(raster.values, raster, low, high, false);
      panel = { title: `${modelTitle} model: reconstructed source`, subtitle: 'posterior mean of the source cells', pixelScaleArcsec: (2 * window.half) / raster.cells, colourBarLabel: 'counts/s/arcsec\u00b2' };
      caption = `The reconstructed source ${common} Linear scale.${zoomWords}`;
    } else if (kind === 'uncertainty') {
      const high = pixelQuantile(raster.standardDeviations, 0.998, inside);
      colouring = panelColouring(raster.standardDeviations, raster, 0, high > 0 ? high : 1, false);
      panel = {
        title: `${modelTitle} model: source uncertainty`, subtitle: 'posterior std. deviation; lines: the mesh',
        pixelScaleArcsec: (2 * window.half) / raster.cells, colourBarLabel: 'counts/s/arcsec\u00b2',
        edges: { segments: meshEdges(source), colour: reportPalette.ink },
      };
      caption = `Posterior standard deviation of each source cell ${common} Between cells it is interpolated like the values, a display device: an interpolated value's error also depends on the cells' covariances. Thin lines: the mesh.`;
    } else {
      const significance = raster.values.map((v, p) => (raster.standardDeviations[p] > 0 ? v / raster.standardDeviations[p] : 0));
      const m = Math.max(SIGNIFICANCE_FLOOR, pixelQuantile(significance.map(Math.abs), 0.99, inside));
      colouring = panelColouring(significance, raster, -m, m, true);
      panel = { title: `${modelTitle} model: source signal-to-noise`, subtitle: 'reconstruction / its standard deviation', pixelScaleArcsec: (2 * window.half) / raster.cells, colourBarLabel: 'S/N' };
      caption = `The reconstruction divided by its standard deviation ${common} Features below about 3 in magnitude are not held by the data: the regularisation shaped them.${zoomWords}`;
    }
    const full: ImagePanel = { ...panel, colouring, centreArcsec: [window.centreX, window.centreY] };
    const png = imagePng(colouring);
    const key = `${tone}-source-${kind}`;
    figures.push(writeSvgFigure(figuresFolder, key, key, { section: 'images', title: full.title, caption, svg: imagePanelSvg(full, png) }, png));
  }
  return figures;
}
