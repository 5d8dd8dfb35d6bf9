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

/** One figure of the report: its inline SVG and the files written for it. */
export interface ReportFigure {
  /** File stem in the figures folder, e.g. `perturbed-residual`. */
  readonly key: string;
  readonly section: 'images' | 'perturber-posterior' | 'posterior';
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

interface ImageSet {
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

  const data = readImage(run.dataFiles.image, notices, 'observed image');
  const noise = readImage(run.dataFiles.noise, notices, 'noise map');
  const maskImage = run.dataFiles.mask === null ? null : readImage(run.dataFiles.mask, notices, 'mask');
  const models = Object.fromEntries(MODEL_NAMES.map((m) => [m, {
    fit: readImage(join(run.folder, m, 'best-fit-model.fits'), notices, `${m} best-fit model`),
    residual: readImage(join(run.folder, m, 'residual.fits'), notices, `${m} residual`),
    normalised: readImage(join(run.folder, m, 'normalised-residual.fits'), notices, `${m} normalised residual`),
  }])) as Record<ModelName, { fit: FitsImage | null; residual: FitsImage | null; normalised: FitsImage | null }>;

  const any = [data, models.perturbed.fit, models.smooth.fit, noise].find((x) => x !== null) ?? null;
  if (any !== null) {
    const pixelScaleArcsec = [data, models.perturbed.fit, models.smooth.fit].find((x) => x?.pixelScale !== undefined)?.pixelScale?.pixelScaleArcsec;
    const set: ImageSet = {
      columns: any.nx,
      rows: any.ny,
      pixelScaleArcsec: pixelScaleArcsec ?? 1,
      mask: maskImage === null ? undefined : maskImage.data,
      outside: maskImage === null ? undefined : Uint8Array.from(maskImage.data, (v) => (v === 0 ? 1 : 0)),
    };
    if (pixelScaleArcsec === undefined) notices.push('no pixel scale in the FITS headers: image axes are in pixels, labelled arcsec at 1 arcsec per pixel');
    figures.push(...imageFigures(run, set, data, noise, models, truth, figuresFolder));
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
  return { figures, notices };
}

function writeSvgFigure(
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

function imageFigures(
  run: RunFolder,
  set: ImageSet,
  data: FitsImage | null,
  noise: FitsImage | null,
  models: Record<ModelName, { fit: FitsImage | null; residual: FitsImage | null; normalised: FitsImage | null }>,
  truth: ReadonlyMap<string, number>,
  folder: string,
): ReportFigure[] {
  const upscale = Math.max(1, Math.ceil(232 / Math.max(set.columns, set.rows)));
  const shape = (image: FitsImage | null): FitsImage | null => (image !== null && image.nx === set.columns && image.ny === set.rows ? image : null);
  const fits = MODEL_NAMES.map((m) => shape(models[m].fit)).filter((x): x is FitsImage => x !== null);
  const dataImage = shape(data);
  const [low, high] = sequentialRange([...(dataImage === null ? [] : [dataImage.data]), ...fits.map((f) => f.data)]);
  const residuals = MODEL_NAMES.map((m) => shape(models[m].residual)).filter((x): x is FitsImage => x !== null);
  const [rLow, rHigh] = symmetricRange(residuals.map((r) => r.data), set.mask);
  const normalised = MODEL_NAMES.map((m) => shape(models[m].normalised)).filter((x): x is FitsImage => x !== null);
  const [nLow, nHigh] = symmetricRange(normalised.map((r) => r.data), set.mask, NORMALISED_RESIDUAL_FLOOR);

  const truthMarkers: ImageMarker[] = run.summary.perturbers.flatMap((p) => {
    const x = truth.get(`${p.key}.centerXArcsec`);
    const y = truth.get(`${p.key}.centerYArcsec`);
    return x === undefined || y === undefined ? [] : [{ kind: 'truth' as const, xArcsec: x, yArcsec: y }];
  });
  const posteriorMarkers: ImageMarker[] = run.summary.perturbers.map((p) => ({
    kind: 'posterior',
    xArcsec: p.centerXArcsec.median,
    yArcsec: p.centerYArcsec.median,
    xInterval: [p.centerXArcsec.interval68.lower, p.centerXArcsec.interval68.upper],
    yInterval: [p.centerYArcsec.interval68.lower, p.centerYArcsec.interval68.upper],
  }));
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
  const noiseImage = shape(noise);
  if (noiseImage !== null) {
    const [noiseLow, noiseHigh] = sequentialRange([noiseImage.data]);
    add('noise', noiseImage, { title: 'Noise (1 sigma)', subtitle: 'per-pixel standard deviation', mask: set.mask }, { map: sequentialColourMap, low: noiseLow, high: noiseHigh }, 'The per-pixel noise the likelihood assumes.');
  }
  for (const m of MODEL_NAMES) {
    const markers = m === 'perturbed' ? [...truthMarkers, ...posteriorMarkers] : truthMarkers;
    const name = m === 'smooth' ? 'Smooth' : 'Perturbed';
    add(`${m}-model`, shape(models[m].fit), { title: `${name} model: best fit`, subtitle: 'highest-likelihood sample', mask: set.mask, markers }, sequential, `Best-fit ${m} model image, same scale as the data.`);
    add(`${m}-residual`, shape(models[m].residual), { title: `${name} model: residual`, subtitle: 'data minus model; grey: not fitted', markers }, { map: divergingColourMap, low: rLow, high: rHigh, hidden: set.outside }, `Data minus the best-fit ${m} model inside the mask.`);
    add(`${m}-normalised-residual`, shape(models[m].normalised), { title: `${name} model: normalised residual`, subtitle: '(data - model) / noise; grey: not fitted', colourBarLabel: 'sigma', markers }, { map: divergingColourMap, low: nLow, high: nHigh, hidden: set.outside }, `Residual of the ${m} model in units of the noise; the scale is clipped at ${nHigh.toFixed(1)} sigma.`);
  }
  return figures;
}
