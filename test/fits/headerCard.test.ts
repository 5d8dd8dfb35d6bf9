import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import {
  commentCard,
  complexFloatCard,
  complexIntegerCard,
  floatCard,
  formatFloatValue,
  formatHeaderCard,
  integerCard,
  logicalCard,
  parseHeader,
  parseHeaderCard,
  stringCard,
  undefinedCard,
  type HeaderCard,
} from '../../src/fits/index.js';
import { headerBytes, record, thrown } from './fitsTestBytes.js';

const place = { source: 'cards.fits', hduIndex: 0, cardIndex: 4 };

function parse(text: string): HeaderCard | 'END' {
  return parseHeaderCard(record(text), place);
}

function parseBlock(texts: readonly string[]): readonly HeaderCard[] {
  return parseHeader(headerBytes([...texts, 'END']), 0, 'cards.fits', 0).header.cards;
}

describe('reading header cards (FITS Standard 4.0 sec. 4.1-4.2)', () => {
  it('reads strings with doubled quotes, significant leading and insignificant trailing blanks', () => {
    // Sec. 4.2.1.1: O'HARA is written 'O''HARA'; leading blanks count, trailing blanks do not.
    expect(parse("OBSERVER= 'O''HARA'")).toEqual({ keyword: 'OBSERVER', kind: 'string', value: "O'HARA" });
    expect(parse("NAME    = '  ABC   '")).toEqual({ keyword: 'NAME', kind: 'string', value: '  ABC' });
    expect(parse("PATH    = 'a/b' / not a comment until after the quote")).toEqual({
      keyword: 'PATH',
      kind: 'string',
      value: 'a/b',
      comment: 'not a comment until after the quote',
    });
  });

  it('tells the null string, the empty string and the undefined value apart', () => {
    // Sec. 4.2.1.1 example: KEYWORD1= '' is null, KEYWORD2= '  ' is empty (one blank), KEYWORD3= is undefined.
    expect(parse("KEYWORD1= ''                   / null string keyword")).toMatchObject({ kind: 'string', value: '' });
    expect(parse("KEYWORD2= '    '               / empty string keyword")).toMatchObject({ kind: 'string', value: ' ' });
    expect(parse('KEYWORD3=                      / undefined keyword')).toEqual({
      keyword: 'KEYWORD3',
      kind: 'undefined',
      comment: 'undefined keyword',
    });
  });

  it('reads logical, integer, float (E and D exponents) and complex values with their comments', () => {
    expect(parse('SIMPLE  =                    T / conforms')).toEqual({ keyword: 'SIMPLE', kind: 'logical', value: true, comment: 'conforms' });
    expect(parse('FLAG    =                    F')).toEqual({ keyword: 'FLAG', kind: 'logical', value: false });
    expect(parse('NAXIS1  =                 -512')).toEqual({ keyword: 'NAXIS1', kind: 'integer', value: -512 });
    expect(parse('EXPTIME =               1200.0 / s')).toEqual({ keyword: 'EXPTIME', kind: 'float', value: 1200, comment: 's' });
    // Sec. 4.2.4: 'D' marks a double-precision exponent, so 1.5D-03 is 1.5e-3; '.5' and '+3.' are decimal numbers.
    expect(parse('DVALUE  =              1.5D-03')).toMatchObject({ kind: 'float', value: 1.5e-3 });
    expect(parse('EVALUE  =             -.5E+2')).toMatchObject({ kind: 'float', value: -50 });
    expect(parse('PVALUE  =                  +3.')).toMatchObject({ kind: 'float', value: 3 });
    // Sec. 4.2.5-4.2.6: complex integer and complex float, real part first.
    expect(parse('CINT    =              (3, -4) / ci')).toEqual({ keyword: 'CINT', kind: 'complexInteger', value: { re: 3, im: -4 }, comment: 'ci' });
    expect(parse('CFLT    =        (1.5, -2.25D1)')).toEqual({ keyword: 'CFLT', kind: 'complexFloat', value: { re: 1.5, im: -22.5 } });
  });

  it('keeps COMMENT, HISTORY, blank-keyword and value-less cards as commentary text', () => {
    // Sec. 4.4.2.4: commentary keywords carry text in bytes 9-80 even when it holds '= '.
    expect(parse('COMMENT   = not a value')).toEqual({ keyword: 'COMMENT', kind: 'commentary', text: '  = not a value' });
    expect(parse('HISTORY reduced twice')).toEqual({ keyword: 'HISTORY', kind: 'commentary', text: 'reduced twice' });
    expect(parse('        free text')).toEqual({ keyword: '', kind: 'commentary', text: 'free text' });
    // Sec. 4.1.2.3: without "= " in bytes 9-10 the rest is commentary.
    expect(parse('HIERARCH ESO DET DIT = 10')).toEqual({ keyword: 'HIERARCH', kind: 'commentary', text: ' ESO DET DIT = 10' });
    expect(parse('END')).toBe('END');
  });

  it('joins CONTINUE records into one long string (registered long-string convention example)', () => {
    // The example of fits.gsfc.nasa.gov/registry/continue_keyword.html, also FITS Standard 4.0 sec. 4.2.1.2.
    const cards = parseBlock([
      "SVALUE  = 'This is a long string value that is &' / Any comments",
      "CONTINUE  'continued over three keywords&  ' / may be appended",
      "CONTINUE  ' in the FITS header.'        / after the quoted value.",
      "NEXT    = 'abc&'",
      'COMMENT after',
    ]);
    expect(cards).toEqual([
      {
        keyword: 'SVALUE',
        kind: 'string',
        value: 'This is a long string value that is continued over three keywords in the FITS header.',
        comment: 'Any comments may be appended after the quoted value.',
      },
      // A string ending in '&' that no CONTINUE follows keeps its '&'.
      { keyword: 'NEXT', kind: 'string', value: 'abc&' },
      { keyword: 'COMMENT', kind: 'commentary', text: 'after' },
    ]);
  });

  it('keeps a CONTINUE record that follows no "&" string as commentary', () => {
    expect(parseBlock(["A       = 'plain'", "CONTINUE  'orphan'"])).toEqual([
      { keyword: 'A', kind: 'string', value: 'plain' },
      { keyword: 'CONTINUE', kind: 'commentary', text: "  'orphan'" },
    ]);
  });

  it('rejects unreadable cards with an InputError naming the file, card and keyword', () => {
    for (const [text, problem] of [
      ["BADSTR  = 'no closing quote", 'no closing quote'],
      ['BADVAL  = abc / what', 'is not a quoted string'],
      ["AFTER   = 'x' y", 'after the closing quote'],
      ['BAD KEY = 1', 'keyword'],
    ] as const) {
      const error = thrown(() => parse(text));
      expect(error).toBeInstanceOf(InputError);
      expect(error.message).toContain('cards.fits');
      expect(error.message).toContain('header card 5 of HDU 0');
      expect(error.message).toContain(problem);
    }
  });
});

