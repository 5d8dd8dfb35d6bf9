import { join } from 'node:path';
import { InputError, expectedFound } from '../errors.js';
import { csvField } from '../io/csvField.js';
import { npyRecordBytes } from '../io/npyRecordBytes.js';
import { writeFileAtomic, writeJsonAtomic } from '../io/writeFileAtomic.js';
import { checkRows } from '../numeric/statistics/sampleChecks.js';

/**
 * arcsift's posterior tables, in a run's model folder. Each table is written twice, as CSV and
 * as NPY, with the same columns in the same order:
 *
 *   posterior-weighted   (nested sampling) every dead point and the final live points, in the
 *                        order removed (ln L increasing): lnLikelihood, lnWeight, weight, then
 *                        the parameters; weight = exp(lnWeight), the normalised posterior weight
 *   posterior-draws      (nested sampling) equal-weight draws, systematically resampled from the
 *                        weighted table: lnLikelihood, then the parameters
 *   walker-paths         (ensemble MCMC) every walker's positions after burn-in, walker by walker
 *                        (all of walker 0's stored sweeps, then walker 1's, ...): walker, sweep,
 *                        lnPosterior (ln prior + ln L), lnLikelihood, then the parameters
 *
 * CSV: the header is the first line (no comment lines), RFC 4180 quoting, "\n" line ends;
 * numbers are written by String(x) (the shortest text that reads back as the same double,
 * ECMA-262 Number::toString), negative zero as "-0", non-finite values as NaN, Infinity,
 * -Infinity. NPY: a 1-D structured array of named little-endian float64 fields (int64 for
 * walker and sweep), so `numpy.load(...)['lnLikelihood']` is a column.
 *
 * posterior.json beside them names the sampler, every parameter with its unit, ln Z and its
 * error (nested sampling), and each table's files, rows and columns. It is written last.
 */
export const POSTERIOR_TABLES = {
  weighted: 'posterior-weighted',
  draws: 'posterior-draws',
  walkerPaths: 'walker-paths',
} as const;
export type PosteriorTableName = (typeof POSTERIOR_TABLES)[keyof typeof POSTERIOR_TABLES];

/** The sidecar file of the tables of one folder. */
export const POSTERIOR_SIDECAR = 'posterior.json';
export const POSTERIOR_FORMAT = 'arcsift posterior tables';
export const POSTERIOR_FORMAT_VERSION = 1;

/** Every file name the tables of one folder may have, the sidecar last (for lists of a run's files). */
export const POSTERIOR_FILE_NAMES: readonly string[] = [
  ...Object.values(POSTERIOR_TABLES).flatMap((table) => [`${table}.csv`, `${table}.npy`]), POSTERIOR_SIDECAR,
];

/** The columns ahead of the parameters, per table; no parameter may take one of these names. */
export const LEADING_COLUMNS: Readonly<Record<PosteriorTableName, readonly string[]>> = {
  'posterior-weighted': ['lnLikelihood', 'lnWeight', 'weight'],
  'posterior-draws': ['lnLikelihood'],
  'walker-paths': ['walker', 'sweep', 'lnPosterior', 'lnLikelihood'],
};

/** Every column name that is not a parameter. */
export const SAMPLER_COLUMNS: ReadonlySet<string> = new Set(Object.values(LEADING_COLUMNS).flat());

/** Columns stored as integers in the NPY copy. */
const INTEGER_COLUMNS: ReadonlySet<string> = new Set(['walker', 'sweep']);

/** What each table's rows are, in words (written into posterior.json). */
const ROWS_ARE: Readonly<Record<PosteriorTableName, string>> = {
  'posterior-weighted': 'every dead point of the nested run and its final live points, ln L increasing; weight = exp(lnWeight) is the normalised posterior weight (the weights sum to 1)',
  'posterior-draws': 'equal-weight posterior draws, systematically resampled from posterior-weighted',
  'walker-paths': 'every walker\'s positions after burn-in, walker by walker (all stored sweeps of walker 0, then of walker 1, ...); lnPosterior = ln prior + ln L',
};

/** Weighted samples of a nested-sampling run. */
export interface WeightedPosteriorRows {
  /** lnWeight.length rows of the parameters, row-major. */
  readonly points: ArrayLike<number>;
  /** Normalised posterior log weights (logsumexp = 0). */
  readonly lnWeight: ArrayLike<number>;
  readonly lnLikelihood: ArrayLike<number>;
}

