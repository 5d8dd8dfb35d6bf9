/** Length of one FITS logical record: headers and data come in whole blocks (FITS Standard 4.0, sec. 3.1). */
export const FITS_BLOCK_BYTES = 2880;

/** Length of one header keyword record (FITS Standard 4.0, sec. 4.1.1). */
export const FITS_CARD_BYTES = 80;

/** The smallest whole number of 2880-byte blocks that holds `byteLength` bytes, in bytes. */
export function paddedToBlock(byteLength: number): number {
  return Math.ceil(byteLength / FITS_BLOCK_BYTES) * FITS_BLOCK_BYTES;
}
