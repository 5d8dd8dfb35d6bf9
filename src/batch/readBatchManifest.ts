import { existsSync, readFileSync, statSync } from 'node:fs';
import { dirname, extname, resolve } from 'node:path';
import { parse } from 'yaml';
import { InputError, describeValue, expectedFound } from '../errors.js';
import { splitCsvLine } from '../io/splitCsvLine.js';
import { batchJobs } from './batchJobs.js';
import type { BatchRow } from './batchRow.js';

/** The columns (CSV) or keys (YAML) of a manifest row. */
export const MANIFEST_COLUMNS = ['id', 'job', 'config', 'data', 'image', 'noise', 'psf', 'mask', 'flags', 'seed', 'options'] as const;
type Column = (typeof MANIFEST_COLUMNS)[number];

/** Options the batch sets itself for every row; a row may not give them. */
export const BATCH_OWNED_OPTIONS = ['--out', '--resume', '--take-over-lock', '--quiet', '--threads', '--report', '--no-report', '--config', '--data', '--image', '--noise', '--psf', '--mask', '--flags', '--seed', '--help'];

/** A row as written: text or numbers by column, and where it was written. */
interface RawRow {
  readonly cells: Partial<Record<Column, unknown>>;
  readonly origin: string;
}

/** Splits an options cell ("--live-points 50 --max-evaluations 2e4") or takes a YAML list. */
function optionTokens(value: unknown, origin: string): string[] {
  if (value === undefined || value === null || value === '') return [];
  const tokens = Array.isArray(value) ? value.map(String) : typeof value === 'string' ? value.trim().split(/\s+/) : undefined;
  if (tokens === undefined) throw new InputError(`${origin}, options: ${expectedFound('command-line options as one string or a list', value)}`);
  for (const token of tokens) {
    const name = token.split('=')[0];
    if (BATCH_OWNED_OPTIONS.includes(name)) {
      throw new InputError(`${origin}, options: ${name} is set by the batch itself (use the manifest's own columns, or the batch's options)`);
    }
  }
  return tokens;
}

/** Checks the job-run options given for every row (same rules as a row's options column). */
export function checkRunOptions(tokens: readonly string[], what: string): string[] {
  return optionTokens([...tokens], what);
}

function existingPath(value: unknown, base: string, origin: string, column: string, kind: 'file' | 'folder'): string {
  if (typeof value !== 'string' || value.trim() === '') throw new InputError(`${origin}, ${column}: ${expectedFound(`the path of a ${kind}`, value)}`);
  const path = resolve(base, value.trim());
  if (!existsSync(path)) throw new InputError(`${origin}, ${column}: ${kind} not found: ${path}`);
  const isFolder = statSync(path).isDirectory();
  if (isFolder !== (kind === 'folder')) throw new InputError(`${origin}, ${column}: expected a ${kind}, found a ${isFolder ? 'folder' : 'file'}: ${path}`);
  return path;
}

function text(value: unknown): string | undefined {
  if (value === undefined || value === null) return undefined;
  const t = String(value).trim();
  return t === '' ? undefined : t;
}

/** One row checked: a known job, its columns present, paths that exist (relative to the manifest's folder). */
function checkRow(raw: RawRow, index: number, base: string): BatchRow {
  const { cells, origin } = raw;
  const id = text(cells.id) ?? `row-${String(index + 1).padStart(4, '0')}`;
  if (!/^[A-Za-z0-9][A-Za-z0-9._-]*$/.test(id)) {
    throw new InputError(`${origin}, id: ${expectedFound('letters, digits, ".", "_" or "-" (it names a folder)', id)}`);
  }
  const job = text(cells.job);
  if (job === undefined || !(job in batchJobs)) {
    throw new InputError(`${origin}, job: ${expectedFound(`one of ${Object.keys(batchJobs).join(', ')}`, cells.job)}`);
  }
  const config = existingPath(cells.config, base, origin, 'config', 'file');
  const data: Record<string, string> = {};
  if (text(cells.data) !== undefined) data.folder = existingPath(cells.data, base, origin, 'data', 'folder');
  for (const column of ['image', 'noise', 'psf', 'mask'] as const) {
    if (text(cells[column]) !== undefined) data[column] = existingPath(cells[column], base, origin, column, 'file');
  }
  if (data.folder === undefined && data.image === undefined) {
    throw new InputError(`${origin}: name the observed data with a data folder (column data) or the image, noise and psf files`);
  }
  let flags: string | undefined;
  if (text(cells.flags) !== undefined) flags = existingPath(cells.flags, base, origin, 'flags', 'file');
  for (const need of batchJobs[job].requires) {
    if (need === 'flags' && flags === undefined) throw new InputError(`${origin}, flags: the ${job} job needs a flag list or probability map`);
  }
  let seed: number | undefined;
  if (text(cells.seed) !== undefined) {
    seed = Number(text(cells.seed));
    if (!Number.isInteger(seed) || seed < 1) throw new InputError(`${origin}, seed: ${expectedFound('a whole number >= 1', cells.seed)}`);
  }
  const options = optionTokens(cells.options, origin);
  return { id, job, config, data, ...(flags === undefined ? {} : { flags }), ...(seed === undefined ? {} : { seed }), options, origin };
}