describe('writing header cards in fixed format (FITS Standard 4.0 sec. 4.2)', () => {
  it('right-justifies logical, integer and float values to byte 30 and opens strings in byte 11', () => {
    // Sec. 4.2.2-4.2.4 fixed format: the value ends in byte 30; sec. 4.2.1.1: the quote opens in byte 11.
    expect(formatHeaderCard(logicalCard('SIMPLE', true))).toEqual([record('SIMPLE  =                    T')]);
    expect(formatHeaderCard(integerCard('naxis1', 512, 'columns'))).toEqual([record('NAXIS1  =                  512 / columns')]);
    expect(formatHeaderCard(floatCard('EXPTIME', 1200))).toEqual([record('EXPTIME =               1200.0')]);
    expect(formatHeaderCard(floatCard('CDELT1', -1.25e-5))).toEqual([record('CDELT1  =             -1.25E-5')]);
    expect(formatHeaderCard(stringCard('OBSERVER', "O'HARA"))).toEqual([record("OBSERVER= 'O''HARA '")]);
    expect(formatHeaderCard(stringCard('EMPTY', ''))).toEqual([record("EMPTY   = ''")]);
    expect(formatHeaderCard(complexIntegerCard('CINT', 3, -4))).toEqual([record('CINT    =              (3, -4)')]);
    expect(formatHeaderCard(complexFloatCard('CFLT', 1.5, -2.25))).toEqual([record('CFLT    =         (1.5, -2.25)')]);
    expect(formatHeaderCard(undefinedCard('UNDEF', 'unknown'))).toEqual([record('UNDEF   =                      / unknown')]);
    expect(formatHeaderCard(commentCard('free text'))).toEqual([record('COMMENT free text')]);
    // The same rules checked by column: byte 30 ends each value, byte 11 opens each string.
    for (const [card, last] of [[integerCard('N', -7), '7'], [complexFloatCard('C', 1.5, -2.25), ')'], [logicalCard('L', false), 'F']] as const) {
      expect(formatHeaderCard(card)[0][29]).toBe(last);
      expect(formatHeaderCard(card)[0].slice(30).trim()).toBe('');
    }
    expect(formatHeaderCard(stringCard('S', 'abc'))[0].slice(10, 20)).toBe("'abc     '");
  });

  it('writes floats as the shortest text that reads back to the same double', () => {
    for (const value of [0.1, -1 / 3, 6.02214076e23, 1e-300, 2.5e-8, 1e21, 123456789.123, Number.MAX_VALUE, Number.MIN_VALUE]) {
      const text = formatFloatValue(value);
      // Sec. 4.2.4: a decimal number holds a decimal point; the exponent letter is E.
      expect(text).toMatch(/^-?\d+\.\d*(E[+-]\d+)?$/);
      expect(Number(text)).toBe(value);
    }
  });

  it('splits a long string over CONTINUE records without splitting a doubled quote, and reads it back', () => {
    const value = `${"'".repeat(40)}${'x'.repeat(100)} ends here with a quote ' and &`;
    const comment = `${'word '.repeat(30)}end`;
    const records = formatHeaderCard(stringCard('LONGSTR', value, comment));
    expect(records.length).toBeGreaterThan(3);
    for (const [i, text] of records.entries()) {
      expect(text).toHaveLength(80);
      expect(text.slice(0, 10)).toBe(i === 0 ? 'LONGSTR = ' : 'CONTINUE  ');
      expect(text[10]).toBe("'");
    }
    expect(parseBlock(records)).toEqual([{ keyword: 'LONGSTR', kind: 'string', value, comment }]);
  });

  it('splits long commentary text over several records', () => {
    const text = `${'history '.repeat(20)}done`;
    const records = formatHeaderCard({ keyword: 'HISTORY', kind: 'commentary', text });
    expect(records.length).toBe(3);
    expect(parseBlock(records).map((card) => (card.kind === 'commentary' ? card.text : '')).join(' ')).toBe(text);
  });

  it('rejects what a card cannot hold with an InputError naming the keyword', () => {
    expect(() => formatHeaderCard(floatCard('BAD', Number.NaN))).toThrow(/key BAD: .*NaN/);
    expect(() => formatHeaderCard(integerCard('BAD', 1.5))).toThrow(/not an integer/);
    expect(() => formatHeaderCard(integerCard('TOOLONGKEY', 1))).toThrow(/1 to 8 characters/);
    expect(() => formatHeaderCard(stringCard('BAD', 'tab\there'))).toThrow(/printable ASCII/);
    expect(() => formatHeaderCard(integerCard('BAD', 1, 'c'.repeat(60)))).toThrow(/value and comment need 93 bytes, more than the 80/);
  });
});
