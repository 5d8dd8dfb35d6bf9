import { existsSync } from 'node:fs';
import { parseFitsLocator } from '../../fits/index.js';
import { basename, dirname, join, relative, resolve } from 'node:path';
import { bayesFactorTable } from '../tables/bayesFactorTable.js';
import { cautionBox, unfinishedBox, colourMapRows, figureHtml, pageFrame, pageLink } from './pageFrame.js';
import { diagnosticsTable } from '../tables/diagnosticsTable.js';
import { escapeMarkup } from '../text/escapeMarkup.js';
import { cosmologyText } from '../text/cosmologyText.js';
import { LN_EVIDENCE_DIGITS, evidenceTable, usesImportanceEvidence } from '../tables/evidenceTable.js';
import { formatNumber } from '../text/formatNumber.js';
import { parameterTable } from '../tables/parameterTable.js';
import { perturberMassName, perturberTable } from '../tables/perturberTable.js';
import { priorTable } from '../tables/priorTable.js';
import { misfitTable, misfitTableNote } from '../tables/misfitTable.js';
import { reportStyle } from './reportStyle.js';
import { MODEL_NAMES, type RunFolder } from '../runFolder/readRunFolder.js';
import type { ReportFigure } from '../plots/reportFigure.js';
import { POSTERIOR_FILE_NAMES } from '../../records/posteriorTables.js';

/** The badge of a detection claim (results/detectionClaim.ts); summaries written before it fall back to ln B > 1. */
function claimBadge(run: RunFolder): { className: string; text: string } {
  const d = run.summary.detection;
  if (d === undefined) return run.summary.bayesFactor.perturberFavoured ? { className: 'favoured', text: 'perturber favoured' } : { className: 'not-favoured', text: 'perturber not favoured' };
  if (d.claim === 'detected') return { className: 'favoured', text: 'perturber detected' };
  if (d.claim === 'not-evidence') return { className: 'not-evidence', text: 'not evidence: smooth model misfits' };
  return { className: 'not-favoured', text: 'no detection' };
}

function verdict(run: RunFolder): string {
  const b = run.summary.bayesFactor;
  const favoured = b.perturberFavoured;
  const badge = claimBadge(run);
  const d = run.summary.detection;
  const lines = run.summary.perturbers.map((p) => {
    const m = p.log10Mass;
    const digits = 2;
    const massName = perturberMassName(p.kind);
    const mass = favoured
      ? `${massName} = ${formatNumber(m.median, digits)} <small>(68%: ${formatNumber(m.interval68.lower, digits)} to ${formatNumber(m.interval68.upper, digits)})</small>`
      : `${massName} &lt; ${formatNumber(p.log10MassUpperLimit95, digits)} <small>(95% upper limit)</small>`;
    const at = `at x = ${formatNumber(p.centerXArcsec.median, 2)}&Prime;, y = ${formatNumber(p.centerYArcsec.median, 2)}&Prime;`;
    return `<p>${escapeMarkup(p.key)} (${escapeMarkup(p.kind)}): ${mass} ${favoured ? at : ''}</p>`;
  });
  return `<section class="verdict ${badge.className}" id="verdict">
<div><span class="label">ln Bayes factor, perturbed / smooth</span>
<span class="big">${formatNumber(b.lnBayesFactor, LN_EVIDENCE_DIGITS)} <small>&plusmn; ${formatNumber(b.lnBayesFactorError, LN_EVIDENCE_DIGITS)}</small></span>
<span class="badge ${badge.className}">${badge.text}</span></div>
<div>${d === undefined ? '' : `<p class="reading">${escapeMarkup(d.sentence)}.</p>
<p class="muted">Detection threshold: ${escapeMarkup(d.thresholdSource)}; misfit test of each best fit in <a href="#misfit">the misfit table</a>.</p>`}
<p${d === undefined ? ' class="reading"' : ''}>Evidence grade: ${escapeMarkup(b.reading)} <span class="muted">(Kass &amp; Raftery 1995)</span></p>
<p>${escapeMarkup(b.significance)} <span class="muted">(Sellke, Bayarri &amp; Berger 2001 bound)</span></p>
${lines.join('\n')}
<p class="muted">Under the priors listed in <a href="#priors">the prior table</a>; see the caution below.</p></div>
</section>`;
}

