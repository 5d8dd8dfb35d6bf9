import { afterAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parse } from 'yaml';
import { parseConfig } from '../../src/config/arcsiftConfig.js';
import { ImagePlaneSky, loadObservedData, type ObservedDataExpectation, type ObservedDataSource } from '../../src/data/index.js';
import { inputErrorOf } from '../support/inputErrorOf.js';
import { floatCard, integerCard, readFitsImage, stringCard, writeFits, type HeaderCard } from '../../src/fits/index.js';
import { makeRoot } from './dataFolder.js';

// A pipeline-shaped observation (empty primary holding EXPTIME; SCI in electrons, ERR, WHT; a
// TAN WCS rotated by 30 degrees) and oversampled PSFs, written with astropy by
// test/fixtures/pipeline/make_pipeline.py, which also wrote what astropy reads from them
// (expected.json). What is refused and what the notices say is arcsift's own contract.
const folder = fileURLToPath(new URL('../fixtures/pipeline/', import.meta.url));
const observation = join(folder, 'observation.fits');
const psf3 = join(folder, 'psf-oversampled3.fits');
const expected = JSON.parse(readFileSync(join(folder, 'expected.json'), 'utf8'));
const [lensRa, lensDec] = expected.lensSky as [number, number];
const cutout = { kind: 'sky', raDeg: lensRa, decDeg: lensDec, sideArcsec: expected.cutout.sideArcsec } as const;
const { root, remove } = makeRoot();
afterAll(remove);

const LENS = `redshifts: { lens: 0.5, source: 2 }
lens: { mass: [{ kind: isothermalEllipsoid, einsteinRadiusArcsec: 1, axisRatio: 1, positionAngleDeg: 0, centerXArcsec: 0, centerYArcsec: 0 }] }
source: { light: [{ kind: ellipticalGaussian, sigmaArcsec: 0.1, axisRatio: 1, positionAngleDeg: 0, centerXArcsec: 0, centerYArcsec: 0 }] }
`;

/** What a fitting config of the cut-out expects, with `extra` keys in its observation (a PSF, a mask). */
function fitting(extra = ''): ObservedDataExpectation {
  const config = parseConfig(parse(`observation: { columns: 40, rows: 40, pixelScaleArcsec: 0.08${extra} }\n${LENS}`), join(root, 'fit.yaml'));
  return { columns: 40, rows: 40, pixelScaleArcsec: 0.08, observation: config.observation, configFile: config.file };
}

function load(source: Partial<ObservedDataSource>, expectation: ObservedDataExpectation = fitting()): ReturnType<typeof loadObservedData> {
  return loadObservedData({ image: `${observation}[SCI]`, noise: `${observation}[ERR]`, psf: psf3, cutout, ...source }, expectation);
}


