/**
 * The one error type for user mistakes: a bad config key, a wrong image size, NaN pixels,
 * inverted prior bounds, an unreadable file. The CLI prints its message without a stack
 * trace and exits with status 2. Anything else is an internal fault (exit status 1).
 */
export interface InputErrorPlace {
  /** File the problem was found in, when there is one. */
  readonly file?: string;
  /** Dotted key path inside a config, e.g. `source.light[0].sersicIndex`. */
  readonly key?: string;
  /** Pixel as [column, row], 0-based, when the problem is one pixel. */
  readonly pixel?: readonly [number, number];
}

/** A pixel as messages name it: `pixel (3, 1) (column, row, counted from 0)`. */
export function pixelText(column: number, row: number): string {
  return `pixel (${column}, ${row}) (column, row, counted from 0)`;
}

/** The "file, key K, pixel (i, j) (...): " prefix of a message about `place`; empty when the place is unknown. */
export function placePrefix(place: InputErrorPlace): string {
  const where: string[] = [];
  if (place.file !== undefined) where.push(place.file);
  if (place.key !== undefined) where.push(`key ${place.key}`);
  if (place.pixel !== undefined) where.push(pixelText(place.pixel[0], place.pixel[1]));
  return where.length > 0 ? `${where.join(', ')}: ` : '';
}

export class InputError extends Error {
  readonly place: InputErrorPlace;

  constructor(message: string, place: InputErrorPlace = {}) {
    super(`${placePrefix(place)}${message}`);
    this.name = 'InputError';
    this.place = place;
  }

  /** The message without the place prefix the constructor added. */
  get bareMessage(): string {
    const prefix = placePrefix(this.place);
    return this.message.startsWith(prefix) ? this.message.slice(prefix.length) : this.message;
  }
}

/** Builds the "expected ..., found ..." phrase used by every validation message. */
export function expectedFound(expected: string, found: unknown): string {
  return `expected ${expected}, found ${describeValue(found)}`;
}

export function describeValue(value: unknown): string {
  if (value === undefined) return 'nothing';
  if (value === null) return 'null';
  if (typeof value === 'string') return JSON.stringify(value);
  if (typeof value === 'number' || typeof value === 'boolean') return String(value);
  if (Array.isArray(value)) return `a list of ${value.length}`;
  return 'a mapping';
}

/**
 * A run stopped on request (SIGTERM or SIGINT) after writing its last checkpoints: not a fault.
 * The CLI says how to resume and exits with status 4.
 */
export class RunInterrupted extends Error {
  readonly checkpoints: readonly string[];

  constructor(checkpoints: readonly string[]) {
    super(`stopped on request; checkpoints: ${checkpoints.length === 0 ? 'none' : checkpoints.join(', ')}`);
    this.name = 'RunInterrupted';
    this.checkpoints = checkpoints;
  }
}

/**
 * arcsift's exit statuses: 0 a finished run; 1 an internal fault; 2 a user mistake (nothing was
 * run, or nothing half-written is left); 3 a run a limit cut short (its summary says
 * finished: false); 4 a run stopped by SIGTERM or SIGINT after writing its last checkpoint.
 */
export const EXIT_STATUS = Object.freeze({ finished: 0, internalFault: 1, userMistake: 2, unfinished: 3, interrupted: 4 });