/** The files of the run the page links to, those that exist. */
function runFiles(run: RunFolder): string[] {
  const files = [run.summaryFile];
  for (const m of MODEL_NAMES) {
    for (const name of [...POSTERIOR_FILE_NAMES, 'corner.json', 'best-fit-model.fits', 'residual.fits', 'normalised-residual.fits']) {
      files.push(join(run.folder, m, name));
    }
  }
  for (const f of Object.values(run.dataFiles)) if (f !== null) files.push(parseFitsLocator(f).path);
  if (run.truth !== null) files.push(run.truth.file);
  return files.filter((f) => existsSync(f));
}

export interface ReportPageInput {
  readonly run: RunFolder;
  readonly figures: readonly ReportFigure[];
  readonly notices: readonly string[];
  /** Where the page will be written: links are relative to it. */
  readonly pageFile: string;
  readonly arcsiftVersion: string;
}

/** The report as one HTML document: inline style and inline SVG figures, no script and no network. */
export function reportPage(input: ReportPageInput): string {
  const { run, figures, pageFile } = input;
  const s = run.summary;
  const name = basename(resolve(run.folder));
  const title = run.truth?.title;
  const section = (id: string, heading: string, body: string): string => `<section class="card" id="${id}"><h2>${heading}</h2>\n${body}\n</section>`;
  const inSection = (key: ReportFigure['section']): ReportFigure[] => figures.filter((f) => f.section === key);
  const images = inSection('images');
  const imageRow = (label: string, keys: string[]): string => {
    const chosen = keys.map((k) => images.find((f) => f.key === k)).filter((f): f is ReportFigure => f !== undefined);
    return chosen.length === 0 ? '' : `<div class="row-label">${label}</div>${chosen.map((f) => figureHtml(f, pageFile)).join('\n')}`;
  };
  const imageGrid = `<div class="image-grid">
${imageRow('Observed data', ['data', 'noise'])}
${imageRow('<span class="swatch smooth"></span>Smooth model', ['smooth-model', 'smooth-residual', 'smooth-normalised-residual'])}
${imageRow('<span class="swatch perturbed"></span>Perturbed model', ['perturbed-model', 'perturbed-residual', 'perturbed-normalised-residual'])}
${imageRow('Lens and source planes', ['perturbed-convergence', 'perturbed-source-plane', 'smooth-source-plane'])}
${imageRow('Pixelated source', ['perturbed-source-significance', 'smooth-source-significance'])}
</div>
<p class="note">Images are shown with row 0 at the bottom: x grows to the right and y upwards, in arcsec from the image centre. Data and models share one linear scale; the residuals of both models share one symmetric scale.${run.truth === null ? '' : ' Open circles: simulated perturber position.'} Dot with bars: the perturber's posterior median and 68% intervals.</p>`;
  const notices = [...run.notices, ...input.notices, ...s.dataNotices];
  const settings = (s.settings as { smooth?: { lnZTolerance?: number } }).smooth;
  const meta = [
    `config <code>${escapeMarkup(s.config)}</code> (sha256 ${escapeMarkup(s.configSha256.slice(0, 12))}&hellip;)`,
    `data <code>${escapeMarkup(dirname(s.data.image))}</code>`,
    `seed ${s.seed}`,
    ...(s.cosmology === undefined ? [] : [`cosmology ${escapeMarkup(cosmologyText(s.cosmology))}`]),
    `run time ${formatNumber(s.runSeconds / 60, 1)} min`,
    `arcsift ${escapeMarkup(s.arcsiftVersion)}`,
  ].join(' &middot; ');

  const body = `${verdict(run)}
${unfinishedBox(s)}
${cautionBox(s.caution)}
<nav class="contents"><a href="#evidence">Evidence</a><a href="#priors">Priors</a><a href="#perturber">Perturber</a><a href="#images">Images</a><a href="#posterior">Posteriors</a><a href="#diagnostics">Sampler diagnostics</a><a href="#files">Files</a><a href="#about">About the figures</a></nav>
${section('evidence', 'Evidence and Bayes factor', `<div><h3>Evidence of each model</h3>${evidenceTable(s)}<p class="note">ln Z is the natural log of the evidence (marginal likelihood). ${usesImportanceEvidence(s) ? 'ln Z and its error come from importance sampling after each nested run (the spread of the importance weights); the nested-sampling sum is shown beside it with its error from simulated prior-volume shrinkage, for comparison only (see Sampler diagnostics).' : 'The first error follows from the information H (Skilling 2006); the second from simulated prior-volume shrinkage.'} Settings: ${MODEL_NAMES.map((m) => `${m} ${s.models[m].livePoints} live points`).join(', ')}${settings?.lnZTolerance === undefined ? '' : `, stop when the remaining evidence is below ${settings.lnZTolerance} in ln Z`}.</p></div>
<div class="narrow"><h3>Bayes factor</h3>${bayesFactorTable(s)}</div>
<h3 id="misfit">Misfit of each best fit</h3>
${misfitTable(MODEL_NAMES.map((m) => ({ tone: m, label: `${m} model`, misfit: s.models[m].misfit })))}
${misfitTableNote(MODEL_NAMES.map((m) => ({ tone: m, label: m, misfit: s.models[m].misfit })))}
<h3 id="priors">Priors behind this Bayes factor</h3>
<p class="note">The Bayes factor above holds for these priors only: widening the perturber's prior over masses or positions the data disfavour lowers it.</p>
${priorTable(s)}`)}
${section('perturber', 'Perturber', `${perturberTable(s, run.truth)}${inSection('perturber-posterior').map((f) => figureHtml(f, pageFile)).join('\n')}`)}
${section('images', 'Images and residuals', images.length === 0 ? '<p class="note">No image could be read; see the notices under the diagnostics.</p>' : imageGrid)}
${section('posterior', 'Posteriors of all parameters', `${inSection('posterior').map((f) => figureHtml(f, pageFile)).join('\n')}
<h3>Parameter intervals</h3>
<p class="note">Median and central 68% and 95% credible intervals of the weighted posterior samples.${run.truth === null ? '' : ' The truth column gives the simulated value and whether each model\'s intervals hold it.'}</p>
${parameterTable(s, run.truth)}`)}
${section('diagnostics', 'Sampler diagnostics', `${diagnosticsTable(s)}
${inSection('diagnostics').map((f) => figureHtml(f, pageFile)).join('\n')}
<p class="note">The insertion-rank p-value tests whether each new live point's likelihood rank is uniform among the live points, as it is when the constrained draws are unbiased; a small value warns that ln Z may be off.</p>
${notices.length === 0 ? '' : `<h3>Notices</h3><ul class="notices">${notices.map((n) => `<li>${escapeMarkup(n)}</li>`).join('')}</ul>`}`)}
${section('files', 'Files', `<ul class="files">${runFiles(run).map((f) => `<li><a href="${pageLink(pageFile, f)}">${escapeMarkup(relative(resolve(run.folder), resolve(f)) || f)}</a></li>`).join('\n')}
${figures.flatMap((f) => f.files).map((f) => `<li><a href="${pageLink(pageFile, f)}">${escapeMarkup(relative(resolve(run.folder), resolve(f)))}</a></li>`).join('\n')}</ul>`)}
${section('about', 'About the figures', `${colourMapRows()}
<p class="note">Both maps are arcsift's own, set by five control points in OKLCh (Ottosson 2020) and interpolated linearly in OKLab between them, with lightness monotonic along each arm. Corner plots show the 1-D marginal histograms of corner.json and the 2-D regions of highest posterior density holding 39.3% and 86.5% of the mass (1 and 2 sigma for a 2-D Gaussian): traced by marching squares on a bilinear refinement of corner.json's binned densities, their outlines smoothed by one bin, their levels set so that each holds its fraction of the unsmoothed mass. Axes show each model's 95% interval with a margin; the histograms' far tails may lie outside.</p>`)}
`;
  return pageFrame({
    name, brand: 'arcsift &middot; smooth versus perturbed lens', subtitle: title, meta, body, arcsiftVersion: input.arcsiftVersion, folder: run.folder,
  });
}
