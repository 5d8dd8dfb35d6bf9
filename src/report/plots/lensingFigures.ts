import { loadConfig } from '../../config/arcsiftConfig.js';
import { InputError } from '../../errors.js';
import { fillPixelCentres } from '../../imaging/pixelGrid.js';
import { buildLensSystem, type LensSystem } from '../../model/lensSystem.js';
import { modelVectorFromRecord } from '../../model/modelVectorFromRecord.js';
import { criticalCurves, type LensCurves } from '../../lensing/criticalCurves.js';
import { sequentialRange } from '../colour/displayRange.js';
import { imagePanelSvg, type ImageLine, type ImageMarker, type ImagePanel } from './imagePanelSvg.js';
import { imagePng } from './imagePng.js';
import { locate, type ModelName, type RunFolder } from '../runFolder/readRunFolder.js';
import { perturberTruthMarkers } from './perturberTruthMarkers.js';
import { reportPalette } from '../colour/reportPalette.js';
import { sequentialColourMap } from '../colour/sequentialColourMap.js';
import { configHash } from '../../records/configHash.js';
import type { ReportFigure } from './reportFigure.js';
import type { SourceFile } from '../../records/sourceFile.js';
import { readModelSource } from './pixelatedSourceFigures.js';
import { rasterizeSource, sourceWindowOf } from './sourceRaster.js';
import { join } from 'node:path';

/** The observed image's grid (x right, y up, origin at the centre; DEVELOPERS.md) and its mask. */
export interface LensingGrid {
  readonly columns: number;
  readonly rows: number;
  readonly pixelScaleArcsec: number;
  readonly mask?: ArrayLike<number>;
}

/** Writes one figure's SVG and PNG and returns it (reportFigures' writer, passed in). */
export type FigureWriter = (key: string, figure: Omit<ReportFigure, 'files' | 'key'>, png: Buffer) => ReportFigure;

/** Nodes along the longer axis of the grid the critical curves are traced on. */
const CURVE_NODES = 400;
/** Cells along each axis of the source-plane panels. */
const SOURCE_CELLS = 160;
/** Cells along each axis of the coarse look that finds where the source is bright. */
const SOURCE_SEARCH_CELLS = 121;
/** The source's extent: where its brightness exceeds this fraction of its peak. */
const SOURCE_EXTENT_FRACTION = 0.02;
/** Margin around the caustics and the source, as a fraction of their extent. */
const SOURCE_MARGIN = 0.15;
/** Convergence below this is shown at it (log scale). */
const KAPPA_FLOOR = 1e-3;

interface ModelLens {
  readonly model: ModelName;
  readonly system: LensSystem;
  readonly vector: Float64Array;
  readonly profile: Float64Array;
  readonly curves: LensCurves;
}

const tone = (model: ModelName): string => (model === 'smooth' ? reportPalette.smooth : reportPalette.perturbed);
const title = (model: ModelName): string => (model === 'smooth' ? 'Smooth' : 'Perturbed');

/**
 * The lens and source planes of a comparison run's best fits (highest-likelihood samples): the
 * perturbed model's convergence on the observed image's grid with its critical curves and the
 * perturber's position, and each model's source light on a source-plane grid with its caustics.
 * The lens is rebuilt from the run's config (summary.config) with the best-fit values put in.
 * Without the config, or when its parameters no longer match the run's best fits, the panels are
 * left out with a notice; a config edited since the run (other sha256) is used with a notice.
 */
export function lensingFigures(run: RunFolder, imageGrid: LensingGrid, notices: string[], write: FigureWriter): ReportFigure[] {
  const configFile = locate(run.summary.config, run.folder);
  if (configFile === null) {
    notices.push(`config ${run.summary.config} (named in ${run.summaryFile}) not found: the lens and source plane panels are left out`);
    return [];
  }
  try {
    const config = loadConfig(configFile);
    if (configHash(config) !== run.summary.configSha256) {
      notices.push(`config ${configFile} has changed since the run (its sha256 differs): the lens and source plane panels use its current fixed values`);
    }
    // The data's pixel scale agrees with the config's (checked when the run loaded it); a
    // disagreement here means the FITS headers held none and the report fell back to 1 arcsec.
    const configScale = config.observation.pixelScaleArcsec;
    let grid = imageGrid;
    if (Math.abs(grid.pixelScaleArcsec - configScale) > 1e-3 * configScale) {
      notices.push(`the lens and source plane panels use the config's pixel scale, ${configScale} arcsec, not the ${grid.pixelScaleArcsec} arcsec of the image panels`);
      grid = { ...grid, pixelScaleArcsec: configScale };
    }
    const halfX = (grid.columns / 2) * grid.pixelScaleArcsec;
    const halfY = (grid.rows / 2) * grid.pixelScaleArcsec;
    const refine = Math.max(1, Math.ceil(CURVE_NODES / Math.max(grid.columns, grid.rows)));
    const spacing = grid.pixelScaleArcsec / refine;
    const nodes = (half: number): Float64Array => {
      const n = Math.round((2 * half) / spacing);
      return Float64Array.from({ length: n }, (_, k) => (k - (n - 1) / 2) * spacing);
    };
    const xNodes = nodes(halfX);
    const yNodes = nodes(halfY);
    const lenses = (['perturbed', 'smooth'] as const).map((model): ModelLens => {
      const system = buildLensSystem(config, { perturberCount: model === 'perturbed' ? run.summary.perturbers.length : 0 });
      const vector = modelVectorFromRecord(system, run.summary.models[model].bestFit ?? {}, run.summaryFile, `models.${model}.bestFit`);
      const profile = new Float64Array(system.profileVectorLength);
      system.writeProfileVector(vector, profile);
      return { model, system, vector, profile, curves: criticalCurves(system.massTerms, profile, xNodes, yNodes) };
    });
    const figures = [convergenceFigure(run, grid, lenses[0], lenses[1], write)];
    figures.push(...sourcePlaneFigures(run, grid, lenses, write, notices));
    return figures;
  } catch (error) {
    if (!(error instanceof InputError)) throw error;
    notices.push(`${error.message}: the lens and source plane panels are left out`);
    return [];
  }
}

