import { InputError } from '../errors.js';
import type { CommentaryCard, ComplexValue, HeaderCard } from './headerCard.js';

/** Where a record sits, for error messages: file, HDU index (0 = primary) and record index in that header. */
export interface CardPlace {
  readonly source?: string;
  readonly hduIndex: number;
  readonly cardIndex: number;
}

/** Commentary keywords whose bytes 9-80 are text even when they hold "= " (FITS Standard 4.0 sec. 4.4.2.4). */
const COMMENTARY_KEYWORDS: ReadonlySet<string> = new Set(['COMMENT', 'HISTORY', '', 'CONTINUE']);

const KEYWORD_PATTERN = /^[A-Za-z0-9_-]*$/;
// Integer and floating-point constants of FITS Standard 4.0 sec. 4.2.3-4.2.4 ('D' marks a double-precision
// exponent); lower-case exponent letters are accepted as common practice.
const INTEGER_PATTERN = /^[+-]?\d+$/;
const FLOAT_PATTERN = /^[+-]?(?:\d+\.\d*|\.\d+|\d+)(?:[EeDd][+-]?\d+)?$/;
const COMPLEX_PATTERN = /^\(\s*([^,\s]+)\s*,\s*([^)\s]+)\s*\)$/;

type ParsedNumber = { readonly kind: 'integer' | 'float'; readonly value: number };

type ParsedValue =
  | { readonly kind: 'logical'; readonly value: boolean }
  | ParsedNumber
  | { readonly kind: 'string'; readonly value: string }
  | { readonly kind: 'complexInteger' | 'complexFloat'; readonly value: ComplexValue }
  | { readonly kind: 'undefined' };

/** A value field (bytes 11-80) read into a value and an optional comment, or the reason it cannot be read. */
export type ValueFieldReading =
  | { readonly ok: true; readonly value: ParsedValue; readonly comment?: string }
  | { readonly ok: false; readonly problem: string };

function parseNumber(token: string): ParsedNumber | undefined {
  if (INTEGER_PATTERN.test(token)) return { kind: 'integer', value: Number(token) };
  if (FLOAT_PATTERN.test(token)) return { kind: 'float', value: Number(token.replace(/[Dd]/, 'E')) };
  return undefined;
}

function commentFrom(rest: string): string | undefined {
  const comment = rest.trim();
  return comment === '' ? undefined : comment;
}

function reading(value: ParsedValue, comment: string | undefined): ValueFieldReading {
  return comment === undefined ? { ok: true, value } : { ok: true, value, comment };
}

/**
 * Character string constant, FITS Standard 4.0 sec. 4.2.1.1: quotes doubled inside, trailing
 * blanks not significant, a string of blanks is one blank, '' is the null string.
 */
function parseQuoted(field: string, open: number): ValueFieldReading {
  let text = '';
  let i = open + 1;
  for (;;) {
    const quote = field.indexOf("'", i);
    if (quote < 0) return { ok: false, problem: 'the string value has no closing quote' };
    text += field.slice(i, quote);
    if (field[quote + 1] === "'") {
      text += "'";
      i = quote + 2;
      continue;
    }
    i = quote + 1;
    break;
  }
  const rest = field.slice(i).trimStart();
  if (rest !== '' && rest[0] !== '/') return { ok: false, problem: 'text after the closing quote is not a "/" comment' };
  const trimmed = text.trimEnd();
  const value = trimmed === '' && text.length > 0 ? ' ' : trimmed;
  return reading({ kind: 'string', value }, rest === '' ? undefined : commentFrom(rest.slice(1)));
}

/** Reads a value field: FITS Standard 4.0 sec. 4.2 (string, logical, integer, float, complex) or undefined. */
export function parseValueField(field: string): ValueFieldReading {
  const start = field.search(/\S/);
  if (start < 0) return { ok: true, value: { kind: 'undefined' } };
  if (field[start] === '/') return reading({ kind: 'undefined' }, commentFrom(field.slice(start + 1)));
  if (field[start] === "'") return parseQuoted(field, start);
  const slash = field.indexOf('/', start);
  const token = field.slice(start, slash < 0 ? undefined : slash).trim();
  const comment = slash < 0 ? undefined : commentFrom(field.slice(slash + 1));
  if (token === 'T' || token === 'F') return reading({ kind: 'logical', value: token === 'T' }, comment);
  const number = parseNumber(token);
  if (number !== undefined) return reading(number, comment);
  const complex = COMPLEX_PATTERN.exec(token);
  if (complex !== null) {
    const re = parseNumber(complex[1]);
    const im = parseNumber(complex[2]);
    if (re !== undefined && im !== undefined) {
      const kind = re.kind === 'integer' && im.kind === 'integer' ? 'complexInteger' : 'complexFloat';
      return reading({ kind, value: { re: re.value, im: im.value } }, comment);
    }
  }
  return {
    ok: false,
    problem: `value ${JSON.stringify(token)} is not a quoted string, T or F, an integer, a float or a complex (re, im)`,
  };
}

export function unreadableCard(record: string, place: CardPlace, keyword: string, problem: string): InputError {
  return new InputError(
    `unreadable header card ${place.cardIndex + 1} of HDU ${place.hduIndex}: ${problem}; the card reads ${JSON.stringify(record.trimEnd())}`,
    { file: place.source, key: keyword === '' ? undefined : keyword },
  );
}

/**
 * Reads one 80-character keyword record (FITS Standard 4.0 sec. 4.1.2): 'END', a value card, or a
 * commentary card. CONTINUE records come back as commentary; the header reader joins them.
 */
export function parseHeaderCard(record: string, place: CardPlace): HeaderCard | 'END' {
  const rawKeyword = record.slice(0, 8).trimEnd();
  if (!KEYWORD_PATTERN.test(rawKeyword)) {
    throw unreadableCard(record, place, '', `keyword ${JSON.stringify(rawKeyword)} has characters other than A-Z, 0-9, '-' and '_'`);
  }
  const keyword = rawKeyword.toUpperCase();
  if (keyword === 'END') return 'END';
  if (COMMENTARY_KEYWORDS.has(keyword) || record.slice(8, 10) !== '= ') {
    const card: CommentaryCard = { keyword, kind: 'commentary', text: record.slice(8).trimEnd() };
    return card;
  }
  const field = parseValueField(record.slice(10));
  if (!field.ok) throw unreadableCard(record, place, keyword, field.problem);
  const card = { keyword, ...field.value } as HeaderCard;
  return field.comment === undefined ? card : ({ ...card, comment: field.comment } as HeaderCard);
}
