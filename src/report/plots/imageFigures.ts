import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { FitsHeader, parseFitsLocator, readFitsImage, stringCard, type FitsImage } from '../../fits/index.js';
import { countsPerSecondScale } from '../../data/imageUnits.js';
import { cutOutValues, type CutoutBox } from '../../data/cutoutBox.js';
import { divergingColourMap } from '../colour/divergingColourMap.js';
import { sequentialRange, symmetricRange } from '../colour/displayRange.js';
import { imagePanelSvg, type ImageMarker, type ImagePanel } from './imagePanelSvg.js';
import { imagePng } from './imagePng.js';
import { writeSvgFigure, type ReportFigure } from './reportFigure.js';
import { sequentialColourMap } from '../colour/sequentialColourMap.js';

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
  const locator = file === null ? null : parseFitsLocator(file);
  if (locator === null || !existsSync(locator.path)) {
    notices.push(`${what}: ${file ?? 'no file'} not found, its panel is left out`);
    return null;
  }
  return readFitsImage(locator.path, locator.selection);
}

/** The observed image, noise map and mask of a run, those that can be read. */
export interface ObservedImages {
  readonly data: FitsImage | null;
  readonly noise: FitsImage | null;
  readonly mask: FitsImage | null;
}

/** What a run record says of how its data were fitted: the cut-out, and whether the noise came from a weight map. */
export interface FittedDataView {
  readonly cutout?: CutoutBox;
  readonly data?: { readonly weight?: string };
}

/** An image as it was fitted: cut out, values in counts per second (BUNIT says so). */
function asFitted(image: FitsImage, values: Float64Array, box: CutoutBox | undefined, unit: string | undefined): FitsImage {
  const data = box === undefined ? values : cutOutValues(values, image.nx, box);
  const cards = unit === undefined ? image.header.cards : [stringCard('BUNIT', unit), ...image.header.cards];
  return { ...image, data, nx: box?.columns ?? image.nx, ny: box?.rows ?? image.ny, header: new FitsHeader(cards, image.header.source) };
}

/**
 * Reads the observed data files named by a run (a missing one is left out with a notice), as
 * they were fitted: files may name an HDU, the run's cut-out is applied, image and noise are
 * turned into counts per second as the data loader turns them (countsPerSecondScale), and a
 * weight map into a 1-sigma noise map.
 */
export function readObservedImages(
  files: Readonly<Record<'image' | 'noise' | 'psf' | 'mask', string | null>>, notices: string[], fitted: FittedDataView = {},
): ObservedImages {
  const image = readImage(files.image, notices, 'observed image');
  const noise = readImage(files.noise, notices, fitted.data?.weight === undefined ? 'noise map' : 'weight map');
  const mask = files.mask === null ? null : readImage(files.mask, notices, 'mask');
  const box = fitted.cutout;
  const imageScale = image === null ? undefined : countsPerSecondScale(image, files.image as string);
  let noiseView: FitsImage | null = null;
  if (noise !== null) {
    const factor = imageScale?.factor ?? 1;
    noiseView = fitted.data?.weight !== undefined
      ? asFitted(noise, noise.data.map((w) => factor / Math.sqrt(w)), box, 'counts/s')
      : asFitted(noise, noise.data.map((v) => v * countsPerSecondScale(noise, files.noise as string, imageScale).factor), box, 'counts/s');
  }
  return {
    data: image === null || imageScale === undefined ? null : asFitted(image, image.data.map((v) => v * imageScale.factor), box, 'counts/s'),
    noise: noiseView,
    mask: mask === null ? null : asFitted(mask, mask.data, box, undefined),
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
