import { existsSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { InputError } from '../../errors.js';
import { writeFileAtomic } from '../../io/writeFileAtomic.js';
import { packageVersion } from '../../io/packageVersion.js';
import { escapeMarkup } from '../text/escapeMarkup.js';
import { LN_EVIDENCE_DIGITS } from '../tables/evidenceTable.js';
import { formatNumber } from '../text/formatNumber.js';
import { htmlTable, numberCell } from '../tables/htmlTable.js';
import { misfitBadge, misfitTable, misfitTableNote, pValueText } from '../tables/misfitTable.js';
import { priorColumnsTable } from '../tables/priorTable.js';
import { cautionBox, colourMapRows, figureHtml, pageFrame, pageLink, pageSection } from './pageFrame.js';
import { isList, isMapping, isString, locateRunData, readKindOfSummary, requireShape } from '../runFolder/readRunFolder.js';
import { perturberTruthMarkers } from '../plots/perturberTruthMarkers.js';
import { familyBayesFactorSvg } from '../plots/familyBayesFactorSvg.js';
import { imageFigures, imageSetOf, readModelImages, readObservedImages } from '../plots/imageFigures.js';
import { writeSvgFigure, type ReportFigure } from '../plots/reportFigure.js';
import type { VerdictFamilyRecord, VerdictSummary } from '../../records/verdictSummary.js';

/** Reads and checks verdict.json of a verdict run folder (a damaged file names its key). */
export function readVerdictSummary(file: string): VerdictSummary {
  const json = readKindOfSummary(file, 'verdict', 'verdict', {
    families: [(v) => isList(v) && (v as unknown[]).length > 0, 'a non-empty list of family records'],
    verdict: [isMapping, 'the verdict'],
    'verdict.verdict': [(v) => v === 'confirmed' || v === 'not-confirmed' || v === 'not-evidence', '"confirmed", "not-confirmed" or "not-evidence"'],
    'verdict.sentence': [isString, 'a string'],
    'verdict.thresholdSource': [isString, 'a string'],
    rule: [isString, 'a string'],
    limits: [isString, 'a string'],
    caution: [isString, 'a string'],
  });
  const summary = json as unknown as VerdictSummary;
  summary.families.forEach((f, k) => requireShape(f, file, {
    name: [isString, 'a string'], folder: [isString, 'a string'],
    'smooth.misfit': [isMapping, 'a misfit record'], 'perturbed.misfit': [isMapping, 'a misfit record'],
    'priors.perturbed': [isList, 'a list of priors'],
  }, `families[${k}].`));
  return summary;
}

const fixed = (v: number | null, digits = LN_EVIDENCE_DIGITS): string => (v === null || !Number.isFinite(v) ? '&ndash;' : formatNumber(v, digits));
const BADGE = { confirmed: 'favoured', 'not-confirmed': 'not-favoured', 'not-evidence': 'not-evidence' } as const;

/** One row per family: its components, both ln Z, ln B, the smooth chi^2/dof, both misfit tests and whether the verdict rests on it. */
function familyTable(s: VerdictSummary, folder: string, pageFile: string): string {
  const rows = s.families.map((f: VerdictFamilyRecord, k) => {
    const report = join(folder, f.folder, 'report.html');
    const name = `<span class="muted">F${k + 1}</span> ${existsSync(report) ? `<a href="${pageLink(pageFile, report)}">${escapeMarkup(f.name)}</a>` : escapeMarkup(f.name)}`;
    return [
      `${name}<br><span class="component">${escapeMarkup(f.components.lens)}; source ${escapeMarkup(f.components.source)}</span>`,
      numberCell(`${fixed(f.smooth.lnEvidence)} <small>&plusmn; ${fixed(f.smooth.lnEvidenceError)}</small>`),
      numberCell(`${fixed(f.perturbed.lnEvidence)} <small>&plusmn; ${fixed(f.perturbed.lnEvidenceError)}</small>`),
      numberCell(`${fixed(f.lnBayesFactor)} <small>&plusmn; ${fixed(f.lnBayesFactorError)}</small>`),
      numberCell(fixed(f.smooth.misfit.chiSquarePerDegreeOfFreedom, 3)),
      numberCell(`${misfitBadge(f.smooth.misfit)} <small>p ${pValueText(f.smooth.misfit.pValue)}</small>`),
      numberCell(`${misfitBadge(f.perturbed.misfit)} <small>p ${pValueText(f.perturbed.misfit.pValue)}</small>`),
      f.acceptable ? '<span class="tag fits">acceptable</span>' : '<span class="tag held">set aside</span>',
      `<span class="tag claim-${f.claim.claim}">${escapeMarkup(f.claim.claim.replaceAll('-', ' '))}</span>`,
    ];
  });
  return htmlTable({
    id: 'family-table',
    head: [['family', numberCell('ln Z smooth'), numberCell('ln Z perturbed'), numberCell('ln B'), numberCell('smooth &chi;<sup>2</sup>/dof'), numberCell('smooth misfit test'), numberCell('perturbed misfit test'), 'verdict rests on it', 'claim within the family']],
    rows,
  });
}

/** The observed image on a row of its own, then one row per family: its smooth and its perturbed residuals side by side. */
function imageRows(s: VerdictSummary, images: readonly ReportFigure[], pageFile: string): string {
  const row = (label: string, keys: readonly string[]): string => {
    const chosen = keys.map((k) => images.find((f) => f.key === k)).filter((f): f is ReportFigure => f !== undefined);
    return chosen.length === 0 ? '' : `<div class="row-label">${label}</div>${chosen.map((f) => figureHtml(f, pageFile)).join('\n')}`;
  };
  return [
    row('Observed data', ['data']),
    ...s.families.map((f, k) => row(`F${k + 1} ${escapeMarkup(f.name)}: <span class="swatch smooth"></span>smooth, <span class="swatch perturbed"></span>perturbed`,
      [`family-${k + 1}-smooth-normalised-residual`, `family-${k + 1}-perturbed-normalised-residual`])),
  ].join('\n');
}

/** Each family's own compare report, written beside its folder so the page can link to it; a failure becomes a notice. */
function familyReports(s: VerdictSummary, folder: string, notices: string[], writeFamilyReport: (folder: string) => string): void {
  for (const f of s.families) {
    const familyFolder = join(folder, f.folder);
    if (!existsSync(join(familyFolder, 'summary.json'))) {
      notices.push(`${familyFolder}/summary.json not found: the family's own report is left out`);
      continue;
    }
    try {
      writeFamilyReport(familyFolder);
    } catch (error) {
      if (!(error instanceof InputError)) throw error;
      notices.push(`the report of family "${f.name}" could not be written: ${error.message}`);
    }
  }
}

/**
 * Writes the report of a verdict run folder (from `arcsift verdict`): the verdict and why, the
 * family table (ln Z of both models, ln B, misfit tests) with ln B plotted against the threshold,
 * the misfit table, what was not tried and what the verdict does not guarantee, every family's
 * priors side by side, and the observed image with each family's normalised residuals. Each
 * family's own compare report is written first (`writeFamilyReport`) and linked from the table.
 */
export function writeVerdictReport(
  folder: string, pageFile: string, figuresFolder: string, writeFamilyReport: (folder: string) => string,
): string {
  const summaryFile = join(folder, 'verdict.json');
  const s = readVerdictSummary(summaryFile);
  const notices: string[] = [...s.dataNotices];
  familyReports(s, folder, notices, writeFamilyReport);
  const v = s.verdict;
  const { dataFiles, truth } = locateRunData(s.data, folder, summaryFile, notices);
  const observed = readObservedImages(dataFiles, notices, s);
  const models = s.families.flatMap((f, k) => (['smooth', 'perturbed'] as const).map((m) => readModelImages(join(folder, f.folder, m), `family-${k + 1}-${m}`, `F${k + 1} ${m}`, notices)));
  const set = imageSetOf(observed, models, notices);
  const truthValues = new Map((truth?.parameters ?? []).map((p) => [p.name, p.value]));
  const images = set === null ? [] : imageFigures(set, observed, models, perturberTruthMarkers(truth?.perturbers ?? [], truthValues), figuresFolder)
    .filter((f) => f.key === 'data' || f.key.endsWith('-normalised-residual'))
    .map((figure) => {
      // Panels are titled F1, F2, ... to fit; the caption names the family.
      const match = /^family-(\d+)-(smooth|perturbed)-normalised-residual$/.exec(figure.key);
      if (match === null) return figure;
      const f = s.families[Number(match[1]) - 1];
      return { ...figure, caption: `F${match[1]}, ${escapeMarkup(f.name)}: (data &minus; model) / noise of the ${match[2]} model's best fit (misfit test ${f[match[2] as 'smooth' | 'perturbed'].misfit.alarm ? 'fails' : 'passes'}, p = ${pValueText(f[match[2] as 'smooth' | 'perturbed'].misfit.pValue)}).` };
    });
  const forest: ReportFigure = writeSvgFigure(figuresFolder, 'family-bayes-factors', 'family-bayes-factors', {
    section: 'diagnostics',
    title: 'ln B per family',
    caption: `ln B of each family with its 1-sigma error, against the detection threshold ${formatNumber(v.thresholdLnB, 0)}: filled, the families whose smooth model passes the misfit test (the verdict rests on them); hollow grey, those set aside.`,
    svg: familyBayesFactorSvg(s.families.map((f) => ({ name: f.name, lnBayesFactor: f.lnBayesFactor, lnBayesFactorError: f.lnBayesFactorError, acceptable: f.acceptable })), v.thresholdLnB),
  });
  const least = v.leastFavourable;
  const headline = `<section class="verdict ${BADGE[v.verdict]}" id="verdict">
<div><span class="label">robust verdict over ${s.families.length} smooth-model families</span>
<span class="big">${escapeMarkup(v.verdict.replace('-', ' '))}</span>
<span class="badge ${BADGE[v.verdict]}">least favourable ln B ${least === null ? 'none' : `${fixed(least.lnBayesFactor, 1)} &plusmn; ${fixed(least.lnBayesFactorError, 1)}`}</span></div>
<div><p class="reading">${escapeMarkup(v.sentence)}.</p>
${v.reasons.map((r) => `<p>${escapeMarkup(r)}</p>`).join('\n')}
<p class="muted">Detection threshold: ${escapeMarkup(v.thresholdSource)}. Under the priors in <a href="#priors">the prior table</a>; see what was <a href="#limits">not tried</a>.</p></div>
</section>`;
  const columns = s.families.flatMap((f, k) => [
    { tone: 'smooth', label: `${f.name}: smooth`, misfit: f.smooth.misfit, k },
    { tone: 'perturbed', label: `${f.name}: perturbed`, misfit: f.perturbed.misfit, k },
  ]);
  const files = [summaryFile, ...s.families.flatMap((f) => [join(folder, f.folder, 'summary.json'), join(folder, f.folder, 'report.html')]), forest.files[0], ...images.flatMap((f) => f.files)]
    .filter((f) => existsSync(f));
  const body = `${headline}
${cautionBox(s.caution)}
<nav class="contents"><a href="#families">Families</a><a href="#misfit">Misfit</a><a href="#limits">Rule and limits</a><a href="#priors">Priors</a><a href="#images">Residuals</a><a href="#files">Files</a></nav>
${pageSection('families', 'Families', `${familyTable(s, folder, pageFile)}<p class="note">ln B = ln Z<sub>perturbed</sub> &minus; ln Z<sub>smooth</sub> within each family, errors from the information H (Skilling 2006) in quadrature. Each name links to the family's own compare report.</p>${figureHtml(forest, pageFile)}`)}
${pageSection('misfit', 'Misfit of each best fit', `${misfitTable(columns)}${misfitTableNote(columns)}`)}
${pageSection('limits', 'Rule, what was not tried, and limits', `<h3>The rule</h3><p>${escapeMarkup(s.rule)}</p>
<h3>Not tried</h3><ul>${v.suggestions.map((t) => `<li>${escapeMarkup(t)}</li>`).join('')}</ul>
<h3>What the verdict does not guarantee</h3><p>${escapeMarkup(s.limits)}</p>`)}
${pageSection('priors', 'Priors behind every Bayes factor', `<p class="note">The perturbed model of each family (its smooth model has the same without the perturber). Parameters a family lacks read &ldquo;not in this model&rdquo;.</p>${priorColumnsTable(s.families.map((f) => ({ label: f.name, priors: f.priors.perturbed, regions: new Map((f.positionPriors ?? []).map((r) => [r.key, r.region])) })), s.amplitudePrior)}`)}
${pageSection('images', 'Observed image and each family\'s normalised residuals', images.length === 0 ? '<p class="note">No image could be read; see the notices.</p>' : `<div class="image-grid">${imageRows(s, images, pageFile)}</div><p class="note">Residuals (data &minus; model) / noise of every family's smooth and perturbed best fits on one symmetric scale; row 0 at the bottom, x right and y up in arcsec from the image centre.</p>`)}
${notices.length === 0 ? '' : pageSection('notices', 'Notices', `<ul class="notices">${notices.map((n) => `<li>${escapeMarkup(n)}</li>`).join('')}</ul>`)}
${pageSection('files', 'Files', `<ul class="files">${files.map((f) => `<li><a href="${pageLink(pageFile, f)}">${escapeMarkup(relative(resolve(folder), resolve(f)))}</a></li>`).join('\n')}</ul>`)}
${pageSection('about', 'About the figures', colourMapRows())}`;
  const meta = [
    `config <code>${escapeMarkup(s.config)}</code> (sha256 ${escapeMarkup(s.configSha256.slice(0, 12))}&hellip;)`,
    `${s.families.length} families`,
    `seed ${s.seed}`,
    `run time ${formatNumber(s.runSeconds / 60, 1)} min`,
    `arcsift ${escapeMarkup(s.arcsiftVersion)}`,
  ].join(' &middot; ');
  writeFileAtomic(pageFile, pageFrame({
    name: relative(resolve(folder, '..'), resolve(folder)), brand: 'arcsift &middot; robust verdict over smooth-model families', subtitle: truth?.title, meta, body,
    arcsiftVersion: packageVersion(), folder,
  }));
  return pageFile;
}
