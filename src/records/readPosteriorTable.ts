import { readFileSync } from 'node:fs';
import { dirname } from 'node:path';
import { InputError, expectedFound } from '../errors.js';
import { splitCsvLine } from '../io/splitCsvLine.js';
import { SAMPLER_COLUMNS } from './posteriorTables.js';
import { readPosteriorSidecar } from './readPosteriorSidecar.js';

/** One of arcsift's posterior tables (posterior-weighted, posterior-draws, walker-paths) read back from its CSV. */
export interface PosteriorTable {
  readonly file: string;
  /** Parameter names in column order (the sampler columns are not parameters). */
  readonly names: readonly string[];
  /** Each parameter's unit from posterior.json beside the file ('' when that file is absent). */
  readonly units: readonly string[];
  readonly count: number;
  /** `count` rows of names.length values. */
  readonly points: Float64Array;
  /** The sampler columns the table has (lnLikelihood, lnWeight, walker, ...), by name. */
  readonly samplerColumns: ReadonlyMap<string, Float64Array>;
}

/**
 * Reads a posterior table's CSV as writePosteriorTables writes it: a header line, then one row
 * of numbers per sample. Columns named as sampler columns (lnLikelihood, lnWeight, weight,
 * walker, sweep, lnPosterior) are kept apart; every other column is a parameter. Every value
 * must be a number (ln L and ln weights may be infinite); an InputError names the file and line.
 */
export function readPosteriorTable(file: string): PosteriorTable {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (error) {
    throw new InputError(`cannot read the posterior table (${(error as NodeJS.ErrnoException).code ?? String(error)})`, { file });
  }
  const lines = text.split('\n').map((line) => (line.endsWith('\r') ? line.slice(0, -1) : line));
  if (lines[0] === undefined || lines[0].trim() === '') throw new InputError(expectedFound('a header line of column names', 'nothing'), { file });
  if (lines[0].startsWith('#')) {
    throw new InputError(expectedFound('a header line of column names first (an arcsift posterior table)', 'a comment line: a samples file of an earlier arcsift version?'), { file });
  }
  const header = splitCsvLine(lines[0], file, 1);
  const parameterColumns: number[] = [];
  const samplerIndex = new Map<string, number>();
  header.forEach((name, c) => {
    if (SAMPLER_COLUMNS.has(name)) samplerIndex.set(name, c);
    else parameterColumns.push(c);
  });
  if (parameterColumns.length === 0) throw new InputError(expectedFound('at least one parameter column', 'none'), { file });
  const rows = lines.slice(1).filter((line) => line !== '');
  const dim = parameterColumns.length;
  const points = new Float64Array(rows.length * dim);
  const sampler = new Map<string, Float64Array>([...samplerIndex.keys()].map((name) => [name, new Float64Array(rows.length)]));
  rows.forEach((line, r) => {
    const fields = line.split(',');
    if (fields.length !== header.length) {
      throw new InputError(`line ${r + 2}: ${expectedFound(`${header.length} fields like the header`, `${fields.length}`)}`, { file });
    }
    const value = (c: number): number => {
      const v = fields[c].trim() === '' ? Number.NaN : Number(fields[c]);
      if (Number.isNaN(v)) throw new InputError(`line ${r + 2}, column ${header[c]}: ${expectedFound('a number', fields[c])}`, { file });
      return v;
    };
    for (let j = 0; j < dim; j++) points[r * dim + j] = value(parameterColumns[j]);
    for (const [name, c] of samplerIndex) sampler.get(name)![r] = value(c);
  });
  const names = parameterColumns.map((c) => header[c]);
  const described = readPosteriorSidecar(dirname(file))?.parameters ?? [];
  const units = names.map((name) => described.find((p) => p.name === name)?.unit ?? '');
  return { file, names, units, count: rows.length, points, samplerColumns: sampler };
}
