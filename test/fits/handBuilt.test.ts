import { describe, expect, it } from 'vitest';
import {
  commentCard,
  decodeFitsImage,
  encodeFits,
  floatCard,
  listHdus,
  stringCard,
  type FitsFileContent,
} from '../../src/fits/index.js';
import { concatBytes, dataBytes, headerBytes } from './fitsTestBytes.js';

// A two-HDU file typed in byte by byte from FITS Standard 4.0: keyword in bytes 1-8, "= " in 9-10,
// fixed-format values ending in byte 30 (strings opening in byte 11), comments after " / ", END,
// blank padding of the header and zero padding of the data to 2880 bytes (sec. 3.3, 4.1, 4.2, 4.4).
//                  1234567890123456789012345678901234567890
const primaryHeader = headerBytes([
  'SIMPLE  =                    T',
  'BITPIX  =                   16',
  'NAXIS   =                    2',
  'NAXIS1  =                    3',
  'NAXIS2  =                    2',
  'EXTEND  =                    T',
  'BZERO   =                32768',
  "OBJECT  = 'ARC ''B'''          / lensed arc",
  'EXPTIME =               1200.5 / exposure time, s',
  'CDELT1  =             -1.25E-5',
  'CDELT2  =              1.25E-5',
  'COMMENT typed in by hand',
  'END',
]);
// Six big-endian two's-complement 16-bit integers (sec. 5.2.2): 1, 2, 3, 256, -1, -32768.
const primaryData = dataBytes([0x00, 0x01, 0x00, 0x02, 0x00, 0x03, 0x01, 0x00, 0xff, 0xff, 0x80, 0x00]);
const extensionHeader = headerBytes([
  "XTENSION= 'IMAGE   '",
  'BITPIX  =                  -32',
  'NAXIS   =                    2',
  'NAXIS1  =                    2',
  'NAXIS2  =                    2',
  'PCOUNT  =                    0',
  'GCOUNT  =                    1',
  "EXTNAME = 'PSF     '",
  'END',
]);
// IEEE 754 single precision, big-endian (sec. 5.3, Appendix E): 1.0 = 3F800000, -2.5 = C0200000,
// 0.15625 = 1.25 x 2^-3 = 3E200000, 0 = 00000000.
const extensionData = dataBytes([0x3f, 0x80, 0, 0, 0xc0, 0x20, 0, 0, 0x3e, 0x20, 0, 0, 0, 0, 0, 0]);
const handBuilt = concatBytes(primaryHeader, primaryData, extensionHeader, extensionData);

describe('a FITS file built by hand from the standard', () => {
  it('has the layout the standard prescribes', () => {
    expect(handBuilt.length).toBe(4 * 2880);
    expect(String.fromCharCode(...handBuilt.subarray(0, 10))).toBe('SIMPLE  = ');
    expect(String.fromCharCode(handBuilt[29])).toBe('T');
    expect(listHdus(handBuilt).map((hdu) => [hdu.type, hdu.headerOffset, hdu.dataOffset, hdu.dataByteLength])).toEqual([
      ['PRIMARY', 0, 2880, 12],
      ['IMAGE', 5760, 8640, 16],
    ]);
  });

  it('reads the primary image: stored integers plus BZERO = 32768, first stored row is row 0', () => {
    const image = decodeFitsImage(handBuilt, {}, 'hand.fits');
    expect([image.nx, image.ny, image.bitpix, image.hduIndex]).toEqual([3, 2, 16, 0]);
    // physical = BZERO + BSCALE * stored (sec. 4.4.2.5) with BSCALE absent, i.e. 1.
    expect(Array.from(image.data)).toEqual([32769, 32770, 32771, 33024, 32767, 0]);
    expect(image.header.getString('OBJECT')).toBe("ARC 'B'");
    expect(image.header.getNumber('EXPTIME')).toBe(1200.5);
    expect(image.header.getComment('EXPTIME')).toBe('exposure time, s');
    expect(image.header.getLogical('EXTEND')).toBe(true);
    expect(image.header.commentary('COMMENT')).toEqual(['typed in by hand']);
    // 1.25e-5 degree = 0.045 arcsec; |CDELT1| = |CDELT2| so the pixels are square.
    expect(image.pixelScale?.pixelScaleArcsec).toBeCloseTo(0.045, 14);
    expect(image.pixelScale?.square).toBe(true);
  });

  it('reads the IMAGE extension by EXTNAME and by index', () => {
    for (const hdu of ['psf', 1] as const) {
      const image = decodeFitsImage(handBuilt, { hdu });
      expect([image.nx, image.ny, image.bitpix, image.extname]).toEqual([2, 2, -32, 'PSF']);
      expect(Array.from(image.data)).toEqual([1, -2.5, 0.15625, 0]);
    }
  });

  it("is what arcsift's writer produces, byte for byte, for the same content", () => {
    const content: FitsFileContent = {
      primary: {
        data: Float64Array.from([32769, 32770, 32771, 33024, 32767, 0]),
        nx: 3,
        ny: 2,
        bitpix: 16,
        bzero: 32768,
        cards: [
          stringCard('OBJECT', "ARC 'B'", 'lensed arc'),
          floatCard('EXPTIME', 1200.5, 'exposure time, s'),
          floatCard('CDELT1', -1.25e-5),
          floatCard('CDELT2', 1.25e-5),
          commentCard('typed in by hand'),
        ],
      },
      extensions: [{ data: Float64Array.from([1, -2.5, 0.15625, 0]), nx: 2, ny: 2, bitpix: -32, extname: 'PSF' }],
    };
    const written = encodeFits(content);
    expect(written.length).toBe(handBuilt.length);
    const firstDifference = written.findIndex((byte, i) => byte !== handBuilt[i]);
    expect(firstDifference).toBe(-1);
  });
});
