import { describe, expect, it } from 'vitest';
import { op, signedLeb128, unsignedLeb128, WASM_TYPE, wasmModuleBytes } from '../../../src/numeric/wasm/wasmModuleBytes.js';

describe('LEB128', () => {
  // The encodings tabled in the DWARF Debugging Information Format, version 4, section 7.6
  // (figures 22 and 23; values from memory, each checked by decoding below).
  it('encodes the DWARF examples', () => {
    const unsigned: Array<[number, number[]]> = [[2, [2]], [127, [127]], [128, [0x80, 1]], [129, [0x81, 1]], [130, [0x82, 1]], [12857, [0xb9, 100]]];
    for (const [value, bytes] of unsigned) expect(unsignedLeb128(value), `${value}`).toEqual(bytes);
    const signed: Array<[number, number[]]> = [[2, [2]], [-2, [0x7e]], [127, [0xff, 0]], [-127, [0x81, 0x7f]], [128, [0x80, 1]], [-128, [0x80, 0x7f]], [129, [0x81, 1]], [-129, [0xff, 0x7e]]];
    for (const [value, bytes] of signed) expect(signedLeb128(value), `${value}`).toEqual(bytes);
  });

  it('round-trips through a plain decoder over the 32-bit range', () => {
    const decodeUnsigned = (bytes: number[]): number => bytes.reduce((sum, b, k) => sum + (b & 0x7f) * 2 ** (7 * k), 0);
    const decodeSigned = (bytes: number[]): number => {
      const magnitude = decodeUnsigned(bytes);
      const bits = 7 * bytes.length;
      return (bytes[bytes.length - 1] & 0x40) !== 0 ? magnitude - 2 ** bits : magnitude;
    };
    for (const value of [0, 1, 63, 64, 8191, 8192, 2 ** 31 - 1, 2 ** 32 - 1]) expect(decodeUnsigned(unsignedLeb128(value))).toBe(value);
    for (const value of [0, -1, 63, -64, 64, -65, 2 ** 31 - 1, -(2 ** 31)]) expect(decodeSigned(signedLeb128(value))).toBe(value);
  });
});

