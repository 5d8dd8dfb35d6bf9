import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { CelestialWcs, readFitsImage } from '../../src/fits/index.js';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { readFlagList } from '../../src/vet/readFlagList.js';
import { InputError } from '../../src/errors.js';

// A 40 x 30 grid of 0.1" pixels: by the README's convention pixel (i, j) is centred at
// x = (i - 19.5) * 0.1, y = (j - 14.5) * 0.1, and the image spans |x| <= 2.0", |y| <= 1.5".
const grid = { columns: 40, rows: 30, pixelScaleArcsec: 0.1 };
const folder = mkdtempSync(join(tmpdir(), 'arcsift-flags-'));
let count = 0;
function listFile(text: string): string {
  const path = join(folder, `flags-${++count}.csv`);
  writeFileSync(path, text);
  return path;
}

describe('readFlagList', () => {
  it('reads x,y in arcsec with score and id, skipping comments and blank lines', () => {
    const flags = readFlagList(listFile('# from the network\n\nx,y,score,id\n0.9,0.62,0.97,knot\n-1.1, 0.25 ,0.61,west\n'), grid);
    expect(flags.map((f) => [f.id, f.xArcsec, f.yArcsec, f.score])).toEqual([['knot', 0.9, 0.62, 0.97], ['west', -1.1, 0.25, 0.61]]);
    expect(flags[1].origin).toMatch(/line 5$/);
  });

  it('converts column,row to arcsec by the README convention and numbers unnamed flags', () => {
    const flags = readFlagList(listFile('column,row\n0,0\n19.5,14.5\n39,29\n'), grid);
    expect(flags.map((f) => f.id)).toEqual(['1', '2', '3']);
    expect(flags[0].xArcsec).toBeCloseTo(-1.95, 12);
    expect(flags[0].yArcsec).toBeCloseTo(-1.45, 12);
    expect(flags[1].xArcsec).toBeCloseTo(0, 12);
    expect(flags[1].yArcsec).toBeCloseTo(0, 12);
    expect(flags[2].xArcsec).toBeCloseTo(1.95, 12);
    expect(flags[2].yArcsec).toBeCloseTo(1.45, 12);
    expect(flags[0].score).toBeUndefined();
  });

  it('takes a coordinates column saying per line whether x,y are arcsec or pixels', () => {
    const flags = readFlagList(listFile('id,x,y,coordinates\na,0.3,-0.2,arcsec\nb,29.5,4.5,pixel\n'), grid);
    expect([flags[0].xArcsec, flags[0].yArcsec]).toEqual([0.3, -0.2]);
    expect(flags[1].xArcsec).toBeCloseTo(1.0, 12);
    expect(flags[1].yArcsec).toBeCloseTo(-1.0, 12);
  });

  it('places ra,dec flags by the image\'s WCS (the pipeline fixture, astropy\'s values)', () => {
    // test/fixtures/pipeline/make_pipeline.py: astropy's RA/Dec of the lens, frame pixel
    // (33.5, 31.5), and of pixel (10.25, 47.75); the 64 x 60 frame's centre is (31.5, 29.5).
    const pipeline = fileURLToPath(new URL('../fixtures/pipeline/', import.meta.url));
    const expected = JSON.parse(readFileSync(join(pipeline, 'expected.json'), 'utf8'));
    const frame = CelestialWcs.fromHeader(readFitsImage(join(pipeline, 'observation.fits'), { hdu: 'SCI' }).header) as CelestialWcs;
    const sky = { columns: 64, rows: 60, pixelScaleArcsec: 0.08, wcs: frame.description };
    const other = expected.pixelToSky[3];
    const flags = readFlagList(listFile(`id,ra,dec\nlens,${expected.lensSky[0]},${expected.lensSky[1]}\nother,${other.raDeg},${other.decDeg}\n`), sky);
    // Through the WCS and back: 1e-9 arcsec, the round trip's rounding (test/fits/celestialWcs.test.ts).
    expect(Math.abs(flags[0].xArcsec - 2 * 0.08)).toBeLessThan(1e-9);
    expect(Math.abs(flags[0].yArcsec - 2 * 0.08)).toBeLessThan(1e-9);
    expect(Math.abs(flags[1].xArcsec - (other.column - 31.5) * 0.08)).toBeLessThan(1e-9);
    expect(Math.abs(flags[1].yArcsec - (other.row - 29.5) * 0.08)).toBeLessThan(1e-9);
    expect(() => readFlagList(listFile('ra,dec\n201.37,-43.02\n'), sky)).toThrow(/line 2: flag outside the image: .*RA 201\.37, Dec -43\.02/);
  });

  const bad: [string, string, RegExp][] = [
    ['an empty file', '', /empty flag list/],
    ['a header and no candidates', '# only this\nx,y\n', /empty flag list: expected at least one candidate after the header on line 2/],
    ['a non-numeric cell', 'x,y\n0.1,0.2\n0.3,abc\n', /line 3, column y: expected a finite number, found "abc"/],
    ['an empty position cell', 'x,y\n,0.2\n', /line 2, column x: expected a finite number, found ""/],
    ['a non-numeric score', 'x,y,score\n0.1,0.2,high\n', /line 2, column score/],
    ['a flag outside the image (arcsec)', 'x,y\n0.1,0.2\n2.05,0\n', /line 3: flag outside the image: .*found x = 2.05", y = 0"/],
    ['a flag outside the image (pixels)', 'column,row\n10,30\n', /line 2: flag outside the image: .*column 10, row 30/],
    ['an unknown column', 'x,y,probability\n0,0,1\n', /unknown column "probability"/],
    ['both coordinate pairs', 'x,y,column,row\n0,0,1,1\n', /one pair only/],
    ['half a pair', 'x,row\n0,0\n', /expected the columns x,y \(arcsec\), column,row \(pixels\) or ra,dec \(degrees\), one pair only/],
    ['ra,dec without a celestial WCS', 'ra,dec\n201.36,-43.02\n', /flags in ra,dec need the image's celestial WCS .*found none; give x,y or column,row/],
    ['binary bytes', 'PK\u0003\u0004\u0000\u0000x,y', /not a flag list: the file holds binary bytes \(NUL\)/],
    ['a short line', 'x,y,score\n0,0\n', /line 2: expected 3 cells/],
    ['a bad coordinates value', 'x,y,coordinates\n0,0,degrees\n', /line 2, column coordinates: expected arcsec or pixel/],
    ['a repeated id', 'x,y,id\n0,0,a\n0.1,0.1,a\n', /line 3, column id: expected ids to be unique/],
  ];
  for (const [what, text, message] of bad) {
    it(`rejects ${what}, naming the file`, () => {
      const path = listFile(text);
      let error: unknown;
      try { readFlagList(path, grid); } catch (e) { error = e; }
      expect(error).toBeInstanceOf(InputError);
      expect((error as InputError).place.file).toBe(path);
      expect((error as Error).message).toMatch(message);
    });
  }

  it('accepts a flag on the image edge (|x| = 2.0")', () => {
    expect(readFlagList(listFile('x,y\n2.0,-1.5\n'), grid)).toHaveLength(1);
  });
});
