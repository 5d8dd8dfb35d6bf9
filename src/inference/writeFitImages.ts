import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import type { ObservedData } from '../data/observedData.js';
import { writeFits } from '../fits/index.js';
import { PixelLikelihood } from '../likelihood/pixelLikelihood.js';
import { gridCards } from '../simulate/simulateToFolder.js';
import { writeJsonAtomic } from '../io/writeFileAtomic.js';
import type { SourceInversion } from '../inversion/sourceInversion.js';
import type { SourceFile } from '../records/sourceFile.js';
import type { MisfitRecord } from '../records/misfitRecord.js';
import { modelParameterSpace } from '../model/modelParameterSpace.js';
import { fitMisfit } from './fitMisfit.js';

/** The images of one model vector and the amplitudes they were made with. */
export interface FitImages {
  readonly files: { readonly bestFitModel: string; readonly residual: string; readonly normalisedResidual: string; readonly source?: string };
  /** Posterior-mean linear amplitudes at the model vector, by amplitude name. */
  readonly amplitudes: Record<string, number>;
  readonly logLikelihood: number;
  /** The misfit alarm of this model vector (chi-square and spatial structure of the normalised residuals). */
  readonly misfit: MisfitRecord;
}

/**
 * Writes best-fit-model.fits, residual.fits (data - model inside the mask, 0 outside) and
 * normalised-residual.fits ((data - model) / noise inside the mask, 0 outside) of one model
 * vector (`label` names it in the headers, e.g. "smooth model, highest ln L sample").
 */
export function writeFitImages(
  config: ArcsiftConfig, data: ObservedData, perturberCount: number, model: Float64Array, label: string, folder: string,
): FitImages {
  const likelihood = new PixelLikelihood(config, data, perturberCount);
  const fit = likelihood.modelImage(model);
  const source = likelihood.inversion !== undefined && Number.isFinite(fit.logLikelihood)
    ? sourceFileOf(likelihood.inversion, likelihood.system.pixelatedSource!.settings.regularisation)
    : undefined;
  const residual = new Float64Array(fit.image.length);
  const normalised = new Float64Array(fit.image.length);
  for (let p = 0; p < residual.length; p++) {
    if (data.mask[p] === 0) continue;
    residual[p] = data.image[p] - fit.image[p];
    normalised[p] = residual[p] / data.noise[p];
  }
  const grid = { columns: data.columns, rows: data.rows, pixelScaleArcsec: data.pixelScaleArcsec };
  const files = {
    bestFitModel: join(folder, 'best-fit-model.fits'),
    residual: join(folder, 'residual.fits'),
    normalisedResidual: join(folder, 'normalised-residual.fits'),
    ...(source === undefined ? {} : { source: join(folder, 'source.json') }),
  };
  if (source !== undefined) writeJsonAtomic(files.source!, source);
  const images: [string, Float64Array, string, string][] = [
    [files.bestFitModel, fit.image, 'counts/s', `best-fit ${label}`],
    [files.residual, residual, 'counts/s', 'data minus best-fit model inside the mask, 0 outside'],
    [files.normalisedResidual, normalised, '', '(data - model) / noise inside the mask, 0 outside'],
  ];
  for (const [path, values, unit, what] of images) {
    writeFits(path, { primary: { data: values, nx: data.columns, ny: data.rows, cards: gridCards(grid, unit, what) } });
  }
  const amplitudes: Record<string, number> = {};
  likelihood.system.amplitudeNames.forEach((name, i) => { amplitudes[name] = fit.amplitudes[i]; });
  const misfit = fitMisfit(data, normalised, {
    freeParameters: modelParameterSpace(likelihood.system).dim,
    linearAmplitudes: likelihood.system.amplitudeCount + (source?.values.length ?? 0),
  });
  return { files, amplitudes, logLikelihood: fit.logLikelihood, misfit };
}

/** The reconstruction of the inversion's last evaluation as source.json holds it. */
function sourceFileOf(inversion: SourceInversion, regularisation: string): SourceFile {
  const r = inversion.reconstruction();
  return {
    mesh: r.mesh,
    regularisation,
    cellXArcsec: Array.from(r.cellX),
    cellYArcsec: Array.from(r.cellY),
    values: Array.from(r.values),
    standardDeviations: Array.from(r.standardDeviations),
    triangles: r.triangles === null ? null : Array.from(r.triangles),
    side: r.side,
    raysOutside: inversion.raysOutside,
    ...(inversion.brightCells === null ? {} : { brightCells: inversion.brightCells }),
  };
}
