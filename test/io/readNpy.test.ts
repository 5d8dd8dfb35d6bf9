import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { decodeNpy, readNpy } from '../../src/io/readNpy.js';
import { InputError } from '../../src/errors.js';

// Bytes built by hand following numpy's published NPY format description (numpy.lib.format,
// "NPY format" in the numpy documentation): the 6-byte magic \x93NUMPY, major and minor
// version bytes, the header length as a little-endian uint16 (1.0) or uint32 (2.0, 3.0), the
// header (a Python dict literal padded with spaces and ending in '\n' so that the data start on
// a multiple of 64 bytes), then the raw elements in C (row-major) or Fortran (column-major) order.
function npyBytes(options: {
  descr: string; fortran: boolean; shape: readonly number[]; values: readonly number[]; major?: number;
  headerText?: string;
}): Uint8Array {
  const major = options.major ?? 1;
  const lengthBytes = major === 1 ? 2 : 4;
  const shapeText = options.shape.length === 1 ? `(${options.shape[0]},)` : `(${options.shape.join(', ')})`;
  let header = options.headerText
    ?? `{'descr': '${options.descr}', 'fortran_order': ${options.fortran ? 'True' : 'False'}, 'shape': ${shapeText}, }`;
  const unpadded = 8 + lengthBytes + header.length + 1;
  header += ' '.repeat((64 - (unpadded % 64)) % 64) + '\n';
  const size = Number(options.descr.slice(2));
  const little = options.descr[0] !== '>';
  const out = new Uint8Array(8 + lengthBytes + header.length + options.values.length * size);
  const view = new DataView(out.buffer);
  out.set([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, major, 0]);
  if (major === 1) view.setUint16(8, header.length, true);
  else view.setUint32(8, header.length, true);
  for (let k = 0; k < header.length; k++) out[8 + lengthBytes + k] = header.charCodeAt(k);
  const start = 8 + lengthBytes + header.length;
  options.values.forEach((v, k) => {
    const at = start + k * size;
    if (options.descr.slice(1) === 'f4') view.setFloat32(at, v, little);
    else if (options.descr.slice(1) === 'f8') view.setFloat64(at, v, little);
    else if (options.descr.slice(1) === 'i4') view.setInt32(at, v, little);
    else view.setUint8(at, v);
  });
  return out;
}

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
    ['complex dtype', npyBytes({ descr: '<c8', fortran: false, shape: [1, 1], values: [] }), /dtype .* found '<c8'/],
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
