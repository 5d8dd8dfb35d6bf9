import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { readFitsImage, type FitsImage } from '../fits/index.js';
import { writeFileAtomic } from '../io/writeFileAtomic.js';
import { cornerPlotSvg, type CornerLayer } from './cornerPlotSvg.js';
import { divergingColourMap } from './divergingColourMap.js';
import { sequentialRange, symmetricRange } from './displayRange.js';
import { imagePanelSvg, type ImageMarker, type ImagePanel } from './imagePanelSvg.js';
import { imagePng } from './imagePng.js';
import { lensingFigures } from './lensingFigures.js';
import { MODEL_NAMES, type ModelName, type RunFolder } from './readRunFolder.js';
import { sequentialColourMap } from './sequentialColourMap.js';
import { perturberTruthMarkers } from './perturberTruthMarkers.js';

export { perturberTruthMarkers };
import { modelColours } from './reportPalette.js';
import { readWeightedSamples } from '../records/readWeightedSamples.js';
import { nestedTraceSvg } from './samplerTraceSvg.js';

/** One figure of the report: its inline SVG and the files written for it. */
export interface ReportFigure {
  /** File stem in the figures folder, e.g. `perturbed-residual`. */
  readonly key: string;
  readonly section: 'images' | 'perturber-posterior' | 'posterior' | 'diagnostics';
  readonly title: string;
  /** HTML. */
  readonly caption: string;
  readonly svg: string;
  /** Absolute or working-directory-relative paths of the SVG (and PNG) written. */
  readonly files: readonly string[];
}

/**
 * Gaussian smoothing of the 2-D posterior histograms, in bins, that shapes the drawn regions
 * (common practice: one bin calms the sampling noise of a few hundred effective samples). It
 * changes only their outline: their levels are set on the unsmoothed mass (cornerPairRegions).
 */
const DISPLAY_SMOOTHING_BINS = 1;

/** Smallest normalised-residual colour limit, in units of the noise sigma. */
const NORMALISED_RESIDUAL_FLOOR = 4;

export interface ImageSet {
  readonly columns: number;
  readonly rows: number;
  readonly pixelScaleArcsec: number;
  readonly mask?: Float64Array;
  readonly outside?: Uint8Array;
}

function readImage(file: string | null, notices: string[], what: string): FitsImage | null {
  if (file === null || !existsSync(file)) {
    notices.push(`${what}: ${file ?? 'no file'} not found, its panel is left out`);
    return null;
  }
  return readFitsImage(file);
}

/** Writes every figure of a run's report into `figuresFolder` and returns them in page order. */
export function writeReportFigures(run: RunFolder, figuresFolder: string): { figures: ReportFigure[]; notices: string[] } {
  const notices: string[] = [];
  const figures: ReportFigure[] = [];
  const truth = new Map((run.truth?.parameters ?? []).map((p) => [p.name, p.value]));

  const observed = readObservedImages(run.dataFiles, notices);
  const models = MODEL_NAMES.map((m) => readModelImages(join(run.folder, m), m, m === 'smooth' ? 'Smooth' : 'Perturbed', notices));
  const set = imageSetOf(observed, models, notices);
  if (set !== null) {
    const truthMarkers = perturberTruthMarkers(run.summary.perturbers, truth);
    const posteriorMarkers: ImageMarker[] = run.summary.perturbers.map((p) => ({
      kind: 'posterior',
      xArcsec: p.centerXArcsec.median,
      yArcsec: p.centerYArcsec.median,
      xInterval: [p.centerXArcsec.interval68.lower, p.centerXArcsec.interval68.upper],
      yInterval: [p.centerYArcsec.interval68.lower, p.centerYArcsec.interval68.upper],
    }));
    models[1] = { ...models[1], markers: posteriorMarkers };
    figures.push(...imageFigures(set, observed, models, truthMarkers, figuresFolder));
    figures.push(...lensingFigures(run, set, notices, (key, figure, png) => writeSvgFigure(figuresFolder, key, key, figure, png)));
  }

  const perturbedCorner = run.corners.perturbed;
  const smoothCorner = run.corners.smooth;
  if (perturbedCorner !== null) {
    const keys = run.summary.perturbers.map((p) => `${p.key}.`);
    const names = perturbedCorner.parameters.map((p) => p.name).filter((n) => keys.some((k) => n.startsWith(k)));
    if (names.length > 0) {
      const svg = cornerPlotSvg({
        parameters: names,
        layers: [{ tone: 'perturbed', label: 'perturbed model', data: perturbedCorner }],
        truth,
        panelPx: names.length <= 4 ? 150 : 110,
        smoothingSigmaBins: DISPLAY_SMOOTHING_BINS,
      });
      figures.push(writeSvgFigure(figuresFolder, 'corner-perturber', 'posterior-perturber', {
        section: 'perturber-posterior',
        title: 'Perturber posterior',
        caption: 'Mass and position of the perturber in the perturbed model: 1-D marginals on the diagonal, 2-D marginals below with the 39.3% (inner) and 86.5% (outer) highest-density regions, the 2-D equivalents of 1 and 2 sigma.',
        svg,
      }));
    }
  }
  const layers: CornerLayer[] = [];
  if (smoothCorner !== null) layers.push({ tone: 'smooth', label: 'smooth model', data: smoothCorner });
  if (perturbedCorner !== null) layers.push({ tone: 'perturbed', label: 'perturbed model', data: perturbedCorner });
  if (layers.length > 0) {
    const names = [...new Set([...(perturbedCorner?.parameters ?? []), ...(smoothCorner?.parameters ?? [])].map((p) => p.name))];
    const svg = cornerPlotSvg({ parameters: names, layers, truth, smoothingSigmaBins: DISPLAY_SMOOTHING_BINS });
    figures.push(writeSvgFigure(figuresFolder, 'corner-all', 'posterior-all', {
      section: 'posterior',
      title: 'All free parameters',
      caption: 'Every free parameter of both models. Where a parameter belongs to both, the smooth (blue) and perturbed (vermilion) posteriors are overlaid; the perturber rows hold the perturbed model alone.',
      svg,
    }));
  }
  const traced = MODEL_NAMES.flatMap((m) => {
    const file = join(run.folder, m, 'samples.csv');
    if (!existsSync(file)) return [];
    return [{ label: `${m} model`, colour: modelColours(m).line, samples: readWeightedSamples(file) }];
  });
  if (traced.length > 0) figures.push(nestedTraceFigure(traced, figuresFolder));
  return { figures, notices };
}

