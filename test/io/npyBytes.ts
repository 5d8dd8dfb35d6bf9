// Bytes built by hand following numpy's published NPY format description (numpy.lib.format,
// "NPY format" in the numpy documentation): the 6-byte magic \x93NUMPY, major and minor
// version bytes, the header length as a little-endian uint16 (1.0) or uint32 (2.0, 3.0), the
// header (a Python dict literal padded with spaces and ending in '\n' so that the data start on
// a multiple of 64 bytes), then the raw elements in C (row-major) or Fortran (column-major) order.
export function npyBytes(options: {
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
