import { existsSync } from 'node:fs';
import { join } from 'node:path';
import type { CornerData } from '../../results/cornerData.js';
import {
  isList, isMapping, isNumber, isString, locateRunData, readCornerData, readKindOfSummary, requireShape, type TruthRecord,
} from './readRunFolder.js';
import type { FitSummary } from '../../records/fitSummary.js';

/** A finished `arcsift fit` run as the report reads it. */
export interface FitFolder {
  readonly folder: string;
  readonly summaryFile: string;
  readonly summary: FitSummary;
  readonly corner: CornerData | null;
  readonly truth: TruthRecord | null;
  readonly dataFiles: Readonly<Record<'image' | 'noise' | 'psf' | 'mask', string | null>>;
  readonly notices: string[];
}

/** Reads summary.json (kind 'fit', checked key by key), corner.json and truth.json of a fit run folder. */
export function readFitFolder(folder: string): FitFolder {
  const summaryFile = join(folder, 'summary.json');
  const json = readKindOfSummary(summaryFile, 'fit', 'fit', {
    sampler: [(v) => v === 'nested' || v === 'ensemble', '"nested" or "ensemble"'],
    model: [isMapping, 'a mapping'],
    'model.parameters': [isList, 'a list of parameter summaries'],
    'model.bestLnLikelihood': [isNumber, 'a number'],
    priors: [isList, 'a list of priors'],
    amplitudePrior: [isString, 'a string'],
    caution: [isString, 'a string'],
  });
  const summary = json as unknown as FitSummary;
  if (summary.sampler === 'nested') requireShape(json, summaryFile, { 'evidence.lnEvidence': [isNumber, 'a number'], perturbers: [isList, 'a list of perturber summaries'] });
  else requireShape(json, summaryFile, { 'model.walkers': [isNumber, 'a number'], 'model.diagnostics': [isList, 'a list of per-parameter diagnostics'] });
  const notices: string[] = [];
  const cornerFile = join(folder, 'corner.json');
  const corner = existsSync(cornerFile) ? readCornerData(cornerFile) : null;
  if (corner === null) notices.push(`${cornerFile} not found: the posterior figures are left out`);
  const { dataFiles, truth } = locateRunData(summary.data, folder, summaryFile, notices);
  return { folder, summaryFile, summary, corner, truth, dataFiles, notices };
}