/** Equal-weight draws. */
export interface PosteriorDraws {
  /** Rows of the parameters, row-major. */
  readonly points: ArrayLike<number>;
  readonly lnLikelihood: ArrayLike<number>;
}

/** An ensemble chain after burn-in, as the sampler stores it: step by step, all walkers in each. */
export interface WalkerPaths {
  readonly walkers: number;
  /** The sweep number of each stored step (steps = sweeps.length). */
  readonly sweeps: ArrayLike<number>;
  /** steps x walkers rows of the parameters. */
  readonly points: ArrayLike<number>;
  /** steps x walkers values each. */
  readonly lnPosterior: ArrayLike<number>;
  readonly lnLikelihood: ArrayLike<number>;
}

/** The tables of one run folder and what they share. */
export interface PosteriorTablesContent {
  readonly sampler: 'nested' | 'ensemble';
  readonly names: readonly string[];
  readonly units: readonly string[];
  readonly lnEvidence?: number;
  readonly lnEvidenceError?: number;
  readonly weighted?: WeightedPosteriorRows;
  readonly draws?: PosteriorDraws;
  readonly walkerPaths?: WalkerPaths;
}

/** One table's entry in posterior.json. */
export interface PosteriorTableEntry {
  readonly table: PosteriorTableName;
  readonly csv: string;
  readonly npy: string;
  readonly rows: number;
  readonly columns: readonly string[];
  readonly rowsAre: string;
}

/** posterior.json. */
export interface PosteriorSidecar {
  readonly format: typeof POSTERIOR_FORMAT;
  readonly version: number;
  readonly sampler: 'nested' | 'ensemble';
  readonly parameters: readonly { readonly name: string; readonly unit: string }[];
  /** ln Z and its error (nested sampling); null when not finite. */
  readonly lnEvidence?: number | null;
  readonly lnEvidenceError?: number | null;
  readonly tables: readonly PosteriorTableEntry[];
}

/** A table as columns: the leading sampler columns, then the parameters, `count` rows. */
interface TableColumns {
  readonly table: PosteriorTableName;
  readonly count: number;
  /** The value of leading column `c` at `row`. */
  leading(row: number, c: number): number;
  /** The value of parameter `j` at `row`. */
  parameter(row: number, j: number): number;
}

function formatNumber(value: number): string {
  return value === 0 && 1 / value < 0 ? '-0' : String(value);
}

function csvText(columns: TableColumns, names: readonly string[]): string {
  const leading = LEADING_COLUMNS[columns.table];
  const width = leading.length + names.length;
  const lines = [[...leading, ...names].map((name) => csvField(name)).join(',')];
  const row: string[] = new Array(width);
  for (let r = 0; r < columns.count; r++) {
    for (let c = 0; c < leading.length; c++) row[c] = formatNumber(columns.leading(r, c));
    for (let j = 0; j < names.length; j++) row[leading.length + j] = formatNumber(columns.parameter(r, j));
    lines.push(row.join(','));
  }
  return `${lines.join('\n')}\n`;
}

function npyBytes(columns: TableColumns, names: readonly string[]): Uint8Array {
  const leading = LEADING_COLUMNS[columns.table];
  const fields = [...leading, ...names].map((name) => ({ name, integer: INTEGER_COLUMNS.has(name) }));
  const split = leading.length;
  return npyRecordBytes(fields, columns.count, (r, f) => (f < split ? columns.leading(r, f) : columns.parameter(r, f - split)));
}

function checkLength(values: ArrayLike<number>, count: number, what: string): void {
  if (values.length !== count) throw new InputError(`${what}: ${expectedFound(`${count} values, one per row`, values.length)}`);
}

function checkNames(names: readonly string[], units: readonly string[]): number {
  if (names.length < 1) throw new InputError(`posterior tables: parameter names: ${expectedFound('at least one name', names.length)}`);
  if (units.length !== names.length) {
    throw new InputError(`posterior tables: units: ${expectedFound(`${names.length} units, one per name`, units.length)}`);
  }
  const clash = names.find((name) => SAMPLER_COLUMNS.has(name));
  if (clash !== undefined) throw new InputError(`posterior tables: the parameter name ${JSON.stringify(clash)} is a sampler column's`);
  return names.length;
}