function csvRows(file: string, content: string): RawRow[] {
  const lines = content.split('\n').map((line, k) => ({ line: line.endsWith('\r') ? line.slice(0, -1) : line, number: k + 1 }))
    .filter(({ line }) => line.trim() !== '' && !line.startsWith('#'));
  if (lines.length === 0) throw new InputError('empty manifest: expected a header line (e.g. id,job,config,data) and one row per lens', { file });
  const header = splitCsvLine(lines[0].line, file, lines[0].number).map((h) => h.trim());
  header.forEach((name) => {
    if (!(MANIFEST_COLUMNS as readonly string[]).includes(name)) {
      throw new InputError(`line ${lines[0].number} (header): unknown column ${describeValue(name)}; expected columns among ${MANIFEST_COLUMNS.join(', ')}`, { file });
    }
  });
  return lines.slice(1).map(({ line, number }) => {
    const fields = splitCsvLine(line, file, number);
    if (fields.length !== header.length) throw new InputError(`line ${number}: ${expectedFound(`${header.length} fields like the header`, fields.length)}`, { file });
    return { cells: Object.fromEntries(header.map((h, k) => [h, fields[k]])), origin: `${file} line ${number}` };
  });
}

function yamlRows(file: string, content: string): RawRow[] {
  let data: unknown;
  try {
    data = parse(content, { uniqueKeys: true });
  } catch (error) {
    throw new InputError(`not valid YAML: ${(error as Error).message.split('\n')[0]}`, { file });
  }
  const mapping = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
  const top = mapping(data) ? data : { rows: data };
  for (const key of Object.keys(top)) {
    if (key !== 'rows' && key !== 'defaults') throw new InputError(`unknown key ${describeValue(key)}; expected rows (a list) and optionally defaults`, { file, key });
  }
  const defaults = top.defaults ?? {};
  if (!mapping(defaults)) throw new InputError(expectedFound('a mapping of column values shared by every row', defaults), { file, key: 'defaults' });
  if (!Array.isArray(top.rows)) throw new InputError(expectedFound('a list of rows', top.rows), { file, key: 'rows' });
  return top.rows.map((row, k) => {
    if (!mapping(row)) throw new InputError(expectedFound('a mapping of columns', row), { file, key: `rows[${k}]` });
    for (const key of [...Object.keys(defaults), ...Object.keys(row)]) {
      if (!(MANIFEST_COLUMNS as readonly string[]).includes(key)) {
        throw new InputError(`unknown key ${describeValue(key)}; expected keys among ${MANIFEST_COLUMNS.join(', ')}`, { file, key: `rows[${k}]` });
      }
    }
    return { cells: { ...defaults, ...row }, origin: `${file} rows[${k}]` };
  });
}

/**
 * Reads a batch manifest: a CSV file (a header of MANIFEST_COLUMNS, one row per line, `#` lines
 * skipped) or a YAML file (`rows:` a list of mappings, optional `defaults:` shared by every row,
 * or just the list). Each row names its job (fit, compare, vet, sensitivity, verdict), config and data
 * (a folder, or image/noise/psf/mask files), optionally flags, seed and extra options of the
 * job's command. Relative paths are relative to the manifest's folder. Every mistake is an
 * InputError naming the file, the line or row and the column.
 */
export function readBatchManifest(file: string): BatchRow[] {
  let content: string;
  try {
    content = readFileSync(file, 'utf8');
  } catch (error) {
    throw new InputError(`cannot read the manifest (${(error as NodeJS.ErrnoException).code ?? String(error)})`, { file });
  }
  const extension = extname(file).toLowerCase();
  const raw = extension === '.csv' ? csvRows(file, content) : ['.yaml', '.yml', '.json'].includes(extension) ? yamlRows(file, content) : undefined;
  if (raw === undefined) throw new InputError(expectedFound('a manifest ending .csv, .yaml, .yml or .json', extension || 'no extension'), { file });
  if (raw.length === 0) throw new InputError('the manifest has no rows', { file });
  const base = dirname(resolve(file));
  const rows = raw.map((r, k) => checkRow(r, k, base));
  const seen = new Map<string, string>();
  for (const row of rows) {
    const earlier = seen.get(row.id);
    if (earlier !== undefined) throw new InputError(`${row.origin}, id: ${row.id} is already the id of ${earlier}; ids must be unique`);
    seen.set(row.id, row.origin);
  }
  return rows;
}
