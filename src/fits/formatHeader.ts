import { FITS_CARD_BYTES, paddedToBlock } from './fitsBlock.js';
import type { HeaderCard } from './headerCard.js';
import { formatHeaderCard } from './formatHeaderCard.js';

/**
 * The bytes of a header: the cards' records, the END record, and blanks (0x20) to a whole
 * number of 2880-byte blocks (FITS Standard 4.0 sec. 3.3.1 and 4.4.1).
 */
export function formatHeader(cards: readonly HeaderCard[], source?: string): Uint8Array {
  const records = cards.flatMap((card) => formatHeaderCard(card, source));
  records.push('END'.padEnd(FITS_CARD_BYTES));
  const bytes = new Uint8Array(paddedToBlock(records.length * FITS_CARD_BYTES)).fill(0x20);
  let offset = 0;
  for (const record of records) {
    for (let i = 0; i < FITS_CARD_BYTES; i++) bytes[offset + i] = record.charCodeAt(i);
    offset += FITS_CARD_BYTES;
  }
  return bytes;
}
