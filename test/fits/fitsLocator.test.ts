import { describe, expect, it } from 'vitest';
import { fileURLToPath } from 'node:url';
import { InputError } from '../../src/errors.js';
import { parseFitsLocator, readFitsImage } from '../../src/fits/index.js';

// arcsift's own notation for one HDU of a file (FILE[N], FILE[NAME], FILE[NAME,VERSION]), read
// against the pipeline-shaped file of test/fixtures/pipeline (make_pipeline.py, astropy).
const observation = fileURLToPath(new URL('../fixtures/pipeline/observation.fits', import.meta.url));

describe('naming an HDU', () => {
  it('reads a plain path, an HDU number, an EXTNAME and an EXTNAME with EXTVER', () => {
    expect(parseFitsLocator('a/b.fits')).toEqual({ path: 'a/b.fits', selection: {}, text: 'a/b.fits' });
    expect(parseFitsLocator('b.fits[2]').selection).toEqual({ hdu: 2 });
    expect(parseFitsLocator('b.fits[ sci ]').selection).toEqual({ hdu: 'sci' });
    expect(parseFitsLocator('b.fits[SCI,1]').selection).toEqual({ hdu: 'SCI', extver: 1 });
  });

  it('refuses an empty or malformed choice, naming the file', () => {
    for (const [text, message] of [['b.fits[]', /b\.fits: HDU choice \[\]: expected an HDU number or an EXTNAME/], ['b.fits[2,1]', /an HDU number takes no EXTVER/], ['b.fits[SCI,x]', /whole-number EXTVER/]] as const) {
      expect(() => parseFitsLocator(text)).toThrow(InputError);
      expect(() => parseFitsLocator(text)).toThrow(message);
    }
  });

  it('finds the extensions of a pipeline file, and keeps the primary header beside them', () => {
    const { path, selection } = parseFitsLocator(`${observation}[err]`);
    const err = readFitsImage(path, selection);
    expect([err.hduIndex, err.extname, err.nx, err.ny]).toEqual([2, 'ERR', 64, 60]);
    expect(err.primaryHeader?.getNumber('EXPTIME')).toBe(1200);
    expect(readFitsImage(observation).extname).toBe('SCI');
    expect(() => readFitsImage(observation, { hdu: 'DQ' })).toThrow(/no HDU has EXTNAME='DQ'; the file has HDU 0 \(PRIMARY, NAXIS=0\), HDU 1 \(IMAGE EXTNAME='SCI'/);
  });
});