const upscaleFor = (columns: number, rows: number): number => Math.max(1, Math.ceil(232 / Math.max(columns, rows)));

/** Sum of every mass term's convergence at the pixel centres of the observed image's grid. */
function convergenceFigure(run: RunFolder, grid: LensingGrid, perturbed: ModelLens, smooth: ModelLens, write: FigureWriter): ReportFigure {
  const { columns, rows, pixelScaleArcsec: scale } = grid;
  const n = columns * rows;
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  fillPixelCentres({ columns, rows, pixelScaleArcsec: scale }, x, y);
  const kappa = new Float64Array(n);
  for (const term of perturbed.system.massTerms) term.profile.addConvergence(perturbed.profile, term.offset, x, y, n, kappa);
  const logKappa = Float64Array.from(kappa, (k) => Math.log10(Math.max(k, KAPPA_FLOOR)));
  const [low, high] = sequentialRange([logKappa]);
  const markers: ImageMarker[] = [
    ...perturberTruthMarkers(run.summary.perturbers, new Map((run.truth?.parameters ?? []).map((p) => [p.name, p.value]))),
    ...perturbed.system.perturbers.map((p): ImageMarker => ({ kind: 'posterior', xArcsec: perturbed.vector[p.centerXIndex], yArcsec: perturbed.vector[p.centerYIndex] })),
  ];
  const lines: ImageLine[] = [
    ...smooth.curves.critical.map((points): ImageLine => ({ points, colour: tone('smooth'), dashed: true })),
    ...perturbed.curves.critical.map((points): ImageLine => ({ points, colour: tone('perturbed') })),
  ];
  const colouring = { values: logKappa, columns, rows, map: sequentialColourMap, low, high, upscale: upscaleFor(columns, rows) };
  const panel: ImagePanel = {
    title: 'Perturbed model: convergence',
    subtitle: 'log10 kappa, critical curves det A = 0',
    colouring,
    pixelScaleArcsec: scale,
    colourBarLabel: 'log10 kappa',
    mask: grid.mask,
    markers,
    lines,
  };
  const png = imagePng(colouring);
  const truth = run.truth === null ? '' : ' Open circle: simulated perturber position.';
  return write('perturbed-convergence', {
    section: 'images',
    title: panel.title,
    caption: `Convergence &kappa; of the best-fit perturbed model (all mass components, highest-likelihood sample) at the pixel centres of the observed image, on a log<sub>10</sub> scale (&kappa; below ${KAPPA_FLOOR} shown at it). Solid vermilion: its critical curves (det A = 0, A the Jacobian of &beta; = &theta; &minus; &alpha;(&theta;), by finite differences of &alpha; on a grid of ${formatArcsec(perturbed.curves.spacingArcsec)}&Prime;); dashed blue: those of the best-fit smooth model. Dot: the perturber's best-fit position.${truth}`,
    svg: imagePanelSvg(panel, png),
  }, png);
}

/** A model's best-fit amplitudes in the order of its system's amplitude names. */
function bestFitAmplitudes(run: RunFolder, lens: ModelLens): number[] {
  return lens.system.amplitudeNames.map((name) => {
    const v = run.summary.models[lens.model].bestFitAmplitudes?.[name];
    if (typeof v !== 'number' || !Number.isFinite(v)) {
      throw new InputError(`expected a number for the amplitude ${name}, found ${v === undefined ? 'nothing' : JSON.stringify(v)}`, { file: run.summaryFile, key: `models.${lens.model}.bestFitAmplitudes.${name}` });
    }
    return v;
  });
}

