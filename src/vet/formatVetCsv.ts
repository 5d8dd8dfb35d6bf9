import type { MisfitRecord } from '../records/misfitRecord.js';
import type { VetRunRecord, VetSummary } from '../records/vetSummary.js';

/** Columns of vet.csv, in order. */
export const VET_CSV_COLUMNS = [
  'candidate', 'flag_x_arcsec', 'flag_y_arcsec', 'score', 'ln_bayes_factor', 'ln_bayes_factor_error', 'verdict',
  'log10_mass_median', 'log10_mass_68_lower', 'log10_mass_68_upper', 'log10_mass_upper_limit_95',
  'x_arcsec', 'y_arcsec', 'offset_arcsec', 'flag_ra_deg', 'flag_dec_deg', 'ra_deg', 'dec_deg', 'finished',
  'chi2_per_dof', 'morans_i', 'misfit_p_value', 'misfit_alarm',
  'smooth_chi2_per_dof', 'smooth_morans_i', 'smooth_misfit_p_value', 'smooth_misfit_alarm',
] as const;

const cell = (v: number | null | undefined): string => (v === null || v === undefined || !Number.isFinite(v) ? '' : String(+v.toPrecision(8)));

/** Sky coordinates in degrees to 1e-8 degrees (0.04 milliarcsec), far below any posterior width. */
const sky = (v: number | undefined): string => (v === undefined || !Number.isFinite(v) ? '' : v.toFixed(8));

/** chi^2 per degree of freedom, Moran's I, its p-value and the alarm (yes or no) of one fit. */
const misfitCells = (m: MisfitRecord | undefined): string[] => (m === undefined
  ? ['', '', '', '']
  : [cell(m.chiSquarePerDegreeOfFreedom), cell(m.moransI), cell(m.pValue), m.alarm ? 'yes' : 'no']);

function row(r: VetRunRecord, smooth: MisfitRecord | undefined): string {
  const confirmed = r.verdict === 'confirmed';
  return [
    r.id, cell(r.flag?.xArcsec), cell(r.flag?.yArcsec), cell(r.score), cell(r.lnBayesFactor), cell(r.lnBayesFactorError), r.verdict,
    confirmed ? cell(r.log10Mass.median) : '', confirmed ? cell(r.log10Mass.interval68.lower) : '', confirmed ? cell(r.log10Mass.interval68.upper) : '',
    confirmed ? '' : cell(r.log10MassUpperLimit95),
    cell(r.position.xArcsec.median), cell(r.position.yArcsec.median), cell(r.offsetArcsec),
    sky(r.flag?.raDeg), sky(r.flag?.decDeg), sky(r.position.sky?.raDeg.median), sky(r.position.sky?.decDeg.median),
    r.finished === false ? 'false' : 'true',
    ...misfitCells(r.model.misfit), ...misfitCells(smooth),
  ].join(',');
}

/**
 * vet.csv: comment lines starting with '#' (thresholds, what the mass is), a header
 * (VET_CSV_COLUMNS) and one row per candidate, then the map-prior run if any (candidate
 * `map-prior`, no flag position). Mass median and 68% interval are given for confirmed rows, the
 * 95% upper limit for the others; x, y are posterior medians; the misfit columns hold each row's
 * perturbed fit's alarm and then the shared smooth fit's; empty cells mean "not given".
 */
export function formatVetCsv(summary: VetSummary): string {
  const t = summary.thresholds;
  const lines = [
    `# arcsift vet: ln B = ln Z(perturbed) - ln Z(smooth); confirmed when ln B > ${t.confirmAboveLnB} (the detection threshold: ${summary.thresholdSource}), disfavoured when ln B < ${t.disfavourBelowLnB}, inconclusive between; not-evidence for every row when the shared smooth fit fails the misfit alarm`,
    '# misfit of each fit at its best sample: chi2_per_dof (nominal degrees of freedom: pixels - sampled parameters - linear amplitudes), Moran\'s I of the normalised residuals and its one-sided permutation p-value; alarm = yes when p <= the false-alarm rate (structure the model missed); smooth_*: the shared smooth fit',
    `# log10 mass of the ${summary.perturberKind} perturber in solar masses (M200 for NFW-type perturbers, total mass otherwise): median and 68% interval when confirmed, 95% upper limit otherwise`,
    '# positions in arcsec from the image centre (x with the column, y with the row); offset = distance of the posterior median from the flag',
    '# finished: false when this run or the smooth one was cut short before converging (ln B and verdict not final)',
    `# ra, dec: degrees${summary.wcs === undefined ? ' (empty: the image has no celestial WCS)' : ` (${summary.wcs.frame}), posterior medians of RA and of Dec`}`,
    ...(summary.smooth === null ? ['# no candidates to vet: no fit was run (see vet.json flags.notices)'] : []),
    VET_CSV_COLUMNS.join(','),
    ...summary.candidates.map((r) => row(r, summary.smooth?.misfit)),
    ...(summary.mapPrior === null ? [] : [row(summary.mapPrior, summary.smooth?.misfit)]),
  ];
  return `${lines.join('\n')}\n`;
}
