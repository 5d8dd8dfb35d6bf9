/**
 * A minimal encoder of WebAssembly modules (the binary format of the WebAssembly Core
 * Specification 2.0, W3C 2022, chapter 5, with the fixed-width SIMD proposal's v128
 * instructions, merged into 2.0): enough for small hand-written numeric kernels that take i32
 * and f64 arguments, call each other and work on an imported memory. Instructions are byte
 * arrays built with `op`.
 */

/** Value types (spec 5.3.1). */
export const WASM_TYPE = Object.freeze({ i32: 0x7f, f64: 0x7c, v128: 0x7b });

/** Unsigned LEB128 (spec 5.2.2). */
export function unsignedLeb128(value: number): number[] {
  const out: number[] = [];
  let rest = value >>> 0;
  do {
    let byte = rest & 0x7f;
    rest >>>= 7;
    if (rest !== 0) byte |= 0x80;
    out.push(byte);
  } while (rest !== 0);
  return out;
}

/** Signed LEB128 of a 32-bit integer (spec 5.2.2). */
export function signedLeb128(value: number): number[] {
  const out: number[] = [];
  let rest = value | 0;
  for (;;) {
    const byte = rest & 0x7f;
    rest >>= 7;
    if ((rest === 0 && (byte & 0x40) === 0) || (rest === -1 && (byte & 0x40) !== 0)) {
      out.push(byte);
      return out;
    }
    out.push(byte | 0x80);
  }
}

/** Instructions (spec 5.4): memory accesses take a byte offset and use 8-byte alignment hints. */
export const op = Object.freeze({
  localGet: (i: number) => [0x20, ...unsignedLeb128(i)],
  localSet: (i: number) => [0x21, ...unsignedLeb128(i)],
  i32Const: (v: number) => [0x41, ...signedLeb128(v)],
  i32Eqz: [0x45], i32Eq: [0x46], i32Ne: [0x47], i32LtS: [0x48], i32GtS: [0x4a], i32GeS: [0x4e],
  i32Add: [0x6a], i32Sub: [0x6b], i32Mul: [0x6c], i32DivU: [0x6e], i32RemU: [0x70], i32And: [0x71], i32Or: [0x72], i32Shl: [0x74],
  i32Load: (offset: number) => [0x28, 2, ...unsignedLeb128(offset)],
  i32Store: (offset: number) => [0x36, 2, ...unsignedLeb128(offset)],
  f64Const: (v: number) => [0x44, ...new Uint8Array(Float64Array.of(v).buffer)],
  f64Load: (offset: number) => [0x2b, 3, ...unsignedLeb128(offset)],
  f64Store: (offset: number) => [0x39, 3, ...unsignedLeb128(offset)],
  f64Add: [0xa0], f64Sub: [0xa1], f64Mul: [0xa2], f64Div: [0xa3], f64Abs: [0x99], f64Neg: [0x9a], f64Max: [0xa5],
  f64Eq: [0x61], f64Lt: [0x63], f64Gt: [0x64], f64Le: [0x65], f64Ge: [0x66],
  block: [0x02, 0x40], loop: [0x03, 0x40], if: [0x04, 0x40], else: [0x05], end: [0x0b],
  return: [0x0f], select: [0x1b],
  call: (f: number) => [0x10, ...unsignedLeb128(f)],
  br: (depth: number) => [0x0c, ...unsignedLeb128(depth)],
  brIf: (depth: number) => [0x0d, ...unsignedLeb128(depth)],
  v128Load: (offset: number) => [0xfd, 0x00, 3, ...unsignedLeb128(offset)],
  v128Load64Splat: (offset: number) => [0xfd, 0x0a, 3, ...unsignedLeb128(offset)],
  v128Load64Zero: (offset: number) => [0xfd, 0x5d, 3, ...unsignedLeb128(offset)],
  v128Store: (offset: number) => [0xfd, 0x0b, 3, ...unsignedLeb128(offset)],
  v128Zero: [0xfd, 0x0c, ...new Array<number>(16).fill(0)],
  f64x2Add: [0xfd, 0xf0, 0x01], f64x2Sub: [0xfd, 0xf1, 0x01], f64x2Mul: [0xfd, 0xf2, 0x01], f64x2Div: [0xfd, 0xf3, 0x01],
  f64x2Splat: [0xfd, 0x14],
  f64x2ExtractLane: (lane: number) => [0xfd, 0x21, lane],
});

