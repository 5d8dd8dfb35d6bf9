import { InputError } from '../errors.js';
import { readFileBytes } from './readFileBytes.js';

/**
 * A 2-D array read from an NPY file, laid out as arcsift's images: index i + nx * j is column i
 * of row j, where numpy's shape is (rows, columns) = (ny, nx) and array[j, i] is row j, column i.
 */
export interface NpyImage {
  readonly data: Float64Array;
  /** Columns: numpy's shape[1]. */
  readonly nx: number;
  /** Rows: numpy's shape[0]. */
  readonly ny: number;
  /** The dtype as the header wrote it, e.g. '<f8'. */
  readonly descr: string;
  readonly fortranOrder: boolean;
  /** Format version [major, minor]. */
  readonly version: readonly [number, number];
}

/** The six bytes every NPY file starts with: \x93 then "NUMPY". */
const NPY_MAGIC = [0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59];

/**
 * IEEE 754 binary16 (numpy's float16) as a number: 1 sign bit, 5 exponent bits (bias 15), 10
 * fraction bits; exponent 0 is subnormal (fraction x 2^-24), exponent 31 infinity or NaN.
 */
function halfToNumber(bits: number): number {
  const sign = bits & 0x8000 ? -1 : 1;
  const exponent = (bits >> 10) & 0x1f;
  const fraction = bits & 0x3ff;
  if (exponent === 0) return sign * fraction * 2 ** -24;
  if (exponent === 31) return fraction === 0 ? sign * Number.POSITIVE_INFINITY : Number.NaN;
  return sign * (1 + fraction / 1024) * 2 ** (exponent - 15);
}

/**
 * The element types read, by their kind and size in the dtype string (byte order apart). 64-bit
 * integers beyond 2^53 are read to double precision (nearest double), ample for maps and images.
 */
const ELEMENT_TYPES: Readonly<Record<string, { readonly size: number; readonly read: (view: DataView, at: number, little: boolean) => number }>> = {
  f2: { size: 2, read: (v, at, little) => halfToNumber(v.getUint16(at, little)) },
  f4: { size: 4, read: (v, at, little) => v.getFloat32(at, little) },
  f8: { size: 8, read: (v, at, little) => v.getFloat64(at, little) },
  b1: { size: 1, read: (v, at) => (v.getUint8(at) === 0 ? 0 : 1) },
  u1: { size: 1, read: (v, at) => v.getUint8(at) },
  i1: { size: 1, read: (v, at) => v.getInt8(at) },
  u2: { size: 2, read: (v, at, little) => v.getUint16(at, little) },
  i2: { size: 2, read: (v, at, little) => v.getInt16(at, little) },
  u4: { size: 4, read: (v, at, little) => v.getUint32(at, little) },
  i4: { size: 4, read: (v, at, little) => v.getInt32(at, little) },
  u8: { size: 8, read: (v, at, little) => Number(v.getBigUint64(at, little)) },
  i8: { size: 8, read: (v, at, little) => Number(v.getBigInt64(at, little)) },
};

/** The dtypes read, in words, for the message that refuses another. */
const SUPPORTED = 'a numeric or boolean dtype: float16, float32, float64 (f2, f4, f8), int8 to int64 (i1, i2, i4, i8), ' +
  "uint8 to uint64 (u1, u2, u4, u8) or bool (b1), little-endian '<' or big-endian '>' ('|' for one byte), e.g. '<f4'";

/** The first bytes of a zip archive (local file header), which numpy.savez writes as .npz. */
const ZIP_MAGIC = [0x50, 0x4b, 0x03, 0x04];

type PyValue = string | boolean | number | PyValue[] | { [key: string]: PyValue } | null;

/**
 * A reader of the small Python literal that an NPY header holds: a dict of string keys whose
 * values are strings, True/False/None, integers, tuples or lists (numpy's format description).
 */
class PythonLiteral {
  private at = 0;
  constructor(private readonly text: string, private readonly fail: (why: string) => never) {}

  parseWhole(): PyValue {
    const value = this.value();
    this.space();
    if (this.at !== this.text.length) this.fail(`unexpected text after the header's dict at character ${this.at}`);
    return value;
  }

  private space(): void {
    while (this.at < this.text.length && /\s/.test(this.text[this.at])) this.at++;
  }

  private value(): PyValue {
    this.space();
    const c = this.text[this.at];
    if (c === '{') return this.dict();
    if (c === '(' || c === '[') return this.sequence(c === '(' ? ')' : ']');
    if (c === "'" || c === '"') return this.string();
    const word = /^(True|False|None|-?\d+L?)/.exec(this.text.slice(this.at));
    if (word === null) this.fail(`expected a Python literal at character ${this.at}, found ${JSON.stringify(this.text.slice(this.at, this.at + 12))}`);
    this.at += word[0].length;
    if (word[0] === 'True') return true;
    if (word[0] === 'False') return false;
    if (word[0] === 'None') return null;
    return Number.parseInt(word[0], 10);
  }

  private string(): string {
    const quote = this.text[this.at++];
    let out = '';
    while (this.at < this.text.length && this.text[this.at] !== quote) {
      if (this.text[this.at] === '\\') this.at++;
      out += this.text[this.at++];
    }
    if (this.at >= this.text.length) this.fail('a string in the header is not closed');
    this.at++;
    return out;
  }

  private sequence(close: string): PyValue[] {
    this.at++;
    const items: PyValue[] = [];
    for (;;) {
      this.space();
      if (this.text[this.at] === close) { this.at++; return items; }
      items.push(this.value());
      this.space();
      if (this.text[this.at] === ',') { this.at++; continue; }
      if (this.text[this.at] === close) { this.at++; return items; }
      this.fail(`expected ',' or '${close}' at character ${this.at}`);
    }
  }

