import { readFileSync } from 'node:fs';
import { InputError, expectedFound } from '../errors.js';
import { splitCsvLine } from '../io/splitCsvLine.js';

/** An arcsift samples table read back: parameter columns as `name [unit]` split, rows of numbers. */
export interface SamplesTable {
  readonly file: string;
  /** Parameter names in column order (the `lnLikelihood` column, when present, is not one). */
  readonly names: readonly string[];
  readonly units: readonly string[];
  /** `count` rows of names.length values. */
  readonly points: Float64Array;
  readonly count: number;
  /** ln L of each row, when the table has that column. */
  readonly lnLikelihood: Float64Array | undefined;
}

/**
 * Reads an equal-weight samples CSV (or chain.csv) as `writeEqualWeightSamplesCsv` writes it:
 * leading `#` lines, then a header of `name [unit]` fields (an optional first `lnLikelihood`),
 * then one row of numbers per sample. Every value must be a finite number.
 */
export function readSamplesTable(file: string): SamplesTable {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (error) {
    throw new InputError(`cannot read the samples table: ${(error as Error).message}`, { file });
  }
  const lines = text.split('\n').map((line) => (line.endsWith('\r') ? line.slice(0, -1) : line));
  let at = 0;
  while (at < lines.length && lines[at].startsWith('#')) at++;
  if (at >= lines.length || lines[at].trim() === '') {
    throw new InputError(expectedFound('a header line of parameter columns after the # lines', 'nothing'), { file });
  }
  const header = splitCsvLine(lines[at], file, at + 1);
  const first = header[0] === 'lnLikelihood' ? 1 : 0;
  const columns = header.slice(first).map(splitNameAndUnit);
  const dim = columns.length;
  if (dim === 0) throw new InputError(expectedFound('at least one parameter column', 'none'), { file });
  const rows: number[][] = [];
  for (let line = at + 1; line < lines.length; line++) {
    if (lines[line] === '') continue;
    const fields = lines[line].split(',');
    if (fields.length !== header.length) {
      throw new InputError(`line ${line + 1}: ${expectedFound(`${header.length} fields like the header`, `${fields.length}`)}`, { file });
    }
    rows.push(fields.map((field, column) => {
      const value = field.trim() === '' ? Number.NaN : Number(field);
      if (!Number.isFinite(value)) {
        throw new InputError(`line ${line + 1}, column ${header[column]}: ${expectedFound('a finite number', field)}`, { file });
      }
      return value;
    }));
  }
  const count = rows.length;
  const points = new Float64Array(count * dim);
  const lnLikelihood = first === 1 ? new Float64Array(count) : undefined;
  rows.forEach((row, r) => {
    if (lnLikelihood !== undefined) lnLikelihood[r] = row[0];
    for (let c = 0; c < dim; c++) points[r * dim + c] = row[first + c];
  });
  return { file, names: columns.map((c) => c.name), units: columns.map((c) => c.unit), points, count, lnLikelihood };
}

/** `name [unit]` -> { name, unit }; a field without a bracketed unit has the empty unit. */
function splitNameAndUnit(field: string): { name: string; unit: string } {
  const match = /^(.*) \[(.*)\]$/.exec(field);
  return match === null ? { name: field, unit: '' } : { name: match[1], unit: match[2] };
}
