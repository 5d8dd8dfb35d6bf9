import { existsSync, readFileSync } from 'node:fs';
import { dirname, isAbsolute, join, resolve } from 'node:path';
import { InputError, describeValue, expectedFound } from '../../errors.js';
import type { CornerData } from '../../results/cornerData.js';
import type { ComparisonSummary } from '../../records/comparisonSummary.js';
import type { TruthParameter, TruthPerturber } from '../../records/truthFile.js';

export type { TruthParameter, TruthPerturber } from '../../records/truthFile.js';

/** The parts of truth.json (records/truthFile.ts) the report uses. */
export interface TruthRecord {
  readonly file: string;
  readonly title?: string;
  readonly parameters: readonly TruthParameter[];
  readonly perturbers: readonly TruthPerturber[];
}

/** The two model folders of a comparison run. */
export type ModelName = 'smooth' | 'perturbed';
export const MODEL_NAMES: readonly ModelName[] = ['smooth', 'perturbed'];

/** A finished comparison run as the report reads it. */
export interface RunFolder {
  readonly folder: string;
  readonly summaryFile: string;
  readonly summary: ComparisonSummary;
  /** corner.json of each model; null when the file is absent (its figures are then left out). */
  readonly corners: Readonly<Record<ModelName, CornerData | null>>;
  /** truth.json beside the observed image, when the data came from `arcsift simulate`. */
  readonly truth: TruthRecord | null;
  /** The observed data files as found from here (null when not found), keyed as in summary.data. */
  readonly dataFiles: Readonly<Record<'image' | 'noise' | 'psf' | 'mask', string | null>>;
  /** What the report could not find and so leaves out. */
  readonly notices: string[];
}

export type Json = unknown;
export type Check = (value: Json) => boolean;
export const isNumber: Check = (v) => typeof v === 'number';
export const isNumberOrNull: Check = (v) => v === null || typeof v === 'number';
export const isString: Check = (v) => typeof v === 'string';
export const isBoolean: Check = (v) => typeof v === 'boolean';
export const isList: Check = (v) => Array.isArray(v);
export const isMapping: Check = (v) => typeof v === 'object' && v !== null && !Array.isArray(v);

/** Parses a JSON file; a missing or malformed one is an InputError naming it. */
export function readJson(file: string): Json {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new InputError(code === 'ENOENT' ? 'file not found' : `cannot read the file (${code ?? String(error)})`, { file });
  }
  try {
    return JSON.parse(text);
  } catch (error) {
    throw new InputError(`not valid JSON: ${(error as Error).message}`, { file });
  }
}

/** Checks that `root` holds, at each dotted key, a value passing its check; throws an InputError naming the first that fails. */
export function requireShape(root: Json, file: string, shape: Readonly<Record<string, [Check, string]>>, prefix = ''): void {
  for (const [key, [check, expected]] of Object.entries(shape)) {
    let value: Json = root;
    for (const part of key.split('.')) value = isMapping(value) ? (value as Record<string, Json>)[part] : undefined;
    if (!check(value)) throw new InputError(expectedFound(expected, value), { file, key: `${prefix}${key}` });
  }
}

/**
 * Reads a run summary written by `arcsift COMMAND` and checks it key by key: a mapping whose
 * `kind` is `kind`, with `data.image` and every key of `shape`. Throws an InputError naming the
 * file and the first key that fails.
 */
export function readKindOfSummary(file: string, kind: string, command: string, shape: Readonly<Record<string, [Check, string]>>): Record<string, Json> {
  const json = readJson(file);
  if (!isMapping(json)) throw new InputError(expectedFound(`a mapping (the summary of \`arcsift ${command}\`)`, json), { file });
  requireShape(json, file, {
    kind: [(v) => v === kind, `"${kind}" (a summary written by \`arcsift ${command}\`)`],
    'data.image': [isString, 'the path of the observed image'],
    ...shape,
  });
  return json as Record<string, Json>;
}

