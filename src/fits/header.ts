import { InputError } from '../errors.js';
import type { ComplexValue, HeaderCard, HeaderCardKind, UndefinedCard, ValueCard } from './headerCard.js';

type DefinedCard = Exclude<ValueCard, UndefinedCard>;

/**
 * The cards of one FITS header in file order, with typed lookups. Keywords are matched without
 * regard to case; a keyword that appears more than once answers with its first value card, as
 * FITS Standard 4.0 sec. 4.1.2.3 leaves repeated values indeterminate. A typed lookup answers
 * `undefined` when the keyword is absent or its value is undefined, and throws InputError
 * (naming the file and keyword) when the value has another type; the require* lookups also
 * throw when the value is missing.
 */
export class FitsHeader {
  readonly cards: readonly HeaderCard[];
  /** File the header came from, for error messages; absent for headers built in memory. */
  readonly source?: string;

  constructor(cards: readonly HeaderCard[], source?: string) {
    this.cards = cards;
    if (source !== undefined) this.source = source;
  }

  /** The first value card with this keyword (commentary cards are not looked up here). */
  find(keyword: string): ValueCard | undefined {
    const wanted = keyword.toUpperCase();
    for (const card of this.cards) {
      if (card.kind !== 'commentary' && card.keyword === wanted) return card;
    }
    return undefined;
  }

  has(keyword: string): boolean {
    return this.find(keyword) !== undefined;
  }

  /** Integer or float value. */
  getNumber(keyword: string): number | undefined {
    const card = this.typed(keyword, ['integer', 'float'], 'a number');
    return card === undefined ? undefined : (card.value as number);
  }

  /** Integer value (a float card is a type error even when it holds a whole number). */
  getInteger(keyword: string): number | undefined {
    const card = this.typed(keyword, ['integer'], 'an integer');
    return card === undefined ? undefined : (card.value as number);
  }

  getString(keyword: string): string | undefined {
    const card = this.typed(keyword, ['string'], 'a string');
    return card === undefined ? undefined : (card.value as string);
  }

  getLogical(keyword: string): boolean | undefined {
    const card = this.typed(keyword, ['logical'], 'T or F');
    return card === undefined ? undefined : (card.value as boolean);
  }

  /** Complex value; an integer or float value counts as a complex number with zero imaginary part. */
  getComplex(keyword: string): ComplexValue | undefined {
    const card = this.typed(keyword, ['complexInteger', 'complexFloat', 'integer', 'float'], 'a complex number');
    if (card === undefined) return undefined;
    return typeof card.value === 'number' ? { re: card.value, im: 0 } : (card.value as ComplexValue);
  }

  /** The comment of the first value card with this keyword. */
  getComment(keyword: string): string | undefined {
    return this.find(keyword)?.comment;
  }

  /** The texts of every commentary card with this keyword ('COMMENT', 'HISTORY' or '' for blank), in order. */
  commentary(keyword: string): string[] {
    const wanted = keyword.toUpperCase();
    const texts: string[] = [];
    for (const card of this.cards) {
      if (card.kind === 'commentary' && card.keyword === wanted) texts.push(card.text);
    }
    return texts;
  }

  requireNumber(keyword: string): number {
    return this.required(keyword, this.getNumber(keyword), 'a number');
  }

  requireInteger(keyword: string): number {
    return this.required(keyword, this.getInteger(keyword), 'an integer');
  }

  requireString(keyword: string): string {
    return this.required(keyword, this.getString(keyword), 'a string');
  }

  requireLogical(keyword: string): boolean {
    return this.required(keyword, this.getLogical(keyword), 'T or F');
  }

  private required<T>(keyword: string, value: T | undefined, expected: string): T {
    if (value !== undefined) return value;
    const found = this.find(keyword) === undefined ? 'no such keyword' : 'an undefined value';
    throw new InputError(`header value expected ${expected}, found ${found}`, { file: this.source, key: keyword.toUpperCase() });
  }

  private typed(keyword: string, kinds: readonly HeaderCardKind[], expected: string): DefinedCard | undefined {
    const card = this.find(keyword);
    if (card === undefined || card.kind === 'undefined') return undefined;
    if (!kinds.includes(card.kind)) {
      throw new InputError(`header value expected ${expected}, found ${describeCard(card)}`, {
        file: this.source,
        key: card.keyword,
      });
    }
    return card;
  }
}

function describeCard(card: ValueCard): string {
  switch (card.kind) {
    case 'logical':
      return `the logical ${card.value ? 'T' : 'F'}`;
    case 'integer':
      return `the integer ${card.value}`;
    case 'float':
      return `the float ${card.value}`;
    case 'string':
      return `the string '${card.value}'`;
    case 'complexInteger':
    case 'complexFloat':
      return `the complex (${card.value.re}, ${card.value.im})`;
    case 'undefined':
      return 'an undefined value';
  }
}
