import { dirname } from 'node:path';
import { InputError } from '../errors.js';
import { readPosteriorSidecar } from './readPosteriorSidecar.js';
import { readPosteriorTable } from './readPosteriorTable.js';

/** A nested run's weighted posterior (posterior-weighted.csv and ln Z from posterior.json). */
export interface WeightedPosteriorColumns {
  readonly lnEvidence: number;
  readonly lnWeight: Float64Array;
  readonly lnLikelihood: Float64Array;
  readonly names: readonly string[];
  readonly units: readonly string[];
  /** lnWeight.length rows of names.length values, row-major. */
  readonly points: Float64Array;
}

/**
 * Reads posterior-weighted.csv (`file`) and ln Z from the posterior.json beside it. Throws an
 * InputError naming the file when either is missing or is not what writePosteriorTables writes.
 */
export function readWeightedPosterior(file: string): WeightedPosteriorColumns {
  const sidecar = readPosteriorSidecar(dirname(file));
  if (sidecar === null) throw new InputError('expected posterior.json beside the weighted posterior, found none', { file });
  const lnEvidence = sidecar.lnEvidence ?? Number.NaN;
  if (!Number.isFinite(lnEvidence)) throw new InputError('expected a finite lnEvidence in posterior.json', { file });
  const table = readPosteriorTable(file);
  const lnWeight = table.samplerColumns.get('lnWeight');
  const lnLikelihood = table.samplerColumns.get('lnLikelihood');
  if (lnWeight === undefined || lnLikelihood === undefined) throw new InputError('expected lnWeight and lnLikelihood columns', { file, key: 'line 1' });
  return { lnEvidence, lnWeight, lnLikelihood, names: table.names, units: table.units, points: table.points };
}
