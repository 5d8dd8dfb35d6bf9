import { createHash } from 'node:crypto';
import { existsSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import { readConfigFile } from '../config/readConfigFile.js';
import type { CutoutBox } from '../data/cutoutBox.js';
import type { ObservedData } from '../data/observedData.js';
import { InputError } from '../errors.js';
import { parseFitsLocator } from '../fits/fitsLocator.js';
import { fileSha256 } from '../io/fileSha256.js';
import { packageVersion } from '../io/packageVersion.js';
import { configHash } from './configHash.js';

/** One data file of a run: its bytes' sha256 and the HDU named (`SCI`, `2`; null: the first 2-D image). */
export interface DataFileIdentity {
  readonly file: string;
  readonly sha256: string;
  readonly hdu: string | null;
}

/**
 * What a run was made from: the arcsift version, the config (its file's sha256 and its content
 * as parsed), every data file (sha256 and HDU), the cut-out, the PSF oversampling and the
 * seed. Every checkpoint stores it, and a resume refuses a run whose identity differs.
 */
export interface RunIdentity {
  readonly arcsiftVersion: string;
  readonly configSha256: string;
  /** The config as parsed: a change of comments or layout alone changes the sha256, not this. */
  readonly config: unknown;
  /**
   * sha256 of the validated model config the sampler ran (a vetting candidate's window, the
   * copies of a perturber-count comparison are made from the file's config, which may not show them).
   */
  readonly modelSha256: string;
  /** Keyed by role: image, noise or weight, psf, mask; configPsf for a PSF file the config names. */
  readonly data: Readonly<Record<string, DataFileIdentity>>;
  readonly cutout: CutoutBox | null;
  readonly psfOversampling: number | null;
  readonly seed: number;
}

/** The config's content as plain JSON: the file's, or the validated config when there is no file. */
function configContent(config: ArcsiftConfig): unknown {
  const data = existsSync(config.file) ? readConfigFile(config.file) : { ...config, file: undefined };
  return JSON.parse(JSON.stringify(data ?? null)) as unknown;
}

/** The run identity of a run of `config` on `data` with `seed`. */
export function runIdentity(config: ArcsiftConfig, data: ObservedData, seed: number): RunIdentity {
  const files: Record<string, DataFileIdentity> = {};
  for (const [role, text] of Object.entries(data.files) as [keyof ObservedData['files'], string][]) {
    const sha256 = data.fileSha256?.[role];
    if (sha256 === undefined) continue;
    const locator = parseFitsLocator(text);
    files[role] = { file: text, sha256, hdu: locator.path === text ? null : text.slice(locator.path.length + 1, -1) };
  }
  const psf = config.observation.psf;
  if (data.files.psf === undefined && psf?.shape === 'file') {
    const path = resolve(dirname(config.file), psf.path);
    if (existsSync(path)) files.configPsf = { file: path, sha256: fileSha256(path), hdu: null };
  }
  return {
    arcsiftVersion: packageVersion(),
    configSha256: configHash(config),
    config: configContent(config),
    modelSha256: createHash('sha256').update(JSON.stringify({ ...config, file: undefined })).digest('hex'),
    data: files,
    cutout: data.cutout ?? null,
    psfOversampling: data.psfOversampled?.factor ?? null,
    seed,
  };
}

const SHOWN = 3;
const short = (value: unknown): string => {
  const text = JSON.stringify(value) ?? 'nothing';
  return text.length > 60 ? `${text.slice(0, 57)}...` : text;
};

/** The key paths where two JSON values differ, as `path: was X, is Y`. */
function jsonChanges(was: unknown, is: unknown, path: string, out: string[]): void {
  const mapping = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
  if (mapping(was) && mapping(is)) {
    for (const key of new Set([...Object.keys(was), ...Object.keys(is)])) {
      jsonChanges(was[key], is[key], path === '' ? key : `${path}.${key}`, out);
    }
  } else if (Array.isArray(was) && Array.isArray(is) && was.length === is.length) {
    was.forEach((item, k) => jsonChanges(item, is[k], `${path}[${k}]`, out));
  } else if (JSON.stringify(was) !== JSON.stringify(is)) {
    const where = path === '' ? 'the whole config' : path;
    out.push(was === undefined ? `${where} added (${short(is)})` : is === undefined ? `${where} removed (was ${short(was)})` : `${where} was ${short(was)}, is ${short(is)}`);
  }
}

/** The differences between the identity a checkpoint stored and this run's, in words; empty when none. */
export function identityChanges(stored: unknown, current: RunIdentity): string[] {
  if (typeof stored !== 'object' || stored === null || !('configSha256' in stored)) {
    return ['the checkpoint records no config, data or seed (written by an earlier arcsift), so it cannot be matched to this run'];
  }
  const was = stored as RunIdentity;
  const changes: string[] = [];
  if (was.arcsiftVersion !== current.arcsiftVersion) {
    changes.push(`it was written by arcsift ${was.arcsiftVersion}, this is arcsift ${current.arcsiftVersion}`);
  }
  const configChanges: string[] = [];
  jsonChanges(was.config, current.config, '', configChanges);
  if (configChanges.length > 0) {
    const more = configChanges.length > SHOWN ? ` and ${configChanges.length - SHOWN} more` : '';
    changes.push(`the config changed: ${configChanges.slice(0, SHOWN).join('; ')}${more}`);
  } else if (was.modelSha256 !== current.modelSha256) {
    changes.push('the model made from the config differs (another flag\'s window, map prior or perturber count)');
  }
  for (const role of new Set([...Object.keys(was.data ?? {}), ...Object.keys(current.data)])) {
    const before = was.data?.[role];
    const now = current.data[role];
    if (before === undefined) changes.push(`the data gained a ${role} file (${now.file})`);
    else if (now === undefined) changes.push(`the data lost its ${role} file (${before.file})`);
    else if (before.sha256 !== now.sha256) changes.push(`the ${role} file's bytes changed (${now.file}: sha256 ${before.sha256.slice(0, 12)}... then, ${now.sha256.slice(0, 12)}... now)`);
    else if (before.hdu !== now.hdu) changes.push(`the ${role} is another HDU (${before.hdu ?? 'the first image'} then, ${now.hdu ?? 'the first image'} now)`);
  }
  if (JSON.stringify(was.cutout ?? null) !== JSON.stringify(current.cutout)) {
    changes.push(`the cut-out changed (${short(was.cutout ?? null)} then, ${short(current.cutout)} now)`);
  }
  if ((was.psfOversampling ?? null) !== current.psfOversampling) {
    changes.push(`the PSF oversampling changed (${String(was.psfOversampling ?? null)} then, ${String(current.psfOversampling)} now)`);
  }
  if (was.seed !== current.seed) changes.push(`the seed was ${String(was.seed)}, is ${current.seed}`);
  return changes;
}

/**
 * The samplers' checkIdentity hook for a run of identity `current`: an InputError naming the
 * checkpoint and every change when the stored identity differs.
 */
export function refuseAnotherRun(current: RunIdentity): (stored: unknown, file: string) => void {
  return (stored, file) => {
    const changes = identityChanges(stored, current);
    if (changes.length === 0) return;
    throw new InputError(
      `cannot resume: the checkpoint belongs to another set-up: ${changes.join('; ')}. ` +
        'Resume with the config, data and seed it was made with, or start afresh in another --out',
      { file },
    );
  };
}
