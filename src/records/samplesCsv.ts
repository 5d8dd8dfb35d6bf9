import { InputError, expectedFound } from '../errors.js';
import { csvField } from '../io/csvField.js';
import { writeFileAtomic } from '../io/writeFileAtomic.js';
import { checkRows } from '../numeric/statistics/sampleChecks.js';

/**
 * arcsift's sample tables (CSV, RFC 4180 quoting, lines ending in "\n"):
 *
 *   # arcsift weighted posterior samples, format 1
 *   # lnEvidence = -1234.5            (only when given)
 *   # lnEvidenceError = 0.12          (only when given)
 *   posteriorWeight,lnPosteriorWeight,lnLikelihood,thetaE [arcsec],...
 *   <one row per sample>
 *
 *   # arcsift equal-weight posterior samples, format 1
 *   lnLikelihood,thetaE [arcsec],...  (lnLikelihood only when given)
 *   <one row per sample>
 *
 * Lines starting with "#" come first and only there. A parameter column is named `name [unit]`,
 * or `name` alone when the unit is empty. posteriorWeight is exp(lnPosteriorWeight). Numbers are
 * written by String(x) (the shortest text that reads back as the same double, ECMA-262
 * Number::toString), except that negative zero is written "-0"; non-finite values appear as
 * NaN, Infinity, -Infinity.
 */
export const WEIGHTED_SAMPLES_TITLE = '# arcsift weighted posterior samples, format 1';
export const EQUAL_WEIGHT_SAMPLES_TITLE = '# arcsift equal-weight posterior samples, format 1';

/** Weighted samples of a nested-sampling run, as written by `writeWeightedSamplesCsv`. */
export interface WeightedSamplesTable {
  readonly names: readonly string[];
  readonly units: readonly string[];
  /** lnWeight.length rows of names.length physical values. */
  readonly points: ArrayLike<number>;
  /** Normalised posterior log weights (logsumexp = 0). */
  readonly lnWeight: ArrayLike<number>;
  readonly lnLikelihood: ArrayLike<number>;
  readonly lnEvidence?: number;
  readonly lnEvidenceError?: number;
}

/** Equal-weight samples, as written by `writeEqualWeightSamplesCsv`. */
export interface EqualWeightSamplesTable {
  readonly names: readonly string[];
  readonly units: readonly string[];
  /** Rows of names.length physical values. */
  readonly points: ArrayLike<number>;
  /** ln L of each row, when known. */
  readonly lnLikelihood?: ArrayLike<number>;
}

/** The text of a weighted-samples table (format above). */
export function formatWeightedSamplesCsv(table: WeightedSamplesTable): string {
  const count = table.lnWeight.length;
  const dim = checkNamesAndUnits(table.names, table.units);
  checkRows(table.points, count, dim, 'weighted samples: points');
  checkLength(table.lnLikelihood, count, 'weighted samples: lnLikelihood');
  const lines = [WEIGHTED_SAMPLES_TITLE];
  if (table.lnEvidence !== undefined) lines.push(`# lnEvidence = ${formatNumber(table.lnEvidence)}`);
  if (table.lnEvidenceError !== undefined) lines.push(`# lnEvidenceError = ${formatNumber(table.lnEvidenceError)}`);
  lines.push(['posteriorWeight', 'lnPosteriorWeight', 'lnLikelihood', ...columnNames(table.names, table.units)].join(','));
  const row: string[] = new Array(dim + 3);
  for (let i = 0; i < count; i++) {
    row[0] = formatNumber(Math.exp(table.lnWeight[i]));
    row[1] = formatNumber(table.lnWeight[i]);
    row[2] = formatNumber(table.lnLikelihood[i]);
    for (let j = 0; j < dim; j++) row[3 + j] = formatNumber(table.points[i * dim + j]);
    lines.push(row.join(','));
  }
  return `${lines.join('\n')}\n`;
}

/** The text of an equal-weight samples table (format above). */
export function formatEqualWeightSamplesCsv(table: EqualWeightSamplesTable): string {
  const dim = checkNamesAndUnits(table.names, table.units);
  const count = Math.floor(table.points.length / dim);
  checkRows(table.points, count, dim, 'equal-weight samples: points');
  const lnLikelihood = table.lnLikelihood;
  if (lnLikelihood !== undefined) checkLength(lnLikelihood, count, 'equal-weight samples: lnLikelihood');
  const first = lnLikelihood === undefined ? 0 : 1;
  const header = columnNames(table.names, table.units);
  const lines = [EQUAL_WEIGHT_SAMPLES_TITLE, (first === 1 ? ['lnLikelihood', ...header] : header).join(',')];
  const row: string[] = new Array(dim + first);
  for (let i = 0; i < count; i++) {
    if (lnLikelihood !== undefined) row[0] = formatNumber(lnLikelihood[i]);
    for (let j = 0; j < dim; j++) row[first + j] = formatNumber(table.points[i * dim + j]);
    lines.push(row.join(','));
  }
  return `${lines.join('\n')}\n`;
}

/** Writes a weighted-samples table to `path` atomically (temporary file, then rename). */
export function writeWeightedSamplesCsv(path: string, table: WeightedSamplesTable): void {
  writeFileAtomic(path, formatWeightedSamplesCsv(table));
}

/** Writes an equal-weight samples table to `path` atomically (temporary file, then rename). */
export function writeEqualWeightSamplesCsv(path: string, table: EqualWeightSamplesTable): void {
  writeFileAtomic(path, formatEqualWeightSamplesCsv(table));
}

/** `name [unit]` (or `name`), quoted when RFC 4180 requires it or when it would start with "#". */
function columnNames(names: readonly string[], units: readonly string[]): string[] {
  return names.map((name, j) => csvField(units[j] === '' ? name : `${name} [${units[j]}]`));
}

function formatNumber(value: number): string {
  return value === 0 && 1 / value < 0 ? '-0' : String(value);
}

function checkNamesAndUnits(names: readonly string[], units: readonly string[]): number {
  if (names.length < 1) throw new InputError(`samples table: parameter names: ${expectedFound('at least one name', names.length)}`);
  if (units.length !== names.length) {
    throw new InputError(`samples table: units: ${expectedFound(`${names.length} units, one per name`, units.length)}`);
  }
  return names.length;
}

function checkLength(values: ArrayLike<number>, count: number, what: string): void {
  if (values.length !== count) throw new InputError(`${what}: ${expectedFound(`${count} values, one per sample`, values.length)}`);
}