/** The evidence history of one or more nested-sampling runs (nestedTraceSvg) as a figure. */
export function nestedTraceFigure(runs: Parameters<typeof nestedTraceSvg>[0], folder: string): ReportFigure {
  return writeSvgFigure(folder, 'nested-history', 'nested-history', {
    section: 'diagnostics',
    title: 'Nested-sampling history',
    caption: 'Left: ln Z accumulated point by point, the final value dashed; a run that stopped early shows a curve still rising. Right: ln L against the ln of the prior volume X still enclosed (Skilling 2006); the posterior mass lies where ln L flattens.',
    svg: nestedTraceSvg(runs),
  });
}

export function writeSvgFigure(
  folder: string, file: string, key: string, figure: Omit<ReportFigure, 'files' | 'key'>, png?: Buffer,
): ReportFigure {
  const svgFile = join(folder, `${file}.svg`);
  writeFileAtomic(svgFile, `${figure.svg}\n`);
  const files = [svgFile];
  if (png !== undefined) {
    const pngFile = join(folder, `${file}.png`);
    writeFileAtomic(pngFile, png);
    files.push(pngFile);
  }
  return { ...figure, key, svg: uniqueIds(figure.svg, key), files };
}

/** Inline SVGs share one page: prefix any id (none are used today) so two figures never clash. */
function uniqueIds(svg: string, key: string): string {
  return svg.replace(/\bid="([^"]+)"/g, `id="${key}-$1"`).replace(/url\(#([^)]+)\)/g, `url(#${key}-$1)`);
}

/** The observed image, noise map and mask of a run, those that can be read. */
export interface ObservedImages {
  readonly data: FitsImage | null;
  readonly noise: FitsImage | null;
  readonly mask: FitsImage | null;
}

/** Reads the observed data files named by a run (a missing one is left out with a notice). */
export function readObservedImages(files: Readonly<Record<'image' | 'noise' | 'psf' | 'mask', string | null>>, notices: string[]): ObservedImages {
  return {
    data: readImage(files.image, notices, 'observed image'),
    noise: readImage(files.noise, notices, 'noise map'),
    mask: files.mask === null ? null : readImage(files.mask, notices, 'mask'),
  };
}

/** One model's best-fit images in a run folder, as writeModelOutputs writes them, and its markers. */
export interface ModelImages {
  /** File stem prefix of its figures, e.g. `perturbed`. */
  readonly key: string;
  /** Title word, e.g. `Perturbed`. */
  readonly name: string;
  readonly fit: FitsImage | null;
  readonly residual: FitsImage | null;
  readonly normalised: FitsImage | null;
  readonly markers: readonly ImageMarker[];
}

/** Reads best-fit-model.fits, residual.fits and normalised-residual.fits of one model folder. */
export function readModelImages(folder: string, key: string, name: string, notices: string[]): ModelImages {
  return {
    key,
    name,
    fit: readImage(join(folder, 'best-fit-model.fits'), notices, `${key} best-fit model`),
    residual: readImage(join(folder, 'residual.fits'), notices, `${key} residual`),
    normalised: readImage(join(folder, 'normalised-residual.fits'), notices, `${key} normalised residual`),
    markers: [],
  };
}