const MODEL_SHAPE = (model: ModelName): Record<string, [Check, string]> => ({
  [`models.${model}`]: [isMapping, 'a mapping'],
  [`models.${model}.lnEvidence`]: [isNumber, 'a number'],
  [`models.${model}.lnEvidenceError`]: [isNumber, 'a number'],
  [`models.${model}.lnEvidenceErrorSimulated`]: [isNumberOrNull, 'a number'],
  [`models.${model}.informationNats`]: [isNumberOrNull, 'a number'],
  [`models.${model}.livePoints`]: [isNumber, 'a number'],
  [`models.${model}.method`]: [isString, 'a string'],
  [`models.${model}.iterations`]: [isNumber, 'a number'],
  [`models.${model}.evaluations`]: [isNumber, 'a number'],
  [`models.${model}.efficiency`]: [isNumber, 'a number'],
  [`models.${model}.insertionRankPValue`]: [isNumberOrNull, 'a number'],
  [`models.${model}.insertionRankWarning`]: [isBoolean, 'true or false'],
  [`models.${model}.bestLnLikelihood`]: [isNumberOrNull, 'a number'],
  [`models.${model}.parameters`]: [isList, 'a list of parameter summaries'],
});

const SUMMARY_SHAPE: Record<string, [Check, string]> = {
  kind: [(v) => v === 'comparison', '"comparison" (a summary written by `arcsift compare`)'],
  data: [isMapping, 'a mapping of the observed data files'],
  'data.image': [isString, 'the path of the observed image'],
  models: [isMapping, 'a mapping with smooth and perturbed'],
  ...MODEL_SHAPE('smooth'),
  ...MODEL_SHAPE('perturbed'),
  bayesFactor: [isMapping, 'a mapping'],
  'bayesFactor.lnBayesFactor': [isNumber, 'a number'],
  'bayesFactor.lnBayesFactorError': [isNumber, 'a number'],
  'bayesFactor.reading': [isString, 'a string'],
  'bayesFactor.kassRafteryGrade': [isString, 'a string'],
  'bayesFactor.significance': [isString, 'a string'],
  'bayesFactor.pValueBound': [isNumberOrNull, 'a number or null'],
  'bayesFactor.sigmaBound': [isNumberOrNull, 'a number or null'],
  'bayesFactor.perturberFavoured': [isBoolean, 'true or false'],
  'bayesFactor.favouredAbove': [isNumber, 'a number'],
  perturbers: [isList, 'a list of perturber summaries'],
  priors: [isMapping, 'a mapping with smooth and perturbed'],
  'priors.smooth': [isList, 'a list of priors'],
  'priors.perturbed': [isList, 'a list of priors'],
  amplitudePrior: [isString, 'a string'],
  caution: [isString, 'a string'],
};

/** Reads and checks summary.json of a comparison run folder. */
export function readSummary(file: string): ComparisonSummary {
  const json = readJson(file);
  if (!isMapping(json)) throw new InputError(expectedFound('a mapping (the summary of a comparison)', json), { file });
  requireShape(json, file, SUMMARY_SHAPE);
  const summary = json as ComparisonSummary;
  summary.perturbers.forEach((p, k) => requireShape(p, file, {
    key: [isString, 'a string'],
    kind: [isString, 'a string'],
    'log10Mass.median': [isNumber, 'a number'],
    'log10Mass.interval68.lower': [isNumber, 'a number'],
    'log10Mass.interval95.upper': [isNumber, 'a number'],
    log10MassUpperLimit95: [isNumber, 'a number'],
    'centerXArcsec.median': [isNumber, 'a number'],
    'centerYArcsec.median': [isNumber, 'a number'],
  }, `perturbers[${k}].`));
  return summary;
}

/** Reads and checks one corner.json (the shape of `cornerData`). */
export function readCornerData(file: string): CornerData {
  const json = readJson(file);
  requireShape(json, file, { parameters: [isList, 'a list of parameters'], pairs: [isList, 'a list of parameter pairs'] });
  const data = json as CornerData;
  const dim = data.parameters.length;
  data.parameters.forEach((p, k) => {
    requireShape(p, file, {
      name: [isString, 'a string'],
      unit: [isString, 'a string'],
      range: [(v) => isList(v) && (v as Json[]).length === 2, 'two numbers'],
      edges: [(v) => isList(v) && (v as Json[]).length >= 2, 'a list of bin edges'],
      densities: [(v) => isList(v) && (v as Json[]).length === (p.edges?.length ?? 0) - 1, 'one density per bin (one fewer than the edges)'],
      'summary.median': [isNumber, 'a number'],
      'summary.interval68.lower': [isNumber, 'a number'],
      'summary.interval95.upper': [isNumber, 'a number'],
    }, `parameters[${k}].`);
  });
  data.pairs.forEach((pair, k) => {
    const ok = Number.isInteger(pair.xIndex) && Number.isInteger(pair.yIndex) && pair.xIndex >= 0 && pair.xIndex < pair.yIndex && pair.yIndex < dim
      && isList(pair.xEdges) && isList(pair.yEdges) && isList(pair.densities)
      && pair.densities.length === (pair.xEdges.length - 1) * (pair.yEdges.length - 1);
    if (!ok) throw new InputError(`expected indices 0 <= xIndex < yIndex < ${dim} and (x bins) * (y bins) densities, found ${describeValue(pair)} that does not fit`, { file, key: `pairs[${k}]` });
  });
  return data;
}

