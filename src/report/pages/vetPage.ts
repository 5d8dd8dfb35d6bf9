import { existsSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { writeFileAtomic } from '../../io/writeFileAtomic.js';
import { packageVersion } from '../../io/packageVersion.js';
import { nestedDiagnosticsTable } from '../tables/diagnosticsTable.js';
import { escapeMarkup } from '../text/escapeMarkup.js';
import { cosmologyText } from '../text/cosmologyText.js';
import { LN_EVIDENCE_DIGITS } from '../tables/evidenceTable.js';
import { formatNumber } from '../text/formatNumber.js';
import { htmlTable, numberCell } from '../tables/htmlTable.js';
import { imagePanelSvg, type ImageMarker } from '../plots/imagePanelSvg.js';
import { imagePng } from '../plots/imagePng.js';
import { sequentialRange } from '../colour/displayRange.js';
import { cautionBox, unfinishedBox, colourMapRows, figureHtml, pageFrame, pageLink, pageSection } from './pageFrame.js';
import { perturberMassName } from '../tables/perturberTable.js';
import { priorColumnsTable } from '../tables/priorTable.js';
import { misfitBadge, misfitTable, misfitTableNote, pValueText } from '../tables/misfitTable.js';
import { isList, isMapping, isString, locateRunData, readKindOfSummary } from '../runFolder/readRunFolder.js';
import { perturberTruthMarkers } from '../plots/perturberTruthMarkers.js';
import { sequentialColourMap } from '../colour/sequentialColourMap.js';
import type { VetRunRecord, VetSummary } from '../../records/vetSummary.js';
import { imageFigures, imageSetOf, readModelImages, readObservedImages } from '../plots/imageFigures.js';
import { writeSvgFigure, type ReportFigure } from '../plots/reportFigure.js';

/** Confirmed candidates whose best-fit images the page shows, at most. */
const CONFIRMED_SHOWN = 3;

/** Reads and checks vet.json of a vetting run folder. */
function readVetSummary(file: string): VetSummary {
  return readKindOfSummary(file, 'vet', 'vet', {
    smooth: [(v) => v === null || isMapping(v), 'the smooth run record (null when there was nothing to vet)'],
    candidates: [isList, 'a list of candidate records'],
    thresholds: [isMapping, 'the verdict thresholds'],
    'priors.smooth': [isList, 'a list of priors'],
    'priors.perturbed': [isList, 'a list of priors'],
    'priors.positionPrior': [isString, 'a string'],
    caution: [isString, 'a string'],
  }) as unknown as VetSummary;
}

const fixed = (v: number | null, digits = 2): string => (v === null || !Number.isFinite(v) ? '&ndash;' : formatNumber(v, digits));

/** One row per run: flag, score, ln B, verdict, mass (interval when confirmed, upper limit otherwise), position and offset. */
function vetTable(summary: VetSummary, pageFile: string): string {
  const runs = [...summary.candidates, ...(summary.mapPrior === null ? [] : [summary.mapPrior])];
  const rows = runs.map((r: VetRunRecord) => {
    const m = r.log10Mass;
    const mass = r.verdict === 'confirmed'
      ? `${fixed(m.median)} <small>[${fixed(m.interval68.lower)}, ${fixed(m.interval68.upper)}]</small>`
      : `&lt; ${fixed(r.log10MassUpperLimit95)} <small>(95% upper limit)</small>`;
    return [
      escapeMarkup(r.id),
      numberCell(r.flag === null ? 'map prior' : `(${fixed(r.flag.xArcsec, 3)}, ${fixed(r.flag.yArcsec, 3)})`),
      numberCell(fixed(r.score)),
      numberCell(`${fixed(r.lnBayesFactor, LN_EVIDENCE_DIGITS)} &plusmn; ${fixed(r.lnBayesFactorError, LN_EVIDENCE_DIGITS)}`),
      { html: `<span class="tag verdict-${r.verdict}">${r.verdict}</span>` },
      numberCell(mass),
      numberCell(`(${fixed(r.position.xArcsec.median, 3)}, ${fixed(r.position.yArcsec.median, 3)})`),
      numberCell(fixed(r.offsetArcsec, 3)),
      numberCell(r.model.misfit === undefined ? '&ndash;' : `${fixed(r.model.misfit.chiSquarePerDegreeOfFreedom, 3)} / ${pValueText(r.model.misfit.pValue)} ${misfitBadge(r.model.misfit)}`),
      r.model.files.cornerData === undefined ? '' : `<a href="${pageLink(pageFile, r.model.files.cornerData)}">corner.json</a>`,
    ];
  });
  return htmlTable({
    id: 'vet-table',
    head: [['candidate', numberCell('flag (x, y) ["]'), numberCell('score'), numberCell('ln B'), 'verdict', numberCell(perturberMassName(summary.perturberKind)), numberCell('posterior (x, y) ["]'), numberCell('offset ["]'), numberCell('&chi;<sup>2</sup>/dof / misfit p'), 'posterior']],
    rows,
  });
}

/**
 * Writes the report of a vetting run folder (from `arcsift vet`): the verdict table with its
 * thresholds and priors, the flags over the observed image coloured by verdict, the smooth fit's
 * and the confirmed candidates' images and residuals, and every run's sampler record.
 */
export function writeVetReport(folder: string, pageFile: string, figuresFolder: string): string {
  const summaryFile = join(folder, 'vet.json');
  const s = readVetSummary(summaryFile);
  const notices: string[] = [...s.dataNotices, ...s.flags.notices];
  const { dataFiles, truth } = locateRunData(s.data, folder, summaryFile, notices);
  const truthValues = new Map((truth?.parameters ?? []).map((p) => [p.name, p.value]));
  const observed = readObservedImages(dataFiles, notices, s);
  const runs = [...s.candidates, ...(s.mapPrior === null ? [] : [s.mapPrior])];
  const confirmed = s.candidates.filter((c) => c.verdict === 'confirmed').slice(0, CONFIRMED_SHOWN);
  const candidateFolder = (r: VetRunRecord): string => join(folder, r.id === 'map-prior' ? 'map-prior' : `candidate-${s.candidates.indexOf(r) + 1}`);
  const models = [
    ...(s.smooth === null ? [] : [readModelImages(join(folder, 'smooth'), 'smooth', 'Smooth', notices)]),
    ...confirmed.map((c) => ({
      ...readModelImages(candidateFolder(c), `candidate-${s.candidates.indexOf(c) + 1}`, `Candidate ${c.id}`, notices),
      markers: [{
        kind: 'posterior' as const,
        xArcsec: c.position.xArcsec.median,
        yArcsec: c.position.yArcsec.median,
        xInterval: [c.position.xArcsec.interval68.lower, c.position.xArcsec.interval68.upper] as const,
        yInterval: [c.position.yArcsec.interval68.lower, c.position.yArcsec.interval68.upper] as const,
      }],
    })),
  ];
  const set = imageSetOf(observed, models, notices);
  const figures: ReportFigure[] = [];
  const truthMarkers = perturberTruthMarkers(truth?.perturbers ?? [], truthValues);
  if (set !== null && observed.data !== null && observed.data.nx === set.columns && observed.data.ny === set.rows) {
    const flags: ImageMarker[] = s.candidates.filter((c) => c.flag !== null).map((c) => ({
      kind: 'flag', xArcsec: c.flag!.xArcsec, yArcsec: c.flag!.yArcsec, label: c.id, verdict: c.verdict,
    }));
    const [low, high] = sequentialRange([observed.data.data]);
    const colouring = { map: sequentialColourMap, low, high, values: observed.data.data, columns: set.columns, rows: set.rows, upscale: Math.max(1, Math.ceil(320 / Math.max(set.columns, set.rows))) };
    const png = imagePng(colouring);
    figures.push(writeSvgFigure(figuresFolder, 'flags', 'flags', {
      section: 'images',
      title: 'Flags and verdicts',
      caption: `The network's flags over the observed image, each labelled with its candidate id: vermilion confirmed (ln B &gt; ${s.thresholds.confirmAboveLnB}), blue disfavoured (ln B &lt; ${s.thresholds.disfavourBelowLnB}), yellow inconclusive, grey not evidence (the smooth fit misfits).${truth === null ? '' : ' Open circles: simulated perturbers.'}`,
      svg: imagePanelSvg({
        title: 'Flags and verdicts', subtitle: 'diamonds: flags; dashed: fitted pixels', colouring, pixelScaleArcsec: set.pixelScaleArcsec,
        colourBarLabel: observed.data.header.getString('BUNIT')?.trim() || 'counts/s', mask: set.mask, markers: [...truthMarkers, ...flags], imagePx: 320,
      }, png),
    }, png));
  }
  if (set !== null) figures.push(...imageFigures(set, observed, models, truthMarkers, figuresFolder));
  const [flagFigure, ...imageFiguresShown] = figures;
  const t = s.thresholds;
  const body = `<section class="verdict not-favoured" id="verdict">
<div><span class="label">flags vetted</span><span class="big">${s.candidates.length}</span>
<span class="badge ${s.smoothMisfitNote ? 'not-evidence' : 'favoured'}">${s.smoothMisfitNote ? 'smooth fit misfits' : `${s.candidates.filter((c) => c.verdict === 'confirmed').length} confirmed`}</span></div>
<div>${s.smoothMisfitNote ? `<p class="reading">${escapeMarkup(s.smoothMisfitNote)}</p>` : ''}<p class="reading">Confirmed when ln B &gt; ${t.confirmAboveLnB}, disfavoured when ln B &lt; ${t.disfavourBelowLnB}, inconclusive between (ln B = ln Z with a perturber in the flag's window minus ln Z of the one shared smooth fit${s.smooth === null ? '; no candidate reached the map threshold, so no fit was run' : `, ${fixed(s.smooth.lnEvidence, LN_EVIDENCE_DIGITS)} &plusmn; ${fixed(s.smooth.lnEvidenceError, LN_EVIDENCE_DIGITS)}`}).</p>
<p class="muted">Detection threshold: ${escapeMarkup(s.thresholdSource ?? `ln B > ${t.confirmAboveLnB}`)}. A flag is confirmed only when the shared smooth fit passes the misfit test (<a href="#misfit">misfit table</a>). Under the priors listed in <a href="#priors">the prior table</a>; a verdict is only as good as them.</p></div>
</section>
${unfinishedBox(s)}
${cautionBox(s.caution)}
${s.mapPriorNote === null ? '' : `<aside class="caution" role="note"><div class="mark">!</div><div><p>${escapeMarkup(s.mapPriorNote)}</p></div></aside>`}
${pageSection('verdicts', 'Verdicts', `${vetTable(s, pageFile)}${flagFigure === undefined || flagFigure.key !== 'flags' ? '' : figureHtml(flagFigure, pageFile)}`)}
${s.smooth === null ? '' : pageSection('misfit', 'Misfit of each best fit', `${misfitTable([{ tone: 'smooth', label: 'smooth', misfit: s.smooth.misfit }, ...runs.map((r) => ({ tone: 'perturbed', label: r.id, misfit: r.model.misfit }))])}${misfitTableNote([{ tone: 'smooth', label: 'smooth', misfit: s.smooth.misfit }])}`)}
${pageSection('priors', 'Priors behind these Bayes factors', `${priorColumnsTable([{ label: 'smooth model', priors: s.priors.smooth }, { label: 'perturbed models', priors: s.priors.perturbed }], s.amplitudePrior)}<p class="note">Perturber position: ${escapeMarkup(s.priors.positionPrior)}.</p>`)}
${pageSection('images', 'Images and residuals', `<div class="image-grid">${(flagFigure?.key === 'flags' ? imageFiguresShown : figures).map((f) => figureHtml(f, pageFile)).join('\n')}</div><p class="note">The shared smooth fit${confirmed.length === 0 ? '' : ' and the confirmed candidates\' perturbed fits'}; row 0 at the bottom, x right and y up in arcsec from the image centre.</p>`)}
${pageSection('diagnostics', 'Sampler diagnostics', `${nestedDiagnosticsTable([...(s.smooth === null ? [] : [{ tone: 'smooth' as const, label: 'smooth', record: s.smooth }]), ...runs.map((r) => ({ tone: 'perturbed', label: r.id, record: r.model }))])}${notices.length === 0 ? '' : `<h3>Notices</h3><ul class="notices">${notices.map((n) => `<li>${escapeMarkup(n)}</li>`).join('')}</ul>`}`)}
${pageSection('files', 'Files', `<ul class="files">${[summaryFile, join(folder, 'vet.csv'), ...figures.flatMap((f) => f.files)].filter((f) => existsSync(f)).map((f) => `<li><a href="${pageLink(pageFile, f)}">${escapeMarkup(relative(resolve(folder), resolve(f)))}</a></li>`).join('\n')}</ul>`)}
${pageSection('about', 'About the figures', colourMapRows())}`;
  const meta = [
    `config <code>${escapeMarkup(s.config)}</code>`,
    `flags <code>${escapeMarkup(s.flags.file)}</code> (${s.flags.kind})`,
    `window ${s.windowArcsec}&Prime;`,
    `seed ${s.seed}`,
    ...(s.cosmology === undefined ? [] : [`cosmology ${escapeMarkup(cosmologyText(s.cosmology))}`]),
    `run time ${formatNumber(s.runSeconds / 60, 1)} min`,
    `arcsift ${escapeMarkup(s.arcsiftVersion)}`,
  ].join(' &middot; ');
  writeFileAtomic(pageFile, pageFrame({
    name: relative(resolve(folder, '..'), resolve(folder)), brand: 'arcsift &middot; vetting network flags', subtitle: truth?.title, meta, body, arcsiftVersion: packageVersion(), folder,
  }));
  return pageFile;
}
