import { existsSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { InputError, expectedFound } from '../../errors.js';
import { writeFileAtomic } from '../../io/writeFileAtomic.js';
import { binomialQuantile } from '../../numeric/statistics/binomialQuantile.js';
import type { CalibrationParameterRecord, CalibrationSummary, ProportionRecord } from '../../records/calibrationSummary.js';
import { packageVersion } from '../../io/packageVersion.js';
import { reportPalette } from '../colour/reportPalette.js';
import { linePlotSvg, type LinePanel } from '../plots/linePlotSvg.js';
import { writeSvgFigure, type ReportFigure } from '../plots/reportFigure.js';
import { isList, isMapping, isNumber, isString, readJson, requireShape } from '../runFolder/readRunFolder.js';
import { htmlTable, numberCell } from '../tables/htmlTable.js';
import { escapeMarkup } from '../text/escapeMarkup.js';
import { cosmologyText } from '../text/cosmologyText.js';
import { formatCount, formatNumber } from '../text/formatNumber.js';
import { figureHtml, pageFrame, pageLink, pageSection } from './pageFrame.js';

/** Reads and checks calibration.json (written by `arcsift calibrate`). */
export function readCalibrationSummary(file: string): CalibrationSummary {
  const json = readJson(file);
  if (!isMapping(json)) throw new InputError(expectedFound('a mapping (the summary of `arcsift calibrate`)', json), { file });
  requireShape(json, file, {
    kind: [(v) => v === 'calibration', '"calibration" (a summary written by `arcsift calibrate`)'],
    config: [isString, 'the config\'s path'],
    rankDraws: [isNumber, 'a number'],
    'draws.planned': [isNumber, 'a number'],
    'draws.finished': [isNumber, 'a number'],
    parameters: [isList, 'a list of parameter records'],
    perDraw: [isList, 'a list of draws'],
    assumptions: [isList, 'a list of sentences'],
  });
  const summary = json as CalibrationSummary;
  summary.parameters.forEach((p, k) => requireShape(p, file, {
    name: [isString, 'a string'], draws: [isNumber, 'a number'], rankHistogram: [isList, 'a list of counts'],
    chiSquarePValue: [isNumber, 'a number'], ksPValue: [isNumber, 'a number'], coverageCurve: [isList, 'a list of levels'],
    'coverage68.trials': [isNumber, 'a number'], 'coverage95.trials': [isNumber, 'a number'],
  }, `parameters[${k}].`));
  return summary;
}

const pValue = (p: number): string => (p < 1e-3 ? p.toExponential(1) : formatNumber(p, 3));
const percent = (p: ProportionRecord): string => (p.fraction === null ? '&ndash;' : `${formatNumber(100 * p.fraction, 0)}% &plusmn; ${formatNumber(100 * (p.standardError ?? 0), 0)}`);
/** Short panel titles: the last two parts of a dotted parameter name. */
const shortName = (name: string): string => name.split('.').slice(-2).join('.');

/** Rank histograms as steps, with the band holding 99% of a bin's count under uniform ranks (as Talts et al. 2018 draw it). */
function rankPanels(parameters: readonly CalibrationParameterRecord[]): LinePanel[] {
  return parameters.filter((p) => p.draws > 0).map((p) => {
    const bins = p.rankHistogram.length;
    const width = (p.rankDraws + 1) / bins;
    const x: number[] = [];
    const y: number[] = [];
    p.rankHistogram.forEach((count, b) => { x.push(b * width, (b + 1) * width); y.push(count, count); });
    const low = binomialQuantile(0.005, p.draws, 1 / bins);
    const high = binomialQuantile(0.995, p.draws, 1 / bins);
    return {
      title: shortName(p.name), xLabel: `rank of the truth (0-${p.rankDraws})`, yLabel: 'draws',
      series: [
        { x: [0, p.rankDraws + 1], y: [p.draws / bins, p.draws / bins], colour: reportPalette.muted, widthPx: 0.8, band: { lower: [low, low], upper: [high, high] } },
        { x, y, colour: reportPalette.smooth, widthPx: 1.6 },
      ],
      yRange: [0, Math.max(high, ...p.rankHistogram) * 1.1],
    };
  });
}

/** Observed coverage of the central interval of each level, its Wilson band, and the nominal diagonal. */
function coveragePanels(parameters: readonly CalibrationParameterRecord[]): LinePanel[] {
  return parameters.filter((p) => p.draws > 0).map((p) => {
    const levels = [0, ...p.coverageCurve.map((c) => c.level), 1];
    const observed = [0, ...p.coverageCurve.map((c) => c.fraction ?? Number.NaN), 1];
    return {
      title: shortName(p.name), xLabel: 'nominal level', yLabel: 'coverage',
      series: [
        { x: [0, 1], y: [0, 1], colour: reportPalette.muted, dashed: true, widthPx: 0.8 },
        { x: levels, y: observed, colour: reportPalette.perturbed, widthPx: 1.6, band: { lower: [0, ...p.coverageCurve.map((c) => c.lower), 1], upper: [0, ...p.coverageCurve.map((c) => c.upper), 1] } },
      ],
      yRange: [0, 1],
    };
  });
}

/** "1 draw", "3 draws". */
const drawsCount = (n: number): string => `${n} draw${n === 1 ? '' : 's'}`;

function proportionTable(id: string, head: string, rows: readonly { label: string; p: ProportionRecord }[]): string {
  return htmlTable({
    id,
    head: [[head, numberCell('draws'), numberCell('detected'), numberCell('rate'), numberCell('68% interval')]],
    rows: rows.map(({ label, p }) => [label, numberCell(formatCount(p.trials)), numberCell(formatCount(p.successes)), numberCell(percent(p)), numberCell(`${formatNumber(100 * p.lower, 0)}&ndash;${formatNumber(100 * p.upper, 0)}%`)]),
  });
}

/**
 * Writes the report of a calibration folder (from `arcsift calibrate`): per parameter the rank
 * histogram with the band uniform ranks would fill, the coverage of every nominal level, the
 * table of uniformity tests and 68%/95% coverage; for comparisons the false-detection rate, the
 * detection rate against the true mass and the reliability of the posterior probability of a
 * perturber; the assumptions and the draws.
 */
export function writeCalibrationReport(folder: string, pageFile: string, figuresFolder: string): string {
  const summaryFile = join(folder, 'calibration.json');
  const s = readCalibrationSummary(summaryFile);
  const figures: ReportFigure[] = [];
  const parameters = s.parameters.filter((p) => p.draws > 0);
  if (parameters.length > 0) {
    figures.push(writeSvgFigure(figuresFolder, 'calibration-ranks', 'calibration-ranks', {
      section: 'diagnostics', title: 'Rank histograms',
      caption: `Ranks of the true value among ${s.rankDraws} posterior draws, over the draws, for each parameter: uniform (flat, inside the grey band that holds 99% of a bin's count under uniform ranks) when the posterior is calibrated. A U shape means too narrow a posterior, a hump too wide, a slope a bias (Talts et al. 2018).`,
      svg: linePlotSvg(rankPanels(parameters), { columns: 3, panelWidthPx: 260, panelHeightPx: 150 }),
    }));
    figures.push(writeSvgFigure(figuresFolder, 'calibration-coverage', 'calibration-coverage', {
      section: 'diagnostics', title: 'Coverage against nominal level',
      caption: 'Share of the draws whose true value lies in the central credible interval of each nominal level, with its binomial 68% band (Wilson 1927); the dashed diagonal is perfect calibration. Below it: intervals too narrow.',
      svg: linePlotSvg(coveragePanels(parameters), { columns: 3, panelWidthPx: 260, panelHeightPx: 150 }),
    }));
  }
  const det = s.detection;
  if (det !== null && det.byMass.some((b) => b.trials > 0)) {
    const bins = det.byMass.filter((b) => b.trials > 0);
    const centres = bins.map((b) => (b.log10MassLower + b.log10MassUpper) / 2);
    figures.push(writeSvgFigure(figuresFolder, 'calibration-detection', 'calibration-detection', {
      section: 'diagnostics', title: 'Detection rate against mass',
      caption: `Share of the draws with a perturber in which the comparison detects it (ln B &gt; ${formatNumber(det.thresholdLnB, 1)}), by its true mass, with binomial 68% bands; the dashed line is the false-detection rate on the draws without one.`,
      svg: linePlotSvg([{
        title: 'Detections', xLabel: 'true log10 mass / Msun', yLabel: 'detected',
        series: [{ x: centres, y: bins.map((b) => b.fraction ?? Number.NaN), colour: reportPalette.perturbed, widthPx: 1.6, band: { lower: bins.map((b) => b.lower), upper: bins.map((b) => b.upper) } }],
        references: det.falseDetection.fraction === null ? [] : [{ y: det.falseDetection.fraction, colour: reportPalette.smooth, label: 'false detections' }],
        yRange: [0, 1],
      }], { columns: 1, panelWidthPx: 420, panelHeightPx: 220 }),
    }));
  }
  // With fewer than 10 draws the ranks make one bin and the chi-square test says nothing: KS alone.
  const binned = (p: CalibrationParameterRecord): boolean => p.rankHistogram.length > 1;
  const uniform = parameters.filter((p) => (!binned(p) || p.chiSquarePValue > 0.01) && p.ksPValue > 0.01).length;
  // Pooled over parameters: with few draws the rank tests have little power, coverage shows more.
  const pooled = (pick: (p: CalibrationParameterRecord) => ProportionRecord): string => {
    const trials = parameters.reduce((n, p) => n + pick(p).trials, 0);
    return trials === 0 ? '&ndash;' : `${formatNumber((100 * parameters.reduce((n, p) => n + pick(p).successes, 0)) / trials, 0)}%`;
  };
  const testsTable = htmlTable({
    id: 'calibration-table',
    head: [['parameter', numberCell('draws'), numberCell('rank &chi;<sup>2</sup> p'), numberCell('KS p'), numberCell('68% coverage'), numberCell('95% coverage')]],
    rows: parameters.map((p) => [`<code>${escapeMarkup(p.name)}</code>${p.unit === '' ? '' : ` [${escapeMarkup(p.unit)}]`}`, numberCell(formatCount(p.draws)), numberCell(binned(p) ? pValue(p.chiSquarePValue) : '&ndash;'), numberCell(pValue(p.ksPValue)), numberCell(percent(p.coverage68)), numberCell(percent(p.coverage95))]),
  });
  const d = s.draws;
  const figuresOf = (keys: string[]): string => figures.filter((f) => keys.includes(f.key)).map((f) => figureHtml(f, pageFile)).join('\n');
  const detectionHtml = det === null ? '' : pageSection('detections', 'Detections', [
    `<p>A comparison detects the perturber when ln B &gt; ${formatNumber(det.thresholdLnB, 1)}. On draws without a perturber a calibrated Bayes factor exceeds e<sup>${formatNumber(det.thresholdLnB, 1)}</sup> at most ${formatNumber(100 * det.falseDetectionBound, 1)}% of the time (E[B] = 1 under the smooth model; Royall 2000).</p>`,
    proportionTable('false-detection-table', 'draws without a perturber', [{ label: 'false detections', p: det.falseDetection }]),
    ...(det.claims === undefined || det.claims.falseClaims.trials + det.claims.trueClaims.trials === 0 ? [] : [
      `<p>What the comparisons claimed by their own rule (ln B &gt; ${det.claims.thresholdsLnB.map((t) => formatNumber(t, 1)).join(' or ')}, with the smooth model passing the misfit alarm; a misfitting smooth model gives no evidence either way): ${drawsCount(det.claims.notEvidenceWithout)} without a perturber and ${det.claims.notEvidenceWith} with one gave no evidence.</p>`,
      proportionTable('claim-table', 'claimed detections', [
        { label: 'on draws without a perturber (false)', p: det.claims.falseClaims },
        { label: 'on draws with a perturber', p: det.claims.trueClaims },
      ]),
    ]),
    '<h3>By true mass</h3>',
    proportionTable('mass-table', 'true log<sub>10</sub> M/M<sub>&#9737;</sub>', det.byMass.map((b) => ({ label: `${formatNumber(b.log10MassLower, 1)}&ndash;${formatNumber(b.log10MassUpper, 1)}`, p: b }))),
    ...(det.reliability.length === 0 ? [] : ['<h3>Posterior probability of a perturber</h3>', `<p class="note">P = 1 / (1 + e<sup>&minus;ln B</sup> / odds) at the draws' own prior odds (draws with a perturber over draws without), against the share of draws in each bin that had one: equal when the evidence is calibrated.</p>`,
      htmlTable({
        id: 'reliability-table',
        head: [['P (perturber)', numberCell('draws'), numberCell('mean P'), numberCell('with a perturber'), numberCell('68% interval')]],
        rows: det.reliability.map((b) => [`${formatNumber(b.probabilityLower, 1)}&ndash;${formatNumber(b.probabilityUpper, 1)}`, numberCell(formatCount(b.trials)), numberCell(b.meanProbability === null ? '&ndash;' : formatNumber(b.meanProbability, 2)), numberCell(b.fraction === null ? '&ndash;' : formatNumber(b.fraction, 2)), numberCell(`${formatNumber(b.lower, 2)}&ndash;${formatNumber(b.upper, 2)}`)]),
      })]),
    figuresOf(['calibration-detection']),
  ].join('\n'));
  const drawsTable = htmlTable({
    id: 'draws-table',
    head: [['draw', 'perturber', 'state', numberCell('ln B'), numberCell('true log<sub>10</sub> M'), 'sampler stopped', numberCell('time')]],
    rows: s.perDraw.map((r) => [escapeMarkup(r.id), r.withPerturber ? 'yes' : 'no', escapeMarkup(r.state), numberCell(r.lnBayesFactor === null ? '&ndash;' : formatNumber(r.lnBayesFactor, 2)), numberCell(r.truthLog10Mass === null ? '&ndash;' : formatNumber(r.truthLog10Mass, 2)), escapeMarkup(r.stopReason ?? '-'), numberCell(r.seconds <= 0 ? '&ndash;' : r.seconds < 90 ? `${formatNumber(r.seconds, 0)} s` : `${formatNumber(r.seconds / 60, 1)} min`)]),
  });
  const body = `<section class="verdict not-favoured" id="verdict">
<div><span class="label">draws finished</span><span class="big">${formatCount(d.finished)} <small>of ${formatCount(d.planned)}</small></span></div>
<div><p class="reading">The 68% intervals hold the truth in ${pooled((p) => p.coverage68)} and the 95% intervals in ${pooled((p) => p.coverage95)} of all parameters' draws; ranks consistent with uniform (p &gt; 0.01) for ${formatCount(uniform)} of ${formatCount(parameters.length)} parameters.</p>
<p class="muted">${formatCount(d.withPerturber)} draws with a perturber and ${formatCount(d.withoutPerturber)} without, fitted by <code>arcsift ${escapeMarkup(s.job)}</code>${s.runOptions.length === 0 ? '' : ` with <code>${escapeMarkup(s.runOptions.join(' '))}</code>`}${d.stoppedEarly > 0 ? `; ${formatCount(d.stoppedEarly)} run(s) cut short` : ''}${d.failed > 0 ? `; ${formatCount(d.failed)} failed` : ''}.</p></div>
</section>
${pageSection('ranks', 'Posterior calibration', `${testsTable}\n<p class="note">Rank &chi;<sup>2</sup>: Pearson's test of the binned ranks against uniform (&ndash; below 10 draws: two bins need 5 expected ranks each); KS: Kolmogorov-Smirnov test of the posterior CDF at the truth against uniform. Coverage: share of draws whose truth lies in the reported central 68% and 95% intervals, &plusmn; its binomial standard error.</p>\n${figuresOf(['calibration-ranks', 'calibration-coverage'])}`)}
${detectionHtml}
${pageSection('assumptions', 'Assumptions', `<ul>${s.assumptions.map((a) => `<li>${escapeMarkup(a)}</li>`).join('')}</ul>`)}
${pageSection('draws', 'Draws', drawsTable)}
${pageSection('files', 'Files', `<ul class="files">${[summaryFile, join(folder, 'calibration-ranks.csv'), join(folder, 'draws.json'), ...figures.flatMap((f) => f.files)].filter((f) => existsSync(f)).map((f) => `<li><a href="${pageLink(pageFile, f)}">${escapeMarkup(relative(resolve(folder), resolve(f)))}</a></li>`).join('\n')}</ul>`)}`;
  const meta = [`config <code>${escapeMarkup(s.config)}</code>`, `seed ${s.seed}`, ...(s.cosmology === undefined ? [] : [`cosmology ${escapeMarkup(cosmologyText(s.cosmology))}`]), `run time ${formatNumber(s.rowSeconds / 3600, 2)} h over all rows`, `arcsift ${escapeMarkup(s.arcsiftVersion)}`].join(' &middot; ');
  writeFileAtomic(pageFile, pageFrame({
    name: relative(resolve(folder, '..'), resolve(folder)), brand: 'arcsift &middot; calibration on simulated draws', subtitle: s.title === '' ? undefined : s.title, meta, body, arcsiftVersion: packageVersion(), folder,
  }));
  return pageFile;
}