/** Reads truth.json written by `arcsift simulate`. */
export function readTruth(file: string): TruthRecord {
  const json = readJson(file);
  requireShape(json, file, { parameters: [isList, 'a list of {name, value, unit}'] });
  const record = json as { title?: unknown; parameters: Json[]; perturbers?: unknown };
  const parameters = record.parameters.map((p, k): TruthParameter => {
    requireShape(p, file, { name: [isString, 'a string'], value: [isNumber, 'a number'] }, `parameters[${k}].`);
    const entry = p as { name: string; value: number; unit?: unknown };
    return { name: entry.name, value: entry.value, unit: typeof entry.unit === 'string' ? entry.unit : '' };
  });
  const number = (v: unknown): number | undefined => (typeof v === 'number' ? v : undefined);
  const perturbers = (Array.isArray(record.perturbers) ? record.perturbers : [])
    .filter((p): p is Record<string, unknown> => isMapping(p) && typeof (p as Record<string, unknown>).key === 'string')
    .map((p): TruthPerturber => ({ key: p.key as string, massM200Solar: number(p.massM200Solar), totalMassSolar: number(p.totalMassSolar) }));
  return { file, title: typeof record.title === 'string' ? record.title : undefined, parameters, perturbers };
}

/**
 * Where a path recorded in summary.json is now: as written (relative to the working directory),
 * else relative to the run folder's parent or grandparent (a run moved together with its data).
 */
export function locate(recorded: string, folder: string): string | null {
  if (existsSync(recorded)) return recorded;
  if (isAbsolute(recorded)) return null;
  for (const base of [resolve(folder, '..'), resolve(folder, '..', '..')]) {
    const candidate = join(base, recorded);
    if (existsSync(candidate)) return candidate;
  }
  return null;
}

/** `locate` for a file that may end in an HDU choice (`obs.fits[SCI]`), which is kept. */
function locateWithHdu(recorded: string, folder: string): string | null {
  const match = /^(.*)(\[[^[\]]*\])$/.exec(recorded);
  if (match === null || existsSync(recorded)) return locate(recorded, folder);
  const found = locate(match[1], folder);
  return found === null ? null : `${found}${match[2]}`;
}

/** The observed data files a summary names, as found from here, and truth.json beside the image when present. */
export function locateRunData(
  data: { readonly image: string; readonly noise?: string; readonly weight?: string; readonly psf?: string; readonly mask?: string },
  folder: string, summaryFile: string, notices: string[],
): { dataFiles: Record<'image' | 'noise' | 'psf' | 'mask', string | null>; truth: TruthRecord | null } {
  const dataFiles = {} as Record<'image' | 'noise' | 'psf' | 'mask', string | null>;
  for (const key of ['image', 'noise', 'psf', 'mask'] as const) {
    // The noise slot holds the weight map when the run's noise came from one; an HDU choice stays.
    const recorded = key === 'noise' ? data.noise ?? data.weight : data[key];
    dataFiles[key] = recorded === undefined ? null : locateWithHdu(recorded, folder);
    if (recorded !== undefined && dataFiles[key] === null) notices.push(`observed ${key} ${recorded} (named in ${summaryFile}) not found`);
  }
  const truthFile = dataFiles.image === null ? null : join(dirname(dataFiles.image), 'truth.json');
  const truth = truthFile !== null && existsSync(truthFile) ? readTruth(truthFile) : null;
  return { dataFiles, truth };
}

/** Reads a comparison run folder: summary.json (required), both corner.json files and truth.json when present. */
export function readRunFolder(folder: string): RunFolder {
  const summaryFile = join(folder, 'summary.json');
  const summary = readSummary(summaryFile);
  const notices: string[] = [];
  const corners = {} as Record<ModelName, CornerData | null>;
  for (const model of MODEL_NAMES) {
    const file = join(folder, model, 'corner.json');
    corners[model] = existsSync(file) ? readCornerData(file) : null;
    if (corners[model] === null) notices.push(`${file} not found: the ${model} model's posterior figures are left out`);
  }
  const { dataFiles, truth } = locateRunData(summary.data, folder, summaryFile, notices);
  return { folder, summaryFile, summary, corners, truth, dataFiles, notices };
}
