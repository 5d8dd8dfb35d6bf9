import { InputError } from '../errors.js';
import { FITS_BLOCK_BYTES, FITS_CARD_BYTES, paddedToBlock } from './fitsBlock.js';
import { FitsHeader } from './header.js';
import type { HeaderCard, StringCard } from './headerCard.js';
import { parseHeaderCard, parseValueField, type CardPlace } from './parseHeaderCard.js';

export interface ParsedHeader {
  readonly header: FitsHeader;
  /** Bytes the header occupies in the file: its records through END, padded to whole 2880-byte blocks. */
  readonly byteLength: number;
}

const CARDS_PER_BLOCK = FITS_BLOCK_BYTES / FITS_CARD_BYTES;

/** Printable ASCII, bytes 0x20-0x7E, the only bytes a header may hold (FITS Standard 4.0 sec. 4.1.1). */
function recordText(bytes: Uint8Array, start: number, place: CardPlace): string {
  let text = '';
  for (let i = 0; i < FITS_CARD_BYTES; i++) {
    const byte = bytes[start + i];
    if (byte < 0x20 || byte > 0x7e) {
      const hint = place.cardIndex >= CARDS_PER_BLOCK ? '; the header may be missing its END card' : '';
      throw new InputError(
        `header card ${place.cardIndex + 1} of HDU ${place.hduIndex} (file byte ${start}) holds byte 0x${byte.toString(16).padStart(2, '0')} at column ${i + 1}, which is not printable ASCII${hint}`,
        { file: place.source },
      );
    }
    text += String.fromCharCode(byte);
  }
  return text;
}

function joinComments(first: string | undefined, second: string | undefined): string | undefined {
  if (first === undefined) return second;
  if (second === undefined) return first;
  return `${first} ${second}`;
}

/**
 * One CONTINUE record appended to a string ending in '&' (long-string convention, FITS Standard
 * 4.0 sec. 4.2.1.2): the '&' is dropped, the pieces joined, the comments joined with a blank.
 * Answers undefined when the record does not continue a string, so it stays commentary.
 */
function continued(previous: StringCard, record: string): StringCard | undefined {
  if (record.slice(8, 10) !== '  ') return undefined;
  const field = parseValueField(record.slice(10));
  if (!field.ok || field.value.kind !== 'string') return undefined;
  const piece = field.value.value === ' ' ? '' : field.value.value;
  const comment = joinComments(previous.comment, field.comment);
  const value = previous.value.slice(0, -1) + piece;
  return comment === undefined
    ? { keyword: previous.keyword, kind: 'string', value }
    : { keyword: previous.keyword, kind: 'string', value, comment };
}

/**
 * Reads the header that starts at `offset` (a block boundary) through its END record. Throws
 * InputError for a header cut short by the end of the file, one without END, a byte that is
 * not printable ASCII, or a card whose value cannot be read.
 */
export function parseHeader(bytes: Uint8Array, offset: number, source: string | undefined, hduIndex: number): ParsedHeader {
  const cards: HeaderCard[] = [];
  let continuable = -1;
  let cardIndex = 0;
  for (let start = offset; start + FITS_CARD_BYTES <= bytes.length; start += FITS_CARD_BYTES, cardIndex++) {
    const place: CardPlace = { source, hduIndex, cardIndex };
    const record = recordText(bytes, start, place);
    const card = parseHeaderCard(record, place);
    if (card === 'END') {
      return {
        header: new FitsHeader(cards, source),
        byteLength: paddedToBlock(start + FITS_CARD_BYTES - offset),
      };
    }
    if (card.kind === 'commentary' && card.keyword === 'CONTINUE' && continuable >= 0) {
      const joined = continued(cards[continuable] as StringCard, record);
      if (joined !== undefined) {
        cards[continuable] = joined;
        if (!joined.value.endsWith('&')) continuable = -1;
        continue;
      }
    }
    cards.push(card);
    continuable = card.kind === 'string' && card.value.endsWith('&') ? cards.length - 1 : -1;
  }
  const available = bytes.length - offset;
  if (available % FITS_BLOCK_BYTES !== 0) {
    throw new InputError(
      `truncated header: HDU ${hduIndex} starts at byte ${offset} and the file ends ${available} bytes later, partway through a ${FITS_BLOCK_BYTES}-byte block, before any END card`,
      { file: source },
    );
  }
  throw new InputError(
    `missing END card: the header of HDU ${hduIndex} (from byte ${offset}) runs to the end of the file, ${cardIndex} cards, without an END card`,
    { file: source },
  );
}
