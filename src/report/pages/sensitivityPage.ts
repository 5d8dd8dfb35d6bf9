import { existsSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { readFitsImage } from '../../fits/index.js';
import { writeFileAtomic } from '../../io/writeFileAtomic.js';
import { packageVersion } from '../../io/packageVersion.js';
import { escapeMarkup } from '../text/escapeMarkup.js';
import { cosmologyText } from '../text/cosmologyText.js';
import { formatCount, formatNumber } from '../text/formatNumber.js';
import { htmlTable, numberCell } from '../tables/htmlTable.js';
import { imagePanelSvg, type ImageMarker } from '../plots/imagePanelSvg.js';
import { imagePng } from '../plots/imagePng.js';
import { colourMapRows, figureHtml, pageFrame, pageLink, pageSection, unfinishedBox } from './pageFrame.js';
import { isList, isNumber, isString, locateRunData, readKindOfSummary } from '../runFolder/readRunFolder.js';
import { perturberTruthMarkers } from '../plots/perturberTruthMarkers.js';
import { sequentialColourMap } from '../colour/sequentialColourMap.js';
import type { SensitivitySummary } from '../../records/sensitivitySummary.js';
import { writeSvgFigure, type ReportFigure } from '../plots/reportFigure.js';

/** Reads and checks sensitivity.json of a sensitivity run folder. */
function readSensitivitySummary(file: string): SensitivitySummary {
  return readKindOfSummary(file, 'sensitivity', 'sensitivity', {
    'perturber.kind': [isString, 'a string'],
    'perturber.log10MassPriorRange': [(v) => isList(v) && (v as unknown[]).length === 2, 'two numbers'],
    'settings.threshold': [isNumber, 'a number'],
    decades: [isList, 'a list of mass decades'],
    points: [isList, 'a list of grid points'],
    approximation: [isString, 'a string'],
  }) as unknown as SensitivitySummary;
}

/**
 * Writes the report of a sensitivity run folder (from `arcsift sensitivity`): the map of the
 * smallest detectable perturber mass over the mask, the fraction of the grid sensitive to each
 * mass decade, the threshold and the approximation made.
 */
export function writeSensitivityReport(folder: string, pageFile: string, figuresFolder: string): string {
  const summaryFile = join(folder, 'sensitivity.json');
  const s = readSensitivitySummary(summaryFile);
  const notices: string[] = [];
  const { truth } = locateRunData(s.data, folder, summaryFile, notices);
  const [lower, upper] = s.perturber.log10MassPriorRange;
  const figures: ReportFigure[] = [];
  const mapFile = join(folder, 'sensitivity.fits');
  if (existsSync(mapFile)) {
    const map = readFitsImage(mapFile);
    // Not detectable within the prior (+Infinity) is drawn at the prior's top; outside the mask (NaN) in grey.
    const values = Float64Array.from(map.data, (v) => (v === Infinity ? upper : v));
    const hidden = Uint8Array.from(map.data, (v) => (Number.isNaN(v) ? 1 : 0));
    const upscale = Math.max(1, Math.ceil(320 / Math.max(map.nx, map.ny)));
    const colouring = { map: sequentialColourMap, low: lower, high: upper, values, columns: map.nx, rows: map.ny, hidden, upscale };
    const png = imagePng(colouring);
    const truthValues = new Map((truth?.parameters ?? []).map((p) => [p.name, p.value]));
    const markers: ImageMarker[] = perturberTruthMarkers(truth?.perturbers ?? [], truthValues);
    figures.push(writeSvgFigure(figuresFolder, 'sensitivity', 'sensitivity', {
      section: 'images',
      title: 'Smallest detectable mass',
      caption: `log<sub>10</sub> of the smallest ${escapeMarkup(s.perturber.kind)} mass detectable at each place (&Delta;&chi;<sup>2</sup> &ge; ${formatNumber(s.settings.deltaChiSquareThreshold, 1)}), each mask pixel showing its nearest grid point; dark is sensitive. Places where no mass in the prior is detectable are drawn at the prior's top (${upper}); grey: outside the mask.`,
      svg: imagePanelSvg({
        title: 'Smallest detectable mass', subtitle: 'log10 M / Msun; grey: not fitted', colouring,
        pixelScaleArcsec: map.pixelScale?.pixelScaleArcsec ?? 1, colourBarLabel: 'log10 M/Msun', markers, imagePx: 320,
      }, png),
    }, png));
  } else notices.push(`${mapFile} not found: the map is left out`);
  const detectable = s.points.filter((p) => p.log10MinimumMass !== null).map((p) => p.log10MinimumMass as number);
  const decades = htmlTable({
    id: 'decade-table',
    head: [[numberCell('mass [M<sub>&#9737;</sub>]'), numberCell('fraction of the grid sensitive'), numberCell('grid points')]],
    rows: s.decades.map((d) => [numberCell(`10<sup>${d.log10Mass}</sup>`), numberCell(`${formatNumber(100 * d.fraction, 1)}%`), numberCell(formatCount(d.points))]),
  });
  const body = `<section class="verdict not-favoured" id="verdict">
<div><span class="label">most sensitive place</span><span class="big">${detectable.length === 0 ? 'none' : `10<sup>${formatNumber(Math.min(...detectable), 2)}</sup> M<sub>&#9737;</sub>`}</span></div>
<div><p class="reading">${formatCount(detectable.length)} of ${formatCount(s.gridPoints)} grid points can detect a ${escapeMarkup(s.perturber.kind)} perturber within the mass prior [${lower}, ${upper}] (log<sub>10</sub> M/M<sub>&#9737;</sub>).</p>
<p class="muted">${escapeMarkup(s.approximation)}</p></div>
</section>
${unfinishedBox(s)}
${pageSection('map', 'Sensitivity map', `${figures.map((f) => figureHtml(f, pageFile)).join('\n')}<h3>Fraction of the mask sensitive to each mass</h3>${decades}`)}
${pageSection('settings', 'Settings', `<p class="note">Grid ${s.settings.gridSize} &times; ${s.settings.gridSize} over the mask; detection threshold ${formatNumber(s.settings.threshold, 2)} in &Delta;&chi;<sup>2</sup>/2 (&Delta;&chi;<sup>2</sup> &ge; ${formatNumber(s.settings.deltaChiSquareThreshold, 1)}); bisection to ${s.settings.toleranceDex} dex; smooth best fit from ${escapeMarkup(s.bestFit.from)} (ln L ${formatNumber(s.bestFit.lnLikelihood, 2)}).</p>${notices.length === 0 ? '' : `<ul class="notices">${notices.map((n) => `<li>${escapeMarkup(n)}</li>`).join('')}</ul>`}`)}
${pageSection('files', 'Files', `<ul class="files">${[summaryFile, join(folder, 'sensitivity.csv'), mapFile, ...figures.flatMap((f) => f.files)].filter((f) => existsSync(f)).map((f) => `<li><a href="${pageLink(pageFile, f)}">${escapeMarkup(relative(resolve(folder), resolve(f)))}</a></li>`).join('\n')}</ul>`)}
${pageSection('about', 'About the figures', colourMapRows())}`;
  const meta = [
    `config <code>${escapeMarkup(s.config)}</code>`,
    ...(s.cosmology === undefined ? [] : [`cosmology ${escapeMarkup(cosmologyText(s.cosmology))}`]),
    `run time ${formatNumber(s.runSeconds / 60, 1)} min`,
    `arcsift ${escapeMarkup(s.arcsiftVersion)}`,
  ].join(' &middot; ');
  writeFileAtomic(pageFile, pageFrame({
    name: relative(resolve(folder, '..'), resolve(folder)), brand: 'arcsift &middot; detection sensitivity', subtitle: truth?.title, meta, body, arcsiftVersion: packageVersion(), folder,
  }));
  return pageFile;
}
