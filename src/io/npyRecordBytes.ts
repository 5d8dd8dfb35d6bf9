/** One field of an NPY record: a little-endian 64-bit float ('<f8'), or 64-bit integer ('<i8'). */
export interface NpyField {
  readonly name: string;
  readonly integer?: boolean;
}

/** The six bytes every NPY file starts with: \x93 then "NUMPY". */
const NPY_MAGIC = [0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59];

/** A Python string literal of ASCII text (single quotes, backslash and quote escaped). */
function pythonString(text: string): string {
  if (!/^[\x20-\x7e]*$/.test(text)) throw new RangeError(`npyRecordBytes: field name ${JSON.stringify(text)} is not printable ASCII`);
  return `'${text.replaceAll('\\', '\\\\').replaceAll("'", "\\'")}'`;
}

/**
 * The bytes of an NPY file holding a 1-D structured array of `count` records, one field each of
 * `fields`, `valueAt(row, field)` giving the values (integers for integer fields). Layout as the
 * NPY format's specification gives it (numpy NEP 1, numpy.lib.format): magic, version 1.0 (2.0
 * when the header needs more than 65535 bytes), header length, an ASCII dict literal padded with
 * spaces and a newline so that the data start at a multiple of 64 bytes, then the records packed
 * in C order. `numpy.load` returns an array whose columns are named: `a['lnLikelihood']`; it
 * reads headers above 10000 bytes (about 150 fields of 60-character names) only when given a
 * larger `max_header_size`.
 */
export function npyRecordBytes(fields: readonly NpyField[], count: number, valueAt: (row: number, field: number) => number): Uint8Array {
  if (!Number.isInteger(count) || count < 0) throw new RangeError(`npyRecordBytes: count ${count} is not a whole number`);
  const descr = fields.map((f) => `(${pythonString(f.name)}, '${f.integer === true ? '<i8' : '<f8'}')`).join(', ');
  const dict = `{'descr': [${descr}], 'fortran_order': False, 'shape': (${count},), }`;
  const paddedEnd = (preamble: number): number => Math.ceil((preamble + dict.length + 1) / 64) * 64;
  const lengthBytes = paddedEnd(10) - 10 > 65535 ? 4 : 2;
  const preamble = NPY_MAGIC.length + 2 + lengthBytes;
  const padded = paddedEnd(preamble);
  const header = `${dict}${' '.repeat(padded - preamble - dict.length - 1)}\n`;
  const recordBytes = 8 * fields.length;
  const bytes = new Uint8Array(padded + count * recordBytes);
  const view = new DataView(bytes.buffer);
  bytes.set(NPY_MAGIC, 0);
  bytes[6] = lengthBytes === 2 ? 1 : 2;
  bytes[7] = 0;
  if (lengthBytes === 2) view.setUint16(8, header.length, true);
  else view.setUint32(8, header.length, true);
  for (let i = 0; i < header.length; i++) bytes[preamble + i] = header.charCodeAt(i);
  writeRecords(view, padded, fields, count, valueAt);
  return bytes;
}

function writeRecords(
  view: DataView, start: number, fields: readonly NpyField[], count: number, valueAt: (row: number, field: number) => number,
): void {
  let at = start;
  for (let row = 0; row < count; row++) {
    for (let f = 0; f < fields.length; f++) {
      const value = valueAt(row, f);
      if (fields[f].integer === true) {
        if (!Number.isSafeInteger(value)) throw new RangeError(`npyRecordBytes: field ${fields[f].name}, row ${row}: ${value} is not an integer`);
        view.setBigInt64(at, BigInt(value), true);
      } else {
        view.setFloat64(at, value, true);
      }
      at += 8;
    }
  }
}
