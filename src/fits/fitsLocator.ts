import { existsSync } from 'node:fs';
import { InputError } from '../errors.js';
import type { FitsImageSelection } from './readFits.js';

/** A FITS file and the HDU to read from it, as written on a command line or in a config. */
export interface FitsLocator {
  readonly path: string;
  readonly selection: FitsImageSelection;
  /** The text as written, for messages and run records. */
  readonly text: string;
}

const BRACKETED = /^(.+)\[([^[\]]*)\]$/;

/**
 * Reads arcsift's way of naming one HDU of a file: `PATH` (the first HDU holding a 2-D image),
 * `PATH[N]` (HDU number N, 0 = primary), `PATH[NAME]` (the HDU whose EXTNAME is NAME, matched
 * without regard to case) or `PATH[NAME,V]` (with EXTVER V). A path that exists as written is
 * taken as a plain path even when it ends in brackets.
 */
export function parseFitsLocator(text: string): FitsLocator {
  const match = BRACKETED.exec(text);
  if (match === null || existsSync(text)) return { path: text, selection: {}, text };
  const [, path, inside] = match;
  const parts = inside.split(',').map((part) => part.trim());
  const fail = (why: string): never => {
    throw new InputError(
      `HDU choice [${inside}]: ${why}; write FILE[N] (HDU number, 0 = primary), FILE[NAME] (EXTNAME) or FILE[NAME,VERSION] (EXTNAME and EXTVER)`,
      { file: path },
    );
  };
  if (parts.length > 2 || parts[0] === '') fail('expected an HDU number or an EXTNAME inside the brackets');
  if (/^\d+$/.test(parts[0])) {
    if (parts.length === 2) fail('an HDU number takes no EXTVER');
    return { path, selection: { hdu: Number(parts[0]) }, text };
  }
  if (parts.length === 2 && !/^\d+$/.test(parts[1])) fail(`expected a whole-number EXTVER after the comma, found "${parts[1]}"`);
  return { path, selection: parts.length === 2 ? { hdu: parts[0], extver: Number(parts[1]) } : { hdu: parts[0] }, text };
}
