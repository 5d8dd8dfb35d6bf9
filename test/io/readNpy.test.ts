import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { decodeNpy, readNpy } from '../../src/io/readNpy.js';
import { InputError } from '../../src/errors.js';
import { npyBytes } from './npyBytes.js';

// A 2 x 3 array (rows x columns): array[j, i] = 10 j + i + 0.5 (exact in float32).
const rows = 2;
const columns = 3;
const valueAt = (j: number, i: number): number => 10 * j + i + 0.5;
const cOrder = Array.from({ length: rows * columns }, (_, p) => valueAt(Math.floor(p / columns), p % columns));
const fortranOrder = Array.from({ length: rows * columns }, (_, p) => valueAt(p % rows, Math.floor(p / rows)));

function expectImage(image: ReturnType<typeof decodeNpy>): void {
  expect(image.nx).toBe(columns);
  expect(image.ny).toBe(rows);
  for (let j = 0; j < rows; j++) for (let i = 0; i < columns; i++) expect(image.data[i + columns * j]).toBe(valueAt(j, i));
}

describe('decodeNpy on hand-built bytes', () => {
  for (const descr of ['<f4', '>f4', '<f8', '>f8']) {
    for (const fortran of [false, true]) {
      for (const major of [1, 2]) {
        it(`${descr}, ${fortran ? 'Fortran' : 'C'} order, version ${major}.0`, () => {
          const bytes = npyBytes({ descr, fortran, shape: [rows, columns], values: fortran ? fortranOrder : cOrder, major });
          const image = decodeNpy(bytes, 'hand.npy');
          expectImage(image);
          expect(image.version).toEqual([major, 0]);
          expect(image.fortranOrder).toBe(fortran);
        });
      }
    }
  }

  it('reads |u1 and <i4', () => {
    const u1 = decodeNpy(npyBytes({ descr: '|u1', fortran: false, shape: [1, 3], values: [0, 7, 255] }));
    expect(Array.from(u1.data)).toEqual([0, 7, 255]);
    const i4 = decodeNpy(npyBytes({ descr: '<i4', fortran: false, shape: [1, 3], values: [-2147483648, -1, 2147483647] }));
    expect(Array.from(i4.data)).toEqual([-2147483648, -1, 2147483647]);
  });
});

describe('readNpy on files written by numpy', () => {
  // Written by numpy 1.24.2's numpy.lib.format.write_array: test/io/fixtures/make_npy.py.
  const folder = fileURLToPath(new URL('./fixtures/', import.meta.url));
  const expected = JSON.parse(readFileSync(join(folder, 'expected.json'), 'utf8')) as Record<
    string, { shape: [number, number]; descr: string; fortranOrder: boolean; values: number[][] }
  >;
  for (const [name, want] of Object.entries(expected)) {
    it(name, () => {
      const image = readNpy(join(folder, name));
      expect([image.ny, image.nx]).toEqual(want.shape);
      expect(image.descr).toBe(want.descr);
      expect(image.fortranOrder).toBe(want.fortranOrder);
      // Exact: every value is representable in its dtype and was converted to float64 by numpy.
      for (let j = 0; j < image.ny; j++) {
        for (let i = 0; i < image.nx; i++) expect(image.data[i + image.nx * j]).toBe(want.values[j][i]);
      }
    });
  }

  it('refuses an .npz archive of numpy.savez, saying how to save one array', () => {
    const path = join(folder, 'archive.npz');
    expect(() => readNpy(path)).toThrow(InputError);
    expect(() => readNpy(path)).toThrow(/archive\.npz: not a readable 2-D NPY array: this is a zip archive, as numpy\.savez writes \(\.npz\), not one array: save the map alone with numpy\.save/);
  });

  it('rejects numpy.save of a 1-D array, naming the file and the shape', () => {
    const path = join(folder, 'one-dimensional.npy');
    expect(() => readNpy(path)).toThrow(InputError);
    expect(() => readNpy(path)).toThrow(/one-dimensional\.npy.*2-D array.*shape \(4,\)/);
  });
});

describe('readNpy rejects broken files', () => {
  const folder = mkdtempSync(join(tmpdir(), 'arcsift-npy-'));
  const good = npyBytes({ descr: '<f8', fortran: false, shape: [rows, columns], values: cOrder });
  const cases: [string, Uint8Array, RegExp][] = [
    ['truncated data', good.subarray(0, good.length - 3), /needs 48 data bytes after the header, found 45 \(truncated file\)/],
    ['truncated header', good.subarray(0, 40), /header says it is \d+ bytes long/],
    ['garbage', new TextEncoder().encode('SIMPLE  =                    T / not an npy file at all'), /magic string/],
    ['empty file', new Uint8Array(0), /magic string/],
    ['version 4', Uint8Array.from([...good.subarray(0, 6), 4, 0, ...good.subarray(8)]), /version 1\.0, 2\.0 or 3\.0, found 4\.0/],
    ['complex dtype', npyBytes({ descr: '<c8', fortran: false, shape: [1, 1], values: [] }),
      /expected a numeric or boolean dtype: float16, float32, float64 \(f2, f4, f8\), int8 to int64 \(i1, i2, i4, i8\), uint8 to uint64 \(u1, u2, u4, u8\) or bool \(b1\), little-endian '<' or big-endian '>' \('\|' for one byte\), e\.g\. '<f4'; found '<c8'/],
    ['three dimensions', npyBytes({ descr: '<f8', fortran: false, shape: [1, 1, 1], values: [1] }), /shape \(1, 1, 1\)/],
    ['missing shape', npyBytes({ descr: '<f8', fortran: false, shape: [1], values: [1], headerText: "{'descr': '<f8', 'fortran_order': False}" }), /no 'shape'/],
    ['broken dict', npyBytes({ descr: '<f8', fortran: false, shape: [1], values: [1], headerText: "{'descr': '<f8' 'shape': (1, 1)}" }), /expected ',' or '}'/],
    ['extra bytes', Uint8Array.from([...good, 0, 0, 0, 0, 0, 0, 0, 0]), /found 56/],
  ];
  for (const [what, bytes, message] of cases) {
    it(what, () => {
      const path = join(folder, `${what.replace(/ /g, '-')}.npy`);
      writeFileSync(path, bytes);
      let error: unknown;
      try { readNpy(path); } catch (e) { error = e; }
      expect(error).toBeInstanceOf(InputError);
      expect((error as InputError).place.file).toBe(path);
      expect((error as Error).message).toMatch(message);
    });
  }

  it('names a file that does not exist', () => {
    expect(() => readNpy(join(folder, 'absent.npy'))).toThrow(/absent\.npy: cannot read the file/);
  });
});