/** The grid every image panel of a run shares, from the first image that could be read; null when none could. */
export function imageSetOf(observed: ObservedImages, models: readonly ModelImages[], notices: string[]): ImageSet | null {
  const fits = models.map((m) => m.fit);
  const any = [observed.data, ...fits, observed.noise].find((x) => x !== null) ?? null;
  if (any === null) return null;
  const pixelScaleArcsec = [observed.data, ...fits].find((x) => x?.pixelScale !== undefined)?.pixelScale?.pixelScaleArcsec;
  if (pixelScaleArcsec === undefined) notices.push('no pixel scale in the FITS headers: image axes are in pixels, labelled arcsec at 1 arcsec per pixel');
  const maskImage = observed.mask;
  return {
    columns: any.nx,
    rows: any.ny,
    pixelScaleArcsec: pixelScaleArcsec ?? 1,
    mask: maskImage === null ? undefined : maskImage.data,
    outside: maskImage === null ? undefined : Uint8Array.from(maskImage.data, (v) => (v === 0 ? 1 : 0)),
  };
}

/**
 * The image panels of a run: observed data and noise, then for each model its best fit, residual
 * and normalised residual. Data and models share one linear scale, residuals one symmetric scale.
 */
export function imageFigures(
  set: ImageSet,
  observed: ObservedImages,
  models: readonly ModelImages[],
  truthMarkers: readonly ImageMarker[],
  folder: string,
): ReportFigure[] {
  const upscale = Math.max(1, Math.ceil(232 / Math.max(set.columns, set.rows)));
  const shape = (image: FitsImage | null): FitsImage | null => (image !== null && image.nx === set.columns && image.ny === set.rows ? image : null);
  const present = (images: (FitsImage | null)[]): FitsImage[] => images.map(shape).filter((x): x is FitsImage => x !== null);
  const fits = present(models.map((m) => m.fit));
  const dataImage = shape(observed.data);
  const [low, high] = sequentialRange([...(dataImage === null ? [] : [dataImage.data]), ...fits.map((f) => f.data)]);
  const [rLow, rHigh] = symmetricRange(present(models.map((m) => m.residual)).map((r) => r.data), set.mask);
  const [nLow, nHigh] = symmetricRange(present(models.map((m) => m.normalised)).map((r) => r.data), set.mask, NORMALISED_RESIDUAL_FLOOR);
  const unit = (image: FitsImage): string => image.header.getString('BUNIT')?.trim() || 'counts/s';

  const figures: ReportFigure[] = [];
  type PanelText = Omit<ImagePanel, 'colouring' | 'pixelScaleArcsec' | 'colourBarLabel'> & { colourBarLabel?: string };
  const add = (key: string, image: FitsImage | null, panel: PanelText, colouring: Omit<ImagePanel['colouring'], 'values' | 'columns' | 'rows' | 'upscale'>, caption: string): void => {
    if (image === null) return;
    const full: ImagePanel = {
      ...panel,
      colourBarLabel: panel.colourBarLabel ?? unit(image),
      pixelScaleArcsec: set.pixelScaleArcsec,
      colouring: { ...colouring, values: image.data, columns: set.columns, rows: set.rows, upscale },
    };
    const png = imagePng(full.colouring);
    figures.push(writeSvgFigure(folder, key, key, { section: 'images', title: panel.title, caption, svg: imagePanelSvg(full, png) }, png));
  };
  const sequential = { map: sequentialColourMap, low, high };
  add('data', dataImage, { title: 'Observed image', subtitle: 'dashed: boundary of the fitted pixels', mask: set.mask, markers: truthMarkers }, sequential, 'The observed image on the shared linear scale of the models.');
  const noiseImage = shape(observed.noise);
  if (noiseImage !== null) {
    const [noiseLow, noiseHigh] = sequentialRange([noiseImage.data]);
    add('noise', noiseImage, { title: 'Noise (1 sigma)', subtitle: 'per-pixel standard deviation', mask: set.mask }, { map: sequentialColourMap, low: noiseLow, high: noiseHigh }, 'The per-pixel noise the likelihood assumes.');
  }
  for (const m of models) {
    const markers = [...truthMarkers, ...m.markers];
    const name = m.name;
    const what = m.key;
    add(`${m.key}-model`, shape(m.fit), { title: `${name} model: best fit`, subtitle: 'highest-likelihood sample', mask: set.mask, markers }, sequential, `Best-fit ${what} model image, same scale as the data.`);
    add(`${m.key}-residual`, shape(m.residual), { title: `${name} model: residual`, subtitle: 'data minus model; grey: not fitted', markers }, { map: divergingColourMap, low: rLow, high: rHigh, hidden: set.outside }, `Data minus the best-fit ${what} model inside the mask.`);
    add(`${m.key}-normalised-residual`, shape(m.normalised), { title: `${name} model: normalised residual`, subtitle: '(data - model) / noise; grey: not fitted', colourBarLabel: 'sigma', markers }, { map: divergingColourMap, low: nLow, high: nHigh, hidden: set.outside }, `Residual of the ${what} model in units of the noise; the scale is clipped at ${nHigh.toFixed(1)} sigma.`);
  }
  return figures;
}
