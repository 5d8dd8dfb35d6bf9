import { readFileSync } from 'node:fs';
import { InputError } from '../errors.js';
import { WEIGHTED_SAMPLES_TITLE } from './samplesCsv.js';

/** The columns of a weighted samples table (samples.csv): the weights, ln L and the parameters. */
export interface WeightedSamplesColumns {
  readonly lnEvidence: number;
  readonly lnWeight: Float64Array;
  readonly lnLikelihood: Float64Array;
  /** Parameter names (the `name` of each `name [unit]` column after the three sampler columns). */
  readonly names: readonly string[];
  /** lnWeight.length rows of names.length values, row-major. */
  readonly points: Float64Array;
}

/** The sampler's columns of a weighted table; every other column is a parameter. */
const SAMPLER_COLUMNS = ['posteriorWeight', 'lnPosteriorWeight', 'lnLikelihood'];

/**
 * Reads ln posterior weight, ln L and the parameters of every row of a weighted samples table,
 * and ln Z from its `# lnEvidence = ` line (format of writeWeightedSamplesCsv). Throws an
 * InputError naming the file and line when the table is not one.
 */
export function readWeightedSamples(file: string): WeightedSamplesColumns {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (error) {
    throw new InputError(`cannot read the samples table (${(error as NodeJS.ErrnoException).code ?? String(error)})`, { file });
  }
  const lines = text.split('\n');
  if (lines[0] !== WEIGHTED_SAMPLES_TITLE) throw new InputError(`expected the first line ${JSON.stringify(WEIGHTED_SAMPLES_TITLE)}, found ${JSON.stringify(lines[0].slice(0, 80))}`, { file });
  let lnEvidence = NaN;
  let at = 1;
  for (; at < lines.length && lines[at].startsWith('#'); at++) {
    const match = /^# lnEvidence = (.+)$/.exec(lines[at]);
    if (match !== null) lnEvidence = Number(match[1]);
  }
  if (!Number.isFinite(lnEvidence)) throw new InputError('expected a "# lnEvidence = " line with a finite number before the header', { file });
  const header = (lines[at] ?? '').split(',');
  const weightColumn = header.indexOf('lnPosteriorWeight');
  const likelihoodColumn = header.indexOf('lnLikelihood');
  if (weightColumn < 0 || likelihoodColumn < 0) throw new InputError('expected a header with lnPosteriorWeight and lnLikelihood columns', { file, key: `line ${at + 1}` });
  const rows = lines.slice(at + 1).filter((line) => line !== '');
  const parameterColumns = header.map((field, k) => ({ field, k })).filter(({ field }) => !SAMPLER_COLUMNS.includes(field));
  const names = parameterColumns.map(({ field }) => field.replace(/ \[.*\]$/, ''));
  const dim = names.length;
  const lnWeight = new Float64Array(rows.length);
  const lnLikelihood = new Float64Array(rows.length);
  const points = new Float64Array(rows.length * dim);
  rows.forEach((line, r) => {
    const fields = line.split(',');
    lnWeight[r] = Number(fields[weightColumn]);
    lnLikelihood[r] = Number(fields[likelihoodColumn]);
    if (Number.isNaN(lnWeight[r]) || Number.isNaN(lnLikelihood[r])) throw new InputError('expected numbers in lnPosteriorWeight and lnLikelihood', { file, key: `line ${at + 2 + r}` });
    for (let c = 0; c < dim; c++) points[r * dim + c] = Number(fields[parameterColumns[c].k]);
  });
  return { lnEvidence, lnWeight, lnLikelihood, names, points };
}
