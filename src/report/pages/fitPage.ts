import { existsSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { writeFileAtomic } from '../../io/writeFileAtomic.js';
import { packageVersion } from '../../io/packageVersion.js';
import { cornerPlotSvg } from '../plots/cornerPlotSvg.js';
import { nestedDiagnosticsTable } from '../tables/diagnosticsTable.js';
import { escapeMarkup } from '../text/escapeMarkup.js';
import { cosmologyText } from '../text/cosmologyText.js';
import { LN_EVIDENCE_DIGITS } from '../tables/evidenceTable.js';
import { formatCount, formatNumber } from '../text/formatNumber.js';
import { htmlTable, numberCell } from '../tables/htmlTable.js';
import type { ImageMarker } from '../plots/imagePanelSvg.js';
import { cautionBox, unfinishedBox, colourMapRows, figureHtml, pageFrame, pageLink, pageSection } from './pageFrame.js';
import { parameterColumnsTable } from '../tables/parameterTable.js';
import { parameterLabel } from '../text/parameterLabel.js';
import { perturberTable } from '../tables/perturberTable.js';
import { priorColumnsTable } from '../tables/priorTable.js';
import { misfitTable, misfitTableNote } from '../tables/misfitTable.js';
import { readFitFolder, type FitFolder } from '../runFolder/readFitFolder.js';
import { POSTERIOR_FILE_NAMES, POSTERIOR_TABLES } from '../../records/posteriorTables.js';
import { readWeightedPosterior } from '../../records/readWeightedPosterior.js';
import { perturberTruthMarkers } from '../plots/perturberTruthMarkers.js';
import { pixelatedSourceFigures, readModelSource } from '../plots/pixelatedSourceFigures.js';
import { modelColours, type ModelTone } from '../colour/reportPalette.js';
import { ensembleTraceSvg } from '../plots/samplerTraceSvg.js';
import type { EnsembleFitSummary, NestedFitSummary } from '../../records/fitSummary.js';
import { imageFigures, imageSetOf, readModelImages, readObservedImages } from '../plots/imageFigures.js';
import { nestedTraceFigure } from '../plots/nestedTraceFigure.js';
import { writeSvgFigure, type ReportFigure } from '../plots/reportFigure.js';

/** Gaussian smoothing of the 2-D histograms' outlines, in bins (as on the comparison page). */
const DISPLAY_SMOOTHING_BINS = 1;

/** The figures of a fit: image panels, corner plot, and the sampler's history or trace plots. */
function fitFigures(run: FitFolder, tone: ModelTone, figuresFolder: string, notices: string[]): ReportFigure[] {
  const s = run.summary;
  const figures: ReportFigure[] = [];
  const truth = new Map((run.truth?.parameters ?? []).map((p) => [p.name, p.value]));
  const perturbers = s.sampler === 'nested' ? s.perturbers : [];
  const observed = readObservedImages(run.dataFiles, notices, run.summary);
  const posteriorMarkers: ImageMarker[] = perturbers.map((p) => ({
    kind: 'posterior',
    xArcsec: p.centerXArcsec.median,
    yArcsec: p.centerYArcsec.median,
    xInterval: [p.centerXArcsec.interval68.lower, p.centerXArcsec.interval68.upper],
    yInterval: [p.centerYArcsec.interval68.lower, p.centerYArcsec.interval68.upper],
  }));
  const model = { ...readModelImages(run.folder, tone, tone === 'smooth' ? 'Smooth' : 'Perturbed', notices), markers: posteriorMarkers };
  const set = imageSetOf(observed, [model], notices);
  if (set !== null) {
    const keys = Array.from({ length: s.perturberCount }, (_, k) => ({ key: `perturbers[${k}]` }));
    figures.push(...imageFigures(set, observed, [model], perturberTruthMarkers(keys, truth), figuresFolder));
  }
  const source = readModelSource(run.folder, notices);
  if (source !== null) {
    figures.push(...pixelatedSourceFigures(source, tone, tone === 'smooth' ? 'Smooth' : 'Perturbed', figuresFolder, ['reconstruction', 'uncertainty', 'significance']));
  }
  if (run.corner !== null) {
    const names = run.corner.parameters.map((p) => p.name);
    figures.push(writeSvgFigure(figuresFolder, 'corner-all', 'posterior-all', {
      section: 'posterior',
      title: 'All free parameters',
      caption: 'Every free parameter of the model: 1-D marginals on the diagonal, 2-D marginals below with the 39.3% (inner) and 86.5% (outer) highest-density regions, the 2-D equivalents of 1 and 2 sigma; dashed lines: simulated values where known.',
      svg: cornerPlotSvg({ parameters: names, layers: [{ tone, label: `${tone} model`, data: run.corner }], truth, smoothingSigmaBins: DISPLAY_SMOOTHING_BINS }),
    }));
  }
  if (s.sampler === 'nested') {
    const file = join(run.folder, `${POSTERIOR_TABLES.weighted}.csv`);
    if (existsSync(file)) figures.push(nestedTraceFigure([{ label: `${tone} model`, colour: modelColours(tone).line, samples: readWeightedPosterior(file) }], figuresFolder));
  } else {
    const file = join(run.folder, `${POSTERIOR_TABLES.walkerPaths}.csv`);
    if (existsSync(file)) {
      const m = s.model;
      figures.push(writeSvgFigure(figuresFolder, 'trace', 'trace', {
        section: 'diagnostics',
        title: 'Trace plots',
        caption: `Each free parameter over the sweeps after burn-in (${formatCount(m.burnInSweeps)} sweeps left out): the median of the ${m.walkers} walkers with the band holding the central 68% of them, and three single walkers. A mixed chain shows flat, overlapping traces with no drift.`,
        svg: ensembleTraceSvg(file, m.walkers, m.diagnostics.map((d) => d.name), m.diagnostics.map((d) => d.unit)),
      }));
    } else notices.push(`${file} not found: the trace plots are left out`);
  }
  return figures;
}

function nestedHeadline(s: NestedFitSummary): string {
  const e = s.evidence;
  return `<section class="verdict not-favoured" id="verdict">
<div><span class="label">ln Z of this model</span>
<span class="big">${formatNumber(e.lnEvidence, LN_EVIDENCE_DIGITS)} <small>&plusmn; ${formatNumber(e.lnEvidenceError, LN_EVIDENCE_DIGITS)}</small></span></div>
<div><p class="reading">One model's evidence says nothing alone: a detection needs the Bayes factor against the smooth model under the same data and priors (<code>arcsift compare</code>).</p>
<p>Best ln L ${formatNumber(s.model.bestLnLikelihood, 2)} &middot; ${formatCount(s.model.evaluations)} likelihood evaluations &middot; stopped because ${escapeMarkup(s.model.stopReason)}</p>
<p class="muted">Under the priors listed in <a href="#priors">the prior table</a>.</p></div>
</section>`;
}

function ensembleHeadline(s: EnsembleFitSummary): string {
  const m = s.model;
  const trusted = m.warnings.length === 0;
  return `<section class="verdict ${trusted ? 'not-favoured' : 'favoured'}" id="verdict">
<div><span class="label">ensemble MCMC</span>
<span class="big">${trusted ? 'mixed' : 'not yet mixed'}</span>
<span class="badge ${trusted ? 'not-favoured' : 'favoured'}">max R-hat ${m.maxRHat === null ? 'n/a' : formatNumber(m.maxRHat, 3)}</span></div>
<div><p class="reading">${trusted ? `The walkers have mixed (R-hat at most ${m.stopRule.maxRHat}, bulk and tail ESS at least ${m.stopRule.minEffectiveSampleSize} for every parameter): the chain after burn-in can be read as the posterior.` : escapeMarkup(m.warnings.join(' '))}</p>
<p>${m.walkers} walkers &middot; ${formatCount(m.sweeps)} sweeps &middot; smallest ESS ${m.smallestEffectiveSampleSize === null ? 'n/a' : formatNumber(m.smallestEffectiveSampleSize, 0)} &middot; acceptance ${formatNumber(100 * m.acceptanceFraction.mean, 1)}% (lowest walker ${formatNumber(100 * m.acceptanceFraction.min, 1)}%)</p>
<p class="muted">An ensemble fit gives the posterior only, no evidence.</p></div>
</section>`;
}

/** Per-parameter convergence of an ensemble fit: autocorrelation time, R-hat, effective sample sizes. */
function ensembleDiagnosticsTable(s: EnsembleFitSummary): string {
  const m = s.model;
  const value = (v: number | null, digits: number): string => (v === null ? 'n/a' : formatNumber(v, digits));
  const rows = m.diagnostics.map((d) => {
    const label = parameterLabel(d.name, d.unit);
    return [
      `<span class="component">${escapeMarkup(label.component)}</span> ${escapeMarkup(label.quantity)}`,
      numberCell(value(d.autocorrelationTime, 1)),
      { html: value(d.rHat, 3), className: d.rHat !== null && d.rHat > m.stopRule.maxRHat ? 'num warn' : 'num' },
      { html: value(d.bulkEffectiveSampleSize, 0), className: (d.bulkEffectiveSampleSize ?? 0) < m.stopRule.minEffectiveSampleSize ? 'num warn' : 'num' },
      { html: value(d.tailEffectiveSampleSize, 0), className: (d.tailEffectiveSampleSize ?? 0) < m.stopRule.minEffectiveSampleSize ? 'num warn' : 'num' },
    ];
  });
  return htmlTable({
    id: 'ensemble-diagnostics',
    head: [['parameter', numberCell('autocorrelation time [sweeps]'), numberCell('R-hat'), numberCell('bulk ESS'), numberCell('tail ESS')]],
    rows,
  });
}

/**
 * Writes the report of a fit run folder (from `arcsift fit`): one self-contained page with the
 * model's images and residuals, corner plot, parameter intervals, priors, and the sampler's
 * diagnostics (nested: evidence history; ensemble: acceptance, autocorrelation times, R-hat and
 * trace plots). Returns the page's path.
 */
export function writeFitReport(folder: string, pageFile: string, figuresFolder: string): string {
  const run = readFitFolder(folder);
  const s = run.summary;
  const notices = [...run.notices, ...s.dataNotices];
  const tone: ModelTone = s.perturberCount === 0 ? 'smooth' : 'perturbed';
  const label = `${tone} model`;
  const figures = fitFigures(run, tone, figuresFolder, notices);
  const inSection = (key: ReportFigure['section']): string => figures.filter((f) => f.section === key).map((f) => figureHtml(f, pageFile)).join('\n');
  const headline = s.sampler === 'nested' ? nestedHeadline(s) : ensembleHeadline(s);
  const perturbers = s.sampler === 'nested' && s.perturbers.length > 0
    ? pageSection('perturber', 'Perturber', perturberTable({ perturbers: s.perturbers }, run.truth))
    : '';
  const diagnostics = s.sampler === 'nested'
    ? `${nestedDiagnosticsTable([{ tone, label, record: s.model }])}\n${inSection('diagnostics')}`
    : `${ensembleDiagnosticsTable(s)}<p class="note">R-hat is the rank-normalised split R-hat and ESS the bulk and tail effective sample sizes, walkers taken as chains (Vehtari et al. 2021); values outside the stop rule (R-hat at most ${s.model.stopRule.maxRHat}, ESS at least ${s.model.stopRule.minEffectiveSampleSize}) are flagged. Autocorrelation times by Sokal's windowed estimate.</p>\n${inSection('diagnostics')}`;
  const files = [run.summaryFile, ...[...POSTERIOR_FILE_NAMES, 'corner.json', 'best-fit-model.fits', 'residual.fits', 'normalised-residual.fits', 'source.json'].map((f) => join(folder, f))]
    .filter((f) => existsSync(f))
    .concat(figures.flatMap((f) => f.files));
  const body = `${headline}
${unfinishedBox(s)}
${cautionBox(s.caution)}
${pageSection('priors', 'Priors', `<p class="note">Every posterior${s.sampler === 'nested' ? ' and the evidence' : ''} below holds for these priors only.</p>${priorColumnsTable([{ label, priors: s.priors }], s.amplitudePrior)}`)}
${perturbers}
${pageSection('misfit', 'Misfit of the best fit', `${misfitTable([{ tone, label, misfit: s.model.misfit }])}${misfitTableNote([{ tone, label, misfit: s.model.misfit }])}`)}
${pageSection('images', 'Images and residuals', figures.some((f) => f.section === 'images') ? `<div class="image-grid">${inSection('images')}</div><p class="note">Row 0 at the bottom: x grows to the right and y upwards, in arcsec from the image centre.${run.truth === null ? '' : ' Open circles: simulated perturber positions.'}</p>` : '<p class="note">No image could be read; see the notices.</p>')}
${pageSection('posterior', 'Posterior', `${inSection('posterior')}<h3>Parameter intervals</h3>${parameterColumnsTable([{ tone, label, parameters: s.model.parameters }], run.truth)}`)}
${pageSection('diagnostics', 'Sampler diagnostics', `${diagnostics}${notices.length === 0 ? '' : `<h3>Notices</h3><ul class="notices">${notices.map((n) => `<li>${escapeMarkup(n)}</li>`).join('')}</ul>`}`)}
${pageSection('files', 'Files', `<ul class="files">${files.map((f) => `<li><a href="${pageLink(pageFile, f)}">${escapeMarkup(relative(resolve(folder), resolve(f)))}</a></li>`).join('\n')}</ul>`)}
${pageSection('about', 'About the figures', colourMapRows())}`;
  const meta = [
    `config <code>${escapeMarkup(s.config)}</code> (sha256 ${escapeMarkup(s.configSha256.slice(0, 12))}&hellip;)`,
    `${s.sampler === 'nested' ? 'nested sampling' : 'ensemble MCMC'}`,
    `seed ${s.seed}`,
    ...(s.cosmology === undefined ? [] : [`cosmology ${escapeMarkup(cosmologyText(s.cosmology))}`]),
    `run time ${formatNumber(s.runSeconds / 60, 1)} min`,
    `arcsift ${escapeMarkup(s.arcsiftVersion)}`,
  ].join(' &middot; ');
  const html = pageFrame({
    name: relative(resolve(folder, '..'), resolve(folder)),
    brand: `arcsift &middot; fit of the ${label}`,
    subtitle: run.truth?.title,
    meta,
    body,
    arcsiftVersion: packageVersion(),
    folder,
  });
  writeFileAtomic(pageFile, html);
  return pageFile;
}