function weightedColumns(table: WeightedPosteriorRows, dim: number): TableColumns {
  const count = table.lnWeight.length;
  checkRows(table.points, count, dim, 'posterior-weighted: points');
  checkLength(table.lnLikelihood, count, 'posterior-weighted: lnLikelihood');
  const leading = [(r: number) => table.lnLikelihood[r], (r: number) => table.lnWeight[r], (r: number) => Math.exp(table.lnWeight[r])];
  return { table: POSTERIOR_TABLES.weighted, count, leading: (r, c) => leading[c](r), parameter: (r, j) => table.points[r * dim + j] };
}

function drawColumns(table: PosteriorDraws, dim: number): TableColumns {
  const count = table.lnLikelihood.length;
  checkRows(table.points, count, dim, 'posterior-draws: points');
  return { table: POSTERIOR_TABLES.draws, count, leading: (r) => table.lnLikelihood[r], parameter: (r, j) => table.points[r * dim + j] };
}

function walkerColumns(table: WalkerPaths, dim: number): TableColumns {
  const { walkers } = table;
  const steps = table.sweeps.length;
  const count = steps * walkers;
  checkRows(table.points, count, dim, 'walker-paths: points');
  checkLength(table.lnPosterior, count, 'walker-paths: lnPosterior');
  checkLength(table.lnLikelihood, count, 'walker-paths: lnLikelihood');
  // Row r of the table is walker floor(r / steps) at its (r mod steps)-th stored step.
  const stored = (r: number): number => (r % steps) * walkers + Math.floor(r / steps);
  const leading = [
    (r: number) => Math.floor(r / steps),
    (r: number) => table.sweeps[r % steps],
    (r: number) => table.lnPosterior[stored(r)],
    (r: number) => table.lnLikelihood[stored(r)],
  ];
  return { table: POSTERIOR_TABLES.walkerPaths, count, leading: (r, c) => leading[c](r), parameter: (r, j) => table.points[stored(r) * dim + j] };
}

const finiteOrNull = (v: number | undefined): number | null => (v !== undefined && Number.isFinite(v) ? v : null);

/**
 * Writes the tables `content` holds into `folder` (CSV and NPY each, atomically), then
 * posterior.json. Returns the paths written, keyed `posteriorWeighted`, `posteriorWeightedNpy`,
 * ..., `posteriorSidecar`.
 */
export function writePosteriorTables(folder: string, content: PosteriorTablesContent): Record<string, string> {
  const dim = checkNames(content.names, content.units);
  const tables: TableColumns[] = [];
  if (content.weighted !== undefined) tables.push(weightedColumns(content.weighted, dim));
  if (content.draws !== undefined) tables.push(drawColumns(content.draws, dim));
  if (content.walkerPaths !== undefined) tables.push(walkerColumns(content.walkerPaths, dim));
  const files: Record<string, string> = {};
  const entries: PosteriorTableEntry[] = [];
  for (const columns of tables) {
    const key = columns.table.replace(/-(\w)/g, (_, c: string) => c.toUpperCase());
    const csv = `${columns.table}.csv`;
    const npy = `${columns.table}.npy`;
    files[key] = join(folder, csv);
    files[`${key}Npy`] = join(folder, npy);
    writeFileAtomic(files[key], csvText(columns, content.names));
    writeFileAtomic(files[`${key}Npy`], npyBytes(columns, content.names));
    entries.push({
      table: columns.table, csv, npy, rows: columns.count,
      columns: [...LEADING_COLUMNS[columns.table], ...content.names], rowsAre: ROWS_ARE[columns.table],
    });
  }
  const sidecar: PosteriorSidecar = {
    format: POSTERIOR_FORMAT,
    version: POSTERIOR_FORMAT_VERSION,
    sampler: content.sampler,
    parameters: content.names.map((name, j) => ({ name, unit: content.units[j] })),
    ...(content.sampler === 'nested' ? { lnEvidence: finiteOrNull(content.lnEvidence), lnEvidenceError: finiteOrNull(content.lnEvidenceError) } : {}),
    tables: entries,
  };
  files.posteriorSidecar = join(folder, POSTERIOR_SIDECAR);
  writeJsonAtomic(files.posteriorSidecar, sidecar);
  return files;
}