/**
 * Element addressing through i32 locals that hold byte addresses: `at` is base + (index << shift)
 * (index an i32 expression), `i32At` and `f64At` load the element there (shift 2 and 3).
 */
export const element = Object.freeze({
  at: (base: number, index: number[], shift: number): number[] => [...op.localGet(base), ...index, ...op.i32Const(shift), ...op.i32Shl, ...op.i32Add],
  i32At: (base: number, index: number[]): number[] => [...element.at(base, index, 2), ...op.i32Load(0)],
  f64At: (base: number, index: number[]): number[] => [...element.at(base, index, 3), ...op.f64Load(0)],
});

/** i32 expressions the kernels share: a + b and a - b of two expressions, and local += 1. */
export const integer = Object.freeze({
  plus: (a: number[], b: number[]): number[] => [...a, ...b, ...op.i32Add],
  minus: (a: number[], b: number[]): number[] => [...a, ...b, ...op.i32Sub],
  increment: (local: number): number[] => [...op.localGet(local), ...op.i32Const(1), ...op.i32Add, ...op.localSet(local)],
});

/** Appends instruction byte arrays to a function body. */
export type Emit = (...parts: number[][]) => void;

/** An Emit that appends to `body`. */
export function emitter(body: number[]): Emit {
  return (...parts) => { for (const part of parts) body.push(...part); };
}

/** One function: its signature's index, its locals as (count, type) runs, and its body without the final `end`. */
export interface WasmFunction {
  readonly type: number;
  readonly locals: ReadonlyArray<readonly [number, number]>;
  readonly body: readonly number[];
}

export interface WasmModuleSpec {
  /** Signatures as (parameter types, result types). */
  readonly types: ReadonlyArray<readonly [readonly number[], readonly number[]]>;
  readonly functions: readonly WasmFunction[];
  /** Exported names of the functions, by index. */
  readonly exports: ReadonlyArray<readonly [string, number]>;
}

/** The bytes of a module importing one memory as env.memory (spec 5.5). */
export function wasmModuleBytes(spec: WasmModuleSpec): Uint8Array<ArrayBuffer> {
  const name = (s: string): number[] => [...unsignedLeb128(s.length), ...Buffer.from(s, 'utf8')];
  const vector = (items: number[][]): number[] => [...unsignedLeb128(items.length), ...items.flat()];
  const section = (id: number, bytes: number[]): number[] => [id, ...unsignedLeb128(bytes.length), ...bytes];
  const types = section(1, vector(spec.types.map(([parameters, results]) => [0x60, ...vector(parameters.map((t) => [t])), ...vector(results.map((t) => [t]))])));
  const imports = section(2, vector([[...name('env'), ...name('memory'), 0x02, 0x00, 0x00]]));
  const functions = section(3, vector(spec.functions.map((f) => unsignedLeb128(f.type))));
  const exports = section(7, vector(spec.exports.map(([exported, index]) => [...name(exported), 0x00, ...unsignedLeb128(index)])));
  const code = section(10, vector(spec.functions.map((f) => {
    const body = [...vector(f.locals.map(([count, type]) => [...unsignedLeb128(count), type])), ...f.body, ...op.end];
    return [...unsignedLeb128(body.length), ...body];
  })));
  return Uint8Array.from([0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00, ...types, ...imports, ...functions, ...exports, ...code]);
}

/**
 * The module of `spec` compiled, or null where the engine rejects it (no WebAssembly, or no
 * SIMD for a module that uses it): callers then run their JavaScript twin.
 */
export function compileWasmModule(spec: WasmModuleSpec): WebAssembly.Module | null {
  if (typeof WebAssembly !== 'object') return null;
  const bytes = wasmModuleBytes(spec);
  return WebAssembly.validate(bytes) ? new WebAssembly.Module(bytes) : null;
}
