import { InputError } from '../errors.js';
import { FITS_CARD_BYTES } from './fitsBlock.js';
import type { HeaderCard, ValueCard } from './headerCard.js';

const KEYWORD_PATTERN = /^[A-Z0-9_-]{0,8}$/;
const PRINTABLE_PATTERN = /^[\x20-\x7e]*$/;
/** Bytes 9-80 of a commentary record. */
const COMMENTARY_TEXT_LENGTH = FITS_CARD_BYTES - 8;
/** Longest quoted piece before the '&' on a record that is continued: 80 - 10 - 2 quotes - '&'. */
const CONTINUED_PIECE_LENGTH = 67;
/** Longest comment on a CONTINUE  '&' / record. */
const CONTINUED_COMMENT_LENGTH = FITS_CARD_BYTES - "CONTINUE  '&' / ".length;

function cardError(card: HeaderCard, source: string | undefined, problem: string): InputError {
  return new InputError(`cannot write header card: ${problem}`, { file: source, key: card.keyword === '' ? undefined : card.keyword });
}

function requirePrintable(card: HeaderCard, source: string | undefined, what: string, text: string): void {
  if (!PRINTABLE_PATTERN.test(text)) {
    throw cardError(card, source, `${what} ${JSON.stringify(text)} holds characters outside printable ASCII (0x20-0x7E)`);
  }
}

/** Floating-point constant of FITS Standard 4.0 sec. 4.2.4: the shortest text that reads back to the same double. */
export function formatFloatValue(value: number): string {
  if (Object.is(value, -0)) return '-0.0';
  const candidates = [String(value), value.toExponential()].map((text) => {
    const [mantissa, exponent] = text.split('e');
    const withPoint = mantissa.includes('.') ? mantissa : `${mantissa}.0`;
    return exponent === undefined ? withPoint : `${withPoint}E${exponent}`;
  });
  return candidates[0].length <= candidates[1].length ? candidates[0] : candidates[1];
}

function formatIntegerValue(value: number): string {
  return BigInt(value).toString();
}

function numberProblem(value: number, integer: boolean): string | undefined {
  if (!Number.isFinite(value)) return `${value} cannot stand in a FITS header (no NaN or infinite values)`;
  if (integer && !Number.isInteger(value)) return `${value} is not an integer`;
  return undefined;
}

/** The value field text of a non-string value card, right-justified to byte 30 by the caller. */
function valueText(card: Exclude<ValueCard, { kind: 'string' }>, source: string | undefined): string {
  const check = (value: number, integer: boolean): void => {
    const problem = numberProblem(value, integer);
    if (problem !== undefined) throw cardError(card, source, problem);
  };
  switch (card.kind) {
    case 'logical':
      return card.value ? 'T' : 'F';
    case 'integer':
      check(card.value, true);
      return formatIntegerValue(card.value);
    case 'float':
      check(card.value, false);
      return formatFloatValue(card.value);
    case 'complexInteger':
      check(card.value.re, true);
      check(card.value.im, true);
      return `(${formatIntegerValue(card.value.re)}, ${formatIntegerValue(card.value.im)})`;
    case 'complexFloat':
      check(card.value.re, false);
      check(card.value.im, false);
      return `(${formatFloatValue(card.value.re)}, ${formatFloatValue(card.value.im)})`;
    case 'undefined':
      return '';
  }
}

/** Splits text at blanks into pieces of at most `length`; a word longer than that is cut. */
function wordChunks(text: string, length: number): string[] {
  if (text.length <= length) return [text];
  const chunks: string[] = [];
  let current: string | undefined;
  for (const word of text.split(' ')) {
    let rest = word;
    while (rest.length > length) {
      if (current !== undefined) chunks.push(current);
      chunks.push(rest.slice(0, length));
      rest = rest.slice(length);
      current = undefined;
    }
    if (current === undefined) current = rest;
    else if (current.length + 1 + rest.length <= length) current += ` ${rest}`;
    else {
      chunks.push(current);
      current = rest;
    }
  }
  if (current !== undefined) chunks.push(current);
  return chunks;
}