describe('a pipeline file: HDUs, units, cut-out, oversampled PSF', () => {
  const data = load({});

  it('cuts out the 40 x 40 pixels about the lens and converts electrons to counts per second', () => {
    expect([data.columns, data.rows]).toEqual([40, 40]);
    expect(data.cutout).toEqual({ column0: 14, row0: 12, columns: 40, rows: 40 });
    // astropy's SCI / EXPTIME and ERR / EXPTIME at the same pixels; a float32 value divided by
    // 1200 in doubles on both sides, so they agree to the last bit or two (1e-15 relative).
    for (const p of expected.cutout.probes) {
      const k = p.column + 40 * p.row;
      if (data.mask[k] === 0) continue;
      expect(Math.abs(data.image[k] - p.countsPerSecond)).toBeLessThanOrEqual(1e-15 * Math.abs(p.countsPerSecond) + 1e-18);
      expect(Math.abs(data.noise[k] - p.sigmaFromErr)).toBeLessThanOrEqual(1e-15 * p.sigmaFromErr);
    }
    expect(data.imageUnit).toBe("BUNIT 'ELECTRONS' divided by EXPTIME = 1200 s (the primary header)");
    expect(data.notices.join('\n')).toMatch(/observation\.fits\[SCI\]: BUNIT 'ELECTRONS' divided by EXPTIME = 1200 s \(the primary header\)/);
    expect(data.notices.join('\n')).toMatch(/observation\.fits\[ERR\]: BUNIT 'ELECTRONS' divided by EXPTIME/);
  });

  it('takes sigma = 1 / sqrt(weight) from a weight map, in the image\'s unit', () => {
    const weighted = load({ noise: undefined, weight: `${observation}[WHT]` });
    expect(weighted.files).toMatchObject({ image: `${observation}[SCI]`, weight: `${observation}[WHT]` });
    expect(weighted.files.noise).toBeUndefined();
    for (const p of expected.cutout.probes) {
      expect(Math.abs(weighted.noise[p.column + 40 * p.row] - p.sigmaFromWht)).toBeLessThanOrEqual(1e-15 * p.sigmaFromWht);
    }
  });

  it('keeps the WCS of the cut-out: its centre is the lens astropy placed', () => {
    const sky = ImagePlaneSky.of(data) as ImagePlaneSky;
    const centre = sky.skyOf(0, 0);
    // The same transformation as astropy's within 1e-9 arcsec (test/fits/celestialWcs.test.ts).
    expect(Math.hypot((centre.raDeg - lensRa) * Math.cos((lensDec * Math.PI) / 180), centre.decDeg - lensDec) * 3600).toBeLessThan(1e-9);
    const back = sky.positionOf(lensRa, lensDec);
    expect(Math.hypot(back.xArcsec, back.yArcsec)).toBeLessThan(1e-9);
    const angle = expected.positionAngles.find((a: { column: number; counterClockwiseFromXDeg: number }) => a.column === 33.5 && a.counterClockwiseFromXDeg === 30);
    expect(Math.abs(sky.eastOfNorthDeg(30) - angle.eastOfNorthDeg)).toBeLessThan(1e-8);
    const at = (theta: number): string => expected.positionAngles.find((a: { column: number; counterClockwiseFromXDeg: number }) => a.column === 33.5 && a.counterClockwiseFromXDeg === theta).eastOfNorthDeg.toFixed(2);
    expect(data.notices.join('\n')).toContain(`+x points ${at(0)} and +y ${at(90)} degrees east of north`);
  });

  it('integrates the PSF sampled 3 times finer over image pixels, and keeps the fine one', () => {
    expect([data.psf.columns, data.psf.rows]).toEqual([expected.detectorPsf['3'].size, expected.detectorPsf['3'].size]);
    expect(data.psfOversampled?.factor).toBe(3);
    expect(data.psfOversampled?.kernel.columns).toBe(33);
    // The file's float32 values sum to 1 within 1e-7: renormalised without a word (PSF_SUM_NOTICE_TOLERANCE).
    expect(data.notices.join('\n')).not.toMatch(/summed to/);
    expect(data.notices.join('\n')).toMatch(/sampled 3 times finer than the image \(OVERSAMP in its header\); its cells at the image's pixel centres make a \d+ x \d+ kernel/);
    expect(data.psf.values.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(data.psfOversampled?.kernel.values.buffer).toBeInstanceOf(SharedArrayBuffer);
  });

  it('cuts the same pixels out by a pixel box', () => {
    const { column0, row0, columns, rows } = expected.cutout;
    const boxed = load({ cutout: { kind: 'pixels', column0, row0, columns, rows } });
    expect(Array.from(boxed.image)).toEqual(Array.from(data.image));
  });

  it('says which of config and data gives the mask and the PSF', () => {
    const annulus = ', mask: { shape: annulus, innerRadiusArcsec: 0.5, outerRadiusArcsec: 1.5 }, psf: { shape: gaussian, fwhmArcsec: 0.3 }';
    const both = load({}, fitting(annulus));
    const notices = both.notices.join('\n');
    expect(notices).toMatch(/mask: no mask file given or found; .*fit\.yaml's observation\.mask \(annulus 0\.5" to 1\.5" about \(0", 0"\)\) is used/);
    expect(notices).toMatch(/PSF: the data's .*psf-oversampled3\.fits is used; .*fit\.yaml's observation\.psf \(gaussian, FWHM 0\.3"\) is ignored/);
    const pixelsInAnnulus = both.usedPixels.length;
    expect(pixelsInAnnulus).toBeGreaterThan(0);
    expect(pixelsInAnnulus).toBeLessThan(40 * 40);
    const configPsf = load({ psf: undefined }, fitting(annulus));
    expect(configPsf.files.psf).toBeUndefined();
    expect(configPsf.notices.join('\n')).toMatch(/PSF: no PSF file given or found; .*observation\.psf \(gaussian, FWHM 0\.3"\) is used/);
    expect(load({}).notices.join('\n')).toMatch(/no mask file given or found, nor a mask in the config: every pixel is used/);
  });
});

describe('a pipeline file: pixels without data', () => {
  it('drops pixels of zero weight from the mask and names the first', () => {
    const whole = loadObservedData({ image: `${observation}[SCI]`, weight: `${observation}[WHT]`, psf: psf3 }, {});
    const [column, row] = expected.badPixel;
    expect(whole.mask[column + 64 * row]).toBe(0);
    expect(whole.usedPixels.length).toBe(64 * 60 - 1);
    expect(whole.notices.join('\n')).toContain(`observation.fits[WHT]: 1 pixels inside the mask have weight 0 (no data), first pixel (${column}, ${row}) (column, row, counted from 0); they are not used`);
  });

  it('names the frame\'s pixel of a NaN inside the mask, even in a cut-out', () => {
    const [column, row] = expected.badPixel;
    const error = inputErrorOf(() => loadObservedData({ image: `${observation}[SCI]`, noise: `${observation}[ERR]`, psf: psf3 }, {}));
    expect(error.place).toEqual({ file: `${observation}[SCI]`, pixel: [column, row] });
    const cut = inputErrorOf(() => loadObservedData({ image: `${observation}[SCI]`, noise: `${observation}[ERR]`, psf: psf3, cutout: { kind: 'pixels', column0: 2, row0: 3, columns: 10, rows: 10 } }, {}));
    expect(cut.place.pixel).toEqual([column, row]);
  });
});

describe('a pipeline file: what is refused', () => {
  function fitsWith(name: string, cards: HeaderCard[], primaryCards: HeaderCard[] = []): string {
    const sci = readFitsImage(observation, { hdu: 'SCI' });
    const keep = sci.header.cards.filter((c) => /^(C(TYPE|UNIT|RPIX|RVAL|D)|RADESYS)/.test(c.keyword));
    const path = join(root, name);
    writeFits(path, {
      primary: { cards: primaryCards },
      extensions: [{ data: sci.data, nx: sci.nx, ny: sci.ny, extname: 'SCI', cards: [...keep, ...cards] },
        { data: readFitsImage(observation, { hdu: 'ERR' }).data, nx: sci.nx, ny: sci.ny, extname: 'ERR', cards: keep }],
    });
    return path;
  }

  const cases: [string, () => unknown, RegExp, { file?: string; key?: string }][] = [
    ['a total without EXPTIME', () => {
      const path = fitsWith('no-exptime.fits', [stringCard('BUNIT', 'ELECTRONS')]);
      return load({ image: `${path}[SCI]`, noise: `${path}[ERR]` });
    }, /no-exptime\.fits\[SCI\], key EXPTIME: HDU 1 \(SCI\) holds a total over the exposure \(BUNIT 'ELECTRONS'\), not a rate: expected EXPTIME > 0 \(seconds\) to divide it by, found no EXPTIME in its header or the primary header/, { key: 'EXPTIME' }],
    ['a unit that is not a count', () => {
      const path = fitsWith('jansky.fits', [stringCard('BUNIT', 'Jy/beam')], [floatCard('EXPTIME', 100)]);
      return load({ image: `${path}[SCI]`, noise: `${path}[ERR]` });
    }, /jansky\.fits\[SCI\], key BUNIT: HDU 1 \(SCI\): BUNIT 'Jy\/beam' is not a unit arcsift can turn into counts per second/, { key: 'BUNIT' }],
    ['MJy/sr without PHOTMJSR', () => {
      const path = fitsWith('surface.fits', [stringCard('BUNIT', 'MJy/sr')]);
      return load({ image: `${path}[SCI]`, noise: `${path}[ERR]` });
    }, /key BUNIT: HDU 1 \(SCI\) holds a surface brightness \(BUNIT 'MJy\/sr'\).*expected PHOTMJSR > 0/, { key: 'BUNIT' }],
    ['the image HDU named as noise too', () => load({ noise: observation, image: observation }), /noise map and image are the same HDU \(HDU 1 \(SCI\)\): name the noise map's HDU, e.g\. .*observation\.fits\[ERR\]/, {}],
    ['an HDU that is not there', () => load({ noise: `${observation}[DQ]` }), /observation\.fits\[DQ\]: noise file .* no HDU has EXTNAME='DQ'/, {}],
    ['an oversampling disagreeing with OVERSAMP', () => load({ psfOversampling: 4 }), /psf-oversampled3\.fits, key OVERSAMP: PSF oversampling disagrees: given as 4, found OVERSAMP = 3/, { key: 'OVERSAMP' }],
    ['a cut-out leaving the frame', () => load({ cutout: { kind: 'pixels', column0: 40, row0: 0, columns: 40, rows: 40 } }), /cut-out outside the frame: .* found columns 40 to 79 and rows 0 to 39/, {}],
    ['the whole frame against a config of the cut-out', () => load({ cutout: undefined }), /image shape: expected 40 x 40 pixels .* found 64 x 60; to fit part of a larger frame, ask for a cut-out/, { key: 'NAXIS1' }],
    ['no PSF anywhere', () => load({ psf: undefined }), /no PSF: expected a PSF file \(psf\.fits in the data folder, or named explicitly\) or observation\.psf in the config, found neither/, {}],
  ];
  for (const [what, run, message, place] of cases) {
    it(`refuses ${what}`, () => {
      const error = inputErrorOf(run);
      expect(error.message).toMatch(message);
      expect(error.place).toMatchObject(place);
    });
  }

  it('refuses an oversampled PSF whose cell size or centre is off', () => {
    const fine = readFitsImage(psf3);
    const shifted = new Float64Array(fine.data.length);
    for (let k = 0; k < fine.data.length; k++) if (k % 33 >= 2) shifted[k] = fine.data[k - 2];
    const offCentre = join(root, 'off-centre.fits');
    writeFits(offCentre, { primary: { data: shifted, nx: 33, ny: 33, cards: [integerCard('OVERSAMP', 3)] } });
    expect(inputErrorOf(() => load({ psf: offCentre })).message).toMatch(/PSF not centred: expected its peak within 1 cells \(half an image pixel\) of the middle cell \(16, 16\), found it at pixel \(18, 16\)/);
    const wrongScale = join(root, 'wrong-scale.fits');
    writeFits(wrongScale, { primary: { data: fine.data, nx: 33, ny: 33, cards: [integerCard('OVERSAMP', 3), floatCard('PIXELSCL', 0.031 / 3)] } });
    expect(inputErrorOf(() => load({ psf: wrongScale })).message).toMatch(/key PIXELSCL: PSF cell size disagrees with the image: expected PIXELSCL = 0\.0266.* found 0\.0103/);
    const unsaid = join(root, 'unsaid.fits');
    writeFits(unsaid, { primary: { data: fine.data, nx: 33, ny: 33, cards: [floatCard('PIXELSCL', 0.08 / 3)] } });
    expect(inputErrorOf(() => load({ psf: unsaid })).message).toMatch(/if the PSF is sampled N times finer than the image, say so \(OVERSAMP = N in its header, or --psf-oversampling N\)/);
    expect(load({ psf: unsaid, psfOversampling: 3 }).notices.join('\n')).toMatch(/sampled 3 times finer than the image \(as given\)/);
  });
});