describe('wasmModuleBytes', () => {
  it('makes a module the engine accepts and runs: a f64x2 sum of two pairs in memory', () => {
    // (a0 + b0, a1 + b1) stored at byte 32, from pairs at bytes 0 and 16; the engine's own
    // validation and execution are the reference.
    const bytes = wasmModuleBytes({
      types: [[[], []]],
      functions: [{ type: 0, locals: [], body: [...op.i32Const(32), ...op.i32Const(0), ...op.v128Load(0), ...op.i32Const(0), ...op.v128Load(16), ...op.f64x2Add, ...op.v128Store(0)] }],
      exports: [['run', 0]],
    });
    expect(WebAssembly.validate(bytes)).toBe(true);
    const memory = new WebAssembly.Memory({ initial: 1 });
    const instance = new WebAssembly.Instance(new WebAssembly.Module(bytes), { env: { memory } });
    const values = new Float64Array(memory.buffer, 0, 6);
    values.set([1.5, -2, 0.25, 8]);
    (instance.exports.run as () => void)();
    expect(Array.from(values.subarray(4, 6))).toEqual([1.75, 6]);
    // The vector type's code in the binary format (WebAssembly Core Specification 2.0, sec. 5.3.3).
    expect(WASM_TYPE.v128).toBe(0x7b);
  });

  it('splats a value into both lanes and extracts each lane (f64x2.splat 0x14, extract_lane 0x21)', () => {
    // WebAssembly Core Specification 2.0, sec. 5.4.8 (vector instructions: f64x2.splat is
    // 0xfd 20, f64x2.extract_lane 0xfd 33 followed by the lane); the engine runs the module:
    // byte 16 gets splat(value at 0) * (value at 8, in lane 1 of the pair at 0) ... lane by lane.
    expect(op.f64x2Splat).toEqual([0xfd, 0x14]);
    expect(op.f64x2ExtractLane(1)).toEqual([0xfd, 0x21, 1]);
    expect(op.i32And).toEqual([0x71]);
    // i32.or is 0x72 (sec. 5.4.7); the engine's 6 | 9 = 15 is checked below.
    expect(op.i32Or).toEqual([0x72]);
    const bytes = wasmModuleBytes({
      types: [[[], []]],
      functions: [{
        type: 0, locals: [],
        body: [
          ...op.i32Const(16), ...op.f64Const(3), ...op.f64x2Splat, ...op.i32Const(0), ...op.v128Load(0), ...op.f64x2Mul, ...op.f64x2ExtractLane(1), ...op.f64Store(0),
          ...op.i32Const(24), ...op.i32Const(0), ...op.v128Load(0), ...op.f64x2ExtractLane(0), ...op.f64Store(0),
          ...op.i32Const(32), ...op.i32Const(7), ...op.i32Const(-4), ...op.i32And, ...op.i32Store(0),
          ...op.i32Const(36), ...op.i32Const(6), ...op.i32Const(9), ...op.i32Or, ...op.i32Store(0),
        ],
      }],
      exports: [['run', 0]],
    });
    const memory = new WebAssembly.Memory({ initial: 1 });
    const instance = new WebAssembly.Instance(new WebAssembly.Module(bytes), { env: { memory } });
    const values = new Float64Array(memory.buffer, 0, 4);
    values.set([1.5, -2]);
    (instance.exports.run as () => void)();
    expect(Array.from(values.subarray(2, 4))).toEqual([-6, 1.5]);
    expect(new Int32Array(memory.buffer, 32, 1)[0]).toBe(4);
    expect(new Int32Array(memory.buffer, 36, 1)[0]).toBe(15);
  });

  it('encodes the scalar instructions the kernels use with the opcodes of the specification', () => {
    // WebAssembly Core Specification 2.0, sec. 5.4.6 (i32.store 0x36 with
    // its alignment exponent 2), 5.4.7 (i32.ne 0x47, i32.lt_s 0x48, f64.const 0x44 followed by the
    // IEEE 754 bytes, little-endian).
    expect(op.i32Store(8)).toEqual([0x36, 2, 8]);
    expect(op.i32Ne).toEqual([0x47]);
    expect(op.i32LtS).toEqual([0x48]);
    expect(op.f64Const(1)).toEqual([0x44, 0, 0, 0, 0, 0, 0, 0xf0, 0x3f]);
  });

  it('encodes f64.sub, abs, max and gt with the opcodes of the specification, and the engine runs them', () => {
    // WebAssembly Core Specification 2.0, sec. 5.4.7 (numeric instructions: f64.gt 0x64, f64.abs
    // 0x99, f64.sub 0xa1, f64.max 0xa5).
    expect(op.f64Gt).toEqual([0x64]);
    expect(op.f64Abs).toEqual([0x99]);
    expect(op.f64Sub).toEqual([0xa1]);
    expect(op.f64Max).toEqual([0xa5]);
    // Byte 16 gets max(|a - b|, b) and the i32 at 24 gets (a > b), for a at 0 and b at 8.
    const load = (at: number): number[] => [...op.i32Const(at), ...op.f64Load(0)];
    const bytes = wasmModuleBytes({
      types: [[[], []]],
      functions: [{
        type: 0, locals: [],
        body: [
          ...op.i32Const(16), ...load(0), ...load(8), ...op.f64Sub, ...op.f64Abs, ...load(8), ...op.f64Max, ...op.f64Store(0),
          ...op.i32Const(24), ...load(0), ...load(8), ...op.f64Gt, ...op.i32Store(0),
        ],
      }],
      exports: [['run', 0]],
    });
    const memory = new WebAssembly.Memory({ initial: 1 });
    const run = new WebAssembly.Instance(new WebAssembly.Module(bytes), { env: { memory } }).exports.run as () => void;
    const values = new Float64Array(memory.buffer, 0, 3);
    const flag = new Int32Array(memory.buffer, 24, 1);
    values.set([1.5, 4]);
    run();
    expect([values[2], flag[0]]).toEqual([4, 0]);
    values.set([-3, 2]);
    run();
    expect([values[2], flag[0]]).toEqual([5, 0]);
    values.set([7, 2]);
    run();
    expect([values[2], flag[0]]).toEqual([5, 1]);
  });
});