/** Splits a string so that each piece, with its quotes doubled, holds at most `length` characters. */
function stringPieces(value: string, length: number): string[] {
  const pieces: string[] = [];
  let current = '';
  for (const character of value) {
    const encoded = character === "'" ? "''" : character;
    if (current.length + encoded.length > length) {
      pieces.push(current);
      current = '';
    }
    current += encoded;
  }
  pieces.push(current);
  return pieces;
}

/**
 * A string too long for one record, in the long-string convention of FITS Standard 4.0 sec.
 * 4.2.1.2: pieces ending in '&' on the keyword record and CONTINUE records, the comment on the
 * last record when it fits, otherwise on further CONTINUE '&' / '' records.
 */
function longStringRecords(keyword: string, value: string, comment: string | undefined): string[] {
  const pieces = stringPieces(value, CONTINUED_PIECE_LENGTH);
  const records = pieces.map((piece, i) => `${i === 0 ? `${keyword.padEnd(8)}= ` : 'CONTINUE  '}'${piece}&'`);
  const last = `${records[records.length - 1].slice(0, -2)}'`;
  const lastWithComment = comment === undefined ? last : `${last} / ${comment}`;
  if (lastWithComment.length <= FITS_CARD_BYTES) {
    records[records.length - 1] = lastWithComment;
  } else if (comment !== undefined) {
    const chunks = wordChunks(comment, CONTINUED_COMMENT_LENGTH);
    chunks.forEach((chunk, i) => records.push(`CONTINUE  '${i === chunks.length - 1 ? '' : '&'}' / ${chunk}`));
  }
  return records;
}

/**
 * One logical card as 80-byte records (FITS Standard 4.0 sec. 4.1-4.2): fixed format, values
 * right-justified to byte 30 and strings opening in byte 11 padded to 8 characters, comments
 * after " / "; long strings use CONTINUE records and long commentary text several records.
 */
export function formatHeaderCard(card: HeaderCard, source?: string): string[] {
  if (!KEYWORD_PATTERN.test(card.keyword) || (card.keyword === '' && card.kind !== 'commentary')) {
    throw cardError(card, source, `keyword ${JSON.stringify(card.keyword)} must be 1 to 8 characters of A-Z, 0-9, '-' and '_'`);
  }
  if (card.kind === 'commentary') {
    requirePrintable(card, source, 'text', card.text);
    const texts = wordChunks(card.text, COMMENTARY_TEXT_LENGTH);
    return texts.map((text) => `${card.keyword.padEnd(8)}${text}`.padEnd(FITS_CARD_BYTES));
  }
  if (card.comment !== undefined) requirePrintable(card, source, 'comment', card.comment);
  const head = `${card.keyword.padEnd(8)}= `;
  const tail = card.comment === undefined ? '' : ` / ${card.comment}`;
  let records: string[];
  if (card.kind === 'string') {
    requirePrintable(card, source, 'value', card.value);
    const encoded = card.value.replace(/'/g, "''");
    const quoted = card.value === '' ? "''" : `'${encoded.padEnd(8)}'`;
    const single = `${head}${quoted.padEnd(20)}${tail}`;
    records = single.length <= FITS_CARD_BYTES ? [single] : longStringRecords(card.keyword, card.value, card.comment);
  } else {
    const single = `${head}${valueText(card, source).padStart(20)}${tail}`;
    if (single.length > FITS_CARD_BYTES) {
      const what = card.comment === undefined ? 'the value' : 'the value and comment';
      throw cardError(card, source, `${what} need ${single.length} bytes, more than the 80 of a card`);
    }
    records = [single];
  }
  return records.map((record) => record.padEnd(FITS_CARD_BYTES));
}
