import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { cornerPlotSvg, type CornerLayer } from '../plots/cornerPlotSvg.js';
import type { ImageMarker } from '../plots/imagePanelSvg.js';
import { lensingFigures } from '../plots/lensingFigures.js';
import { MODEL_NAMES, type RunFolder } from '../runFolder/readRunFolder.js';
import { perturberTruthMarkers } from '../plots/perturberTruthMarkers.js';
import { pixelatedSourceFigures, readModelSource } from '../plots/pixelatedSourceFigures.js';
import { modelColours } from '../colour/reportPalette.js';
import { POSTERIOR_TABLES } from '../../records/posteriorTables.js';
import { readWeightedPosterior } from '../../records/readWeightedPosterior.js';
import { imageFigures, imageSetOf, readModelImages, readObservedImages } from '../plots/imageFigures.js';
import { nestedTraceFigure } from '../plots/nestedTraceFigure.js';
import { writeSvgFigure, type ReportFigure } from '../plots/reportFigure.js';

/**
 * Gaussian smoothing of the 2-D posterior histograms, in bins, that shapes the drawn regions
 * (common practice: one bin calms the sampling noise of a few hundred effective samples). It
 * changes only their outline: their levels are set on the unsmoothed mass (cornerPairRegions).
 */
const DISPLAY_SMOOTHING_BINS = 1;



/** Writes every figure of a run's report into `figuresFolder` and returns them in page order. */
export function writeReportFigures(run: RunFolder, figuresFolder: string): { figures: ReportFigure[]; notices: string[] } {
  const notices: string[] = [];
  const figures: ReportFigure[] = [];
  const truth = new Map((run.truth?.parameters ?? []).map((p) => [p.name, p.value]));

  const observed = readObservedImages(run.dataFiles, notices, run.summary);
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
  for (const m of MODEL_NAMES) {
    const source = readModelSource(join(run.folder, m), notices);
    if (source !== null) figures.push(...pixelatedSourceFigures(source, m, m === 'smooth' ? 'Smooth' : 'Perturbed', figuresFolder, ['significance']));
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
    const file = join(run.folder, m, `${POSTERIOR_TABLES.weighted}.csv`);
    if (!existsSync(file)) return [];
    return [{ label: `${m} model`, colour: modelColours(m).line, samples: readWeightedPosterior(file) }];
  });
  if (traced.length > 0) figures.push(nestedTraceFigure(traced, figuresFolder));
  return { figures, notices };
}