  private dict(): { [key: string]: PyValue } {
    this.at++;
    const out: { [key: string]: PyValue } = {};
    for (;;) {
      this.space();
      if (this.text[this.at] === '}') { this.at++; return out; }
      const key = this.value();
      if (typeof key !== 'string') this.fail('expected string keys in the header dict');
      this.space();
      if (this.text[this.at] !== ':') this.fail(`expected ':' after key '${key}' at character ${this.at}`);
      this.at++;
      out[key] = this.value();
      this.space();
      if (this.text[this.at] === ',') { this.at++; continue; }
      if (this.text[this.at] === '}') { this.at++; return out; }
      this.fail(`expected ',' or '}' at character ${this.at}`);
    }
  }
}

/**
 * Decodes the bytes of an NPY file (numpy's NPY format description, versions 1.0, 2.0 and 3.0:
 * the magic string \x93NUMPY, a major and minor version byte, a little-endian header length of 2
 * bytes (1.0) or 4 bytes (2.0, 3.0), then a Python dict literal with 'descr', 'fortran_order' and
 * 'shape', latin-1 (utf-8 in 3.0), and the raw array). Only 2-D arrays of the element types in
 * ELEMENT_TYPES are read (bool as 0 and 1). `source` names the file in error messages.
 */
export function decodeNpy(bytes: Uint8Array, source?: string): NpyImage {
  const fail = (why: string): never => {
    throw new InputError(`not a readable 2-D NPY array: ${why}`, { file: source });
  };
  if (bytes.length >= 4 && ZIP_MAGIC.every((b, k) => bytes[k] === b)) {
    fail('this is a zip archive, as numpy.savez writes (.npz), not one array: save the map alone with numpy.save(\'map.npy\', array)');
  }
  if (bytes.length < 10 || NPY_MAGIC.some((b, k) => bytes[k] !== b)) {
    fail('expected the NPY magic string \\x93NUMPY at the start of the file, found other bytes');
  }
  const major = bytes[6];
  const minor = bytes[7];
  if (major !== 1 && major !== 2 && major !== 3) fail(`expected format version 1.0, 2.0 or 3.0, found ${major}.${minor}`);
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const lengthBytes = major === 1 ? 2 : 4;
  if (bytes.length < 8 + lengthBytes) fail('the file ends inside the header length');
  const headerLength = major === 1 ? view.getUint16(8, true) : view.getUint32(8, true);
  const headerStart = 8 + lengthBytes;
  const dataStart = headerStart + headerLength;
  if (dataStart > bytes.length) fail(`the header says it is ${headerLength} bytes long but the file ends after ${bytes.length - headerStart}`);
  const headerBytes = bytes.subarray(headerStart, dataStart);
  const header = new TextDecoder(major === 3 ? 'utf-8' : 'latin1').decode(headerBytes);
  const dict = new PythonLiteral(header, fail).parseWhole();
  if (dict === null || typeof dict !== 'object' || Array.isArray(dict)) fail('expected the header to be a Python dict');
  const fields = dict as { [key: string]: PyValue };
  for (const key of ['descr', 'fortran_order', 'shape']) {
    if (!(key in fields)) fail(`the header dict has no '${key}'`);
  }
  const { descr, fortran_order: fortranOrder, shape } = fields;
  if (typeof descr !== 'string') fail(`expected 'descr' to be a dtype string such as '<f8', found a structured dtype`);
  const orderChar = (descr as string)[0];
  const element = ELEMENT_TYPES[(descr as string).slice(1)];
  const littleEndian = orderChar === '<' || orderChar === '|';
  if (element === undefined || !(orderChar === '<' || orderChar === '>' || (orderChar === '|' && element.size === 1))) {
    fail(`expected ${SUPPORTED}; found '${descr}'`);
  }
  if (typeof fortranOrder !== 'boolean') fail(`expected 'fortran_order' True or False, found ${JSON.stringify(fortranOrder)}`);
  if (!Array.isArray(shape) || shape.some((n) => typeof n !== 'number' || !Number.isInteger(n) || n < 0)) {
    fail(`expected 'shape' to be a tuple of whole numbers, found ${JSON.stringify(shape)}`);
  }
  const dims = shape as number[];
  if (dims.length !== 2) fail(`expected a 2-D array (shape (rows, columns)), found shape (${dims.join(', ')}${dims.length === 1 ? ',' : ''})`);
  const [ny, nx] = dims;
  if (nx === 0 || ny === 0) fail(`expected a non-empty array, found shape (${ny}, ${nx})`);
  const expectedBytes = nx * ny * element.size;
  const foundBytes = bytes.length - dataStart;
  if (foundBytes !== expectedBytes) {
    fail(`shape (${ny}, ${nx}) of '${descr}' needs ${expectedBytes} data bytes after the header, found ${foundBytes}${foundBytes < expectedBytes ? ' (truncated file)' : ''}`);
  }
  const data = new Float64Array(nx * ny);
  const size = element.size;
  const read = element.read;
  if (fortranOrder) {
    // Column-major: array[j, i] is element j + ny * i.
    for (let i = 0; i < nx; i++) {
      for (let j = 0; j < ny; j++) data[i + nx * j] = read(view, dataStart + (j + ny * i) * size, littleEndian);
    }
  } else {
    for (let p = 0; p < nx * ny; p++) data[p] = read(view, dataStart + p * size, littleEndian);
  }
  return { data, nx, ny, descr: descr as string, fortranOrder: fortranOrder as boolean, version: [major, minor] };
}

/** A 2-D array from an NPY file on disk (see decodeNpy). */
export function readNpy(path: string): NpyImage {
  return decodeNpy(readFileBytes(path), path);
}
