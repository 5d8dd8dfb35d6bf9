/**
 * One logical FITS header card (keyword record), FITS Standard 4.0 sec. 4.1-4.2. A string long
 * enough to need CONTINUE records is still one card here; reading joins the records and writing
 * splits them again.
 */
export interface ComplexValue {
  readonly re: number;
  readonly im: number;
}

interface ValueCardBase {
  /** Upper-case keyword, at most 8 characters of A-Z, 0-9, '-' and '_'. */
  readonly keyword: string;
  /** Text after the '/' with surrounding blanks removed; absent when there is none. */
  readonly comment?: string;
}

export interface LogicalCard extends ValueCardBase {
  readonly kind: 'logical';
  readonly value: boolean;
}

/** Integer-valued card; values beyond 2^53 in magnitude are held to double precision only. */
export interface IntegerCard extends ValueCardBase {
  readonly kind: 'integer';
  readonly value: number;
}

export interface FloatCard extends ValueCardBase {
  readonly kind: 'float';
  readonly value: number;
}

/** String value without its quotes, doubled quotes undone and trailing blanks removed. */
export interface StringCard extends ValueCardBase {
  readonly kind: 'string';
  readonly value: string;
}

export interface ComplexIntegerCard extends ValueCardBase {
  readonly kind: 'complexInteger';
  readonly value: ComplexValue;
}

export interface ComplexFloatCard extends ValueCardBase {
  readonly kind: 'complexFloat';
  readonly value: ComplexValue;
}

/** A keyword with the value indicator and a blank value field: its value is undefined. */
export interface UndefinedCard extends ValueCardBase {
  readonly kind: 'undefined';
}

/**
 * A keyword record without a value: COMMENT, HISTORY, the blank keyword, or any keyword whose
 * bytes 9-10 are not "= " (FITS Standard 4.0 sec. 4.1.2.3). `text` is bytes 9-80 without
 * trailing blanks.
 */
export interface CommentaryCard {
  readonly keyword: string;
  readonly kind: 'commentary';
  readonly text: string;
}

export type ValueCard =
  | LogicalCard
  | IntegerCard
  | FloatCard
  | StringCard
  | ComplexIntegerCard
  | ComplexFloatCard
  | UndefinedCard;

export type HeaderCard = ValueCard | CommentaryCard;

export type HeaderCardKind = HeaderCard['kind'];

function withComment<T extends object>(card: T, comment: string | undefined): T & { comment?: string } {
  return comment === undefined || comment === '' ? card : { ...card, comment };
}

export function logicalCard(keyword: string, value: boolean, comment?: string): LogicalCard {
  return withComment({ keyword: keyword.toUpperCase(), kind: 'logical' as const, value }, comment);
}

export function integerCard(keyword: string, value: number, comment?: string): IntegerCard {
  return withComment({ keyword: keyword.toUpperCase(), kind: 'integer' as const, value }, comment);
}

export function floatCard(keyword: string, value: number, comment?: string): FloatCard {
  return withComment({ keyword: keyword.toUpperCase(), kind: 'float' as const, value }, comment);
}

export function stringCard(keyword: string, value: string, comment?: string): StringCard {
  return withComment({ keyword: keyword.toUpperCase(), kind: 'string' as const, value }, comment);
}

export function complexIntegerCard(keyword: string, re: number, im: number, comment?: string): ComplexIntegerCard {
  return withComment({ keyword: keyword.toUpperCase(), kind: 'complexInteger' as const, value: { re, im } }, comment);
}

export function complexFloatCard(keyword: string, re: number, im: number, comment?: string): ComplexFloatCard {
  return withComment({ keyword: keyword.toUpperCase(), kind: 'complexFloat' as const, value: { re, im } }, comment);
}

export function undefinedCard(keyword: string, comment?: string): UndefinedCard {
  return withComment({ keyword: keyword.toUpperCase(), kind: 'undefined' as const }, comment);
}

/** A commentary card; `keyword` is COMMENT, HISTORY or '' (blank keyword) in ordinary use. */
export function commentaryCard(keyword: string, text: string): CommentaryCard {
  return { keyword: keyword.toUpperCase(), kind: 'commentary', text };
}

export function commentCard(text: string): CommentaryCard {
  return commentaryCard('COMMENT', text);
}

export function historyCard(text: string): CommentaryCard {
  return commentaryCard('HISTORY', text);
}

export function blankKeywordCard(text: string): CommentaryCard {
  return commentaryCard('', text);
}
