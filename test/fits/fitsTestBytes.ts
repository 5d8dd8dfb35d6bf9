// Byte builders for FITS tests: header records typed in by hand, padded as FITS Standard 4.0 sec. 3.3 says.
const BLOCK = 2880;

/** One 80-byte keyword record from text that must fit in it. */
export function record(text: string): string {
  if (text.length > 80) throw new Error(`test record longer than 80 characters: ${text}`);
  return text.padEnd(80);
}

/** Header records (END included by the caller) as bytes, blank-padded to whole 2880-byte blocks. */
export function headerBytes(records: readonly string[]): Uint8Array {
  const text = records.map(record).join('');
  const bytes = new Uint8Array(Math.ceil(text.length / BLOCK) * BLOCK).fill(0x20);
  for (let i = 0; i < text.length; i++) bytes[i] = text.charCodeAt(i);
  return bytes;
}

/** Data bytes given one by one, zero-padded to whole 2880-byte blocks. */
export function dataBytes(bytes: readonly number[]): Uint8Array {
  const out = new Uint8Array(Math.ceil(bytes.length / BLOCK) * BLOCK);
  out.set(bytes);
  return out;
}

export function concatBytes(...parts: readonly Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((total, part) => total + part.length, 0));
  let offset = 0;
  for (const part of parts) {
    out.set(part, offset);
    offset += part.length;
  }
  return out;
}

/** Calls `action` and returns the error it throws, failing the test when it throws nothing. */
export function thrown(action: () => unknown): Error {
  try {
    action();
  } catch (error) {
    return error as Error;
  }
  throw new Error('expected an error, none was thrown');
}