/** Half-side of a square about the origin holding a model's caustics and its source where brighter than SOURCE_EXTENT_FRACTION of the peak. */
function sourcePlaneExtent(grid: LensingGrid, lens: ModelLens, amplitudes: readonly number[]): number {
  // Where the source is bright: a coarse look over the whole image field.
  const field = Math.max(grid.columns, grid.rows) * grid.pixelScaleArcsec * 0.5;
  const coarse = sourceLight(lens, amplitudes, field, SOURCE_SEARCH_CELLS);
  let peak = 0;
  for (const v of coarse.values) peak = Math.max(peak, Math.abs(v));
  let extent = 0;
  const cell = (2 * field) / SOURCE_SEARCH_CELLS;
  for (let p = 0; p < coarse.values.length; p++) {
    if (Math.abs(coarse.values[p]) >= SOURCE_EXTENT_FRACTION * peak) extent = Math.max(extent, Math.abs(coarse.x[p]) + cell, Math.abs(coarse.y[p]) + cell);
  }
  for (const caustic of lens.curves.caustics) for (const v of caustic) if (Number.isFinite(v)) extent = Math.max(extent, Math.abs(v));
  return extent;
}

/**
 * Each model's best-fit source light (unit-amplitude components times their best-fit amplitudes)
 * with its caustics, all on one source-plane square and one colour scale.
 */
function sourcePlaneFigures(run: RunFolder, grid: LensingGrid, lenses: readonly ModelLens[], write: FigureWriter, notices: string[]): ReportFigure[] {
  const amplitudes = lenses.map((lens) => bestFitAmplitudes(run, lens));
  // A pixelated source is drawn from the reconstruction its fit wrote (source.json).
  const meshes = lenses.map((lens) => (lens.system.pixelatedSource === undefined ? null : readModelSource(join(run.folder, lens.model), notices)));
  const meshExtent = (source: SourceFile | null): number => {
    if (source === null) return 0;
    const w = sourceWindowOf(source);
    return Math.max(Math.abs(w.centreX) + w.half, Math.abs(w.centreY) + w.half);
  };
  const extent = Math.max(...lenses.map((lens, k) => Math.max(sourcePlaneExtent(grid, lens, amplitudes[k]), meshExtent(meshes[k]))));
  const half = Math.max((1 + SOURCE_MARGIN) * extent, grid.pixelScaleArcsec);
  const lights = lenses.map((lens, k) => {
    const light = sourceLight(lens, amplitudes[k], half, SOURCE_CELLS).values;
    const source = meshes[k];
    if (source !== null) {
      const raster = rasterizeSource(source, { centreX: 0, centreY: 0, half }, SOURCE_CELLS);
      for (let p = 0; p < light.length; p++) light[p] += raster.values[p];
    }
    return light;
  });
  const [low, high] = sequentialRange(lights);
  return lenses.map((lens, k) => {
    const colouring = { values: lights[k], columns: SOURCE_CELLS, rows: SOURCE_CELLS, map: sequentialColourMap, low, high, upscale: upscaleFor(SOURCE_CELLS, SOURCE_CELLS) };
    const panel: ImagePanel = {
      title: `${title(lens.model)} model: source plane`,
      subtitle: 'best-fit source light and caustics',
      colouring,
      pixelScaleArcsec: (2 * half) / SOURCE_CELLS,
      colourBarLabel: 'counts/s/arcsec\u00b2',
      lines: lens.curves.caustics.map((points): ImageLine => ({ points, colour: tone(lens.model) })),
    };
    const png = imagePng(colouring);
    return write(`${lens.model}-source-plane`, {
      section: 'images',
      title: panel.title,
      caption: `Source plane of the best-fit ${lens.model} model: its source light components at unit amplitude times their best-fit amplitudes${meshes[k] === null ? '' : ', plus the pixelated source reconstructed at that fit (source.json)'}, at the centres of a ${SOURCE_CELLS} &times; ${SOURCE_CELLS} grid in source-plane arcsec (&beta;), on a linear scale. The grid, shared by both models' source planes as is the colour scale, is chosen to hold their caustics and their sources (where brighter than ${100 * SOURCE_EXTENT_FRACTION}% of the peak) with a ${100 * SOURCE_MARGIN}% margin. Lines: the caustics, the critical curves mapped through &beta; = &theta; &minus; &alpha;(&theta;) (parts outside the image field are not traced).`,
      svg: imagePanelSvg(panel, png),
    }, png);
  });
}

/** Source light of a model on a cells x cells grid over [-half, half]^2, cell centres, row 0 at the bottom. */
function sourceLight(lens: ModelLens, amplitudes: readonly number[], half: number, cells: number): { x: Float64Array; y: Float64Array; values: Float64Array } {
  const n = cells * cells;
  const size = (2 * half) / cells;
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  fillPixelCentres({ columns: cells, rows: cells, pixelScaleArcsec: size }, x, y);
  const values = new Float64Array(n);
  for (const term of lens.system.sourceTerms) {
    const count = term.profile.basisCount;
    const basis = new Float64Array(count * n);
    term.profile.writeBasis(lens.profile, term.offset, x, y, n, basis, 0, n);
    for (let k = 0; k < count; k++) {
      const a = amplitudes[term.amplitudeOffset + k];
      for (let p = 0; p < n; p++) values[p] += a * basis[k * n + p];
    }
  }
  return { x, y, values };
}


const formatArcsec = (v: number): string => (Math.round(v * 1e4) / 1e4).toString();
