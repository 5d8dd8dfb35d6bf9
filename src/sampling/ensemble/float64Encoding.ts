import { InputError, expectedFound } from '../../errors.js';

/** A Float64Array as JSON: little-endian IEEE-754 bytes in base64, so -Infinity and NaN survive. */
export interface EncodedFloat64 {
  readonly encoding: 'float64-le-base64';
  readonly length: number;
  readonly data: string;
}

export function encodeFloat64(values: Float64Array, length = values.length): EncodedFloat64 {
  const bytes = new Uint8Array(8 * length);
  const view = new DataView(bytes.buffer);
  for (let i = 0; i < length; i++) view.setFloat64(8 * i, values[i], true);
  return { encoding: 'float64-le-base64', length, data: Buffer.from(bytes).toString('base64') };
}

/** Decodes `encoded`; `what` names the field (and file) for the error message. */
export function decodeFloat64(encoded: unknown, what: string, file: string): Float64Array {
  const value = encoded as Partial<EncodedFloat64> | null;
  if (value?.encoding !== 'float64-le-base64' || typeof value.data !== 'string'
    || !Number.isInteger(value.length)) {
    throw new InputError(`${what}: ${expectedFound('an encoded float64 array', encoded)}`, { file, key: what });
  }
  const bytes = Buffer.from(value.data, 'base64');
  if (bytes.length !== 8 * (value.length as number)) {
    throw new InputError(
      `${what}: expected ${8 * (value.length as number)} bytes, found ${bytes.length}`, { file, key: what },
    );
  }
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const out = new Float64Array(value.length as number);
  for (let i = 0; i < out.length; i++) out[i] = view.getFloat64(8 * i, true);
  return out;
}
