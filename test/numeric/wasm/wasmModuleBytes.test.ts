import { describe, expect, it } from 'vitest';
import { integer, op, signedLeb128, unsignedLeb128, WASM_TYPE, wasmModuleBytes } from '../../../src/numeric/wasm/wasmModuleBytes.js';

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

  it('encodes the comparisons, division, negation and control of the natural-neighbour kernel, and the engine runs them', () => {
    // WebAssembly Core Specification 2.0 (opcodes from memory, each run below): sec. 5.4.1
    // (control: if 0x04 with the empty block type 0x40, else 0x05, return 0x0f, call 0x10 and the
    // function index), 5.4.3 (parametric: select 0x1b), 5.4.7 (numeric: i32.eq 0x46, i32.div_u
    // 0x6e, i32.rem_u 0x70, i32.or 0x72, f64.eq 0x61, f64.lt 0x63, f64.le 0x65, f64.ge 0x66,
    // f64.neg 0x9a, f64.div 0xa3).
    expect([op.if, op.else, op.return, op.call(1), op.select]).toEqual([[0x04, 0x40], [0x05], [0x0f], [0x10, 1], [0x1b]]);
    expect([op.i32Eq, op.i32DivU, op.i32RemU, op.i32Or]).toEqual([[0x46], [0x6e], [0x70], [0x72]]);
    expect([op.f64Eq, op.f64Lt, op.f64Le, op.f64Ge, op.f64Neg, op.f64Div]).toEqual([[0x61], [0x63], [0x65], [0x66], [0x9a], [0xa3]]);
    const { i32, f64 } = WASM_TYPE;
    const store32 = (at: number, value: number[]): number[] => [...op.i32Const(at), ...value, ...op.i32Store(0)];
    const store64 = (at: number, value: number[]): number[] => [...op.i32Const(at), ...value, ...op.f64Store(0)];
    const a = op.localGet(0), b = op.localGet(1);
    // floats(a, b): the f64 comparisons as i32s at bytes 0..15, a / b at 16 and -a at 24.
    const floats = [
      ...store32(0, [...a, ...b, ...op.f64Eq]), ...store32(4, [...a, ...b, ...op.f64Lt]),
      ...store32(8, [...a, ...b, ...op.f64Le]), ...store32(12, [...a, ...b, ...op.f64Ge]),
      ...store64(16, [...a, ...b, ...op.f64Div]), ...store64(24, [...a, ...op.f64Neg]),
    ];
    // integers(m, n): m == n, m / n, m % n (unsigned), m | n and the smaller by select at 32..51.
    const integers = [
      ...store32(32, [...a, ...b, ...op.i32Eq]), ...store32(36, [...a, ...b, ...op.i32DivU]),
      ...store32(40, [...a, ...b, ...op.i32RemU]), ...store32(44, [...a, ...b, ...op.i32Or]),
      ...store32(48, [...a, ...b, ...a, ...b, ...op.i32LtS, ...op.select]),
    ];
    // sign(m) through if/else and early returns (the final 7 is never reached); signOfSum(m, n) calls it.
    const sign = [
      ...a, ...op.i32Const(0), ...op.i32LtS, ...op.if, ...op.i32Const(-1), ...op.return, ...op.end,
      ...a, ...op.i32Eqz, ...op.if, ...op.i32Const(0), ...op.return, ...op.else, ...op.i32Const(1), ...op.return, ...op.end,
      ...op.i32Const(7),
    ];
    const bytes = wasmModuleBytes({
      types: [[[f64, f64], []], [[i32, i32], []], [[i32], [i32]], [[i32, i32], [i32]]],
      functions: [
        { type: 0, locals: [], body: floats },
        { type: 1, locals: [], body: integers },
        { type: 2, locals: [], body: sign },
        { type: 3, locals: [], body: [...a, ...b, ...op.i32Add, ...op.call(2)] },
      ],
      exports: [['floats', 0], ['integers', 1], ['sign', 2], ['signOfSum', 3]],
    });
    const memory = new WebAssembly.Memory({ initial: 1 });
    const run = new WebAssembly.Instance(new WebAssembly.Module(bytes), { env: { memory } }).exports;
    const flags = new Int32Array(memory.buffer, 0, 13), values = new Float64Array(memory.buffer, 16, 2);
    // The engine's JavaScript operators are the reference, NaN and signed zeros included.
    for (const [x, y] of [[1.5, 2], [2, 1.5], [3, 3], [0, -0], [NaN, 1], [1, NaN], [-Infinity, Infinity]]) {
      (run.floats as (x: number, y: number) => void)(x, y);
      expect(Array.from(flags.subarray(0, 4)), `${x}, ${y}`).toEqual([+(x === y), +(x < y), +(x <= y), +(x >= y)]);
      expect(Object.is(values[0], x / y) && Object.is(values[1], -x), `${x}, ${y}`).toBe(true);
    }
    for (const [m, n] of [[17, 5], [5, 17], [6, 6], [0x7fffffff, 3]]) {
      (run.integers as (m: number, n: number) => void)(m, n);
      expect(Array.from(flags.subarray(8, 13)), `${m}, ${n}`).toEqual([+(m === n), Math.floor(m / n), m % n, m | n, Math.min(m, n)]);
    }
    const signOf = run.sign as (m: number) => number, signOfSum = run.signOfSum as (m: number, n: number) => number;
    expect([signOf(-4), signOf(0), signOf(9), signOfSum(2, -5), signOfSum(-3, 3)]).toEqual([-1, 0, 1, -1, 0]);
  });

  it('builds the shared i32 expressions (a + b, a - b, local += 1) that the engine runs', () => {
    const { plus, minus, increment } = integer;
    // Local 0 starts at 0 (the specification's function invocation sets locals to zero; from
    // memory, and the second value checks it); i32 at 0 gets (7 + 5) - 2,
    // at 4 the local after two increments.
    const bytes = wasmModuleBytes({
      types: [[[], []]],
      functions: [{
        type: 0, locals: [[1, WASM_TYPE.i32]],
        body: [
          ...op.i32Const(0), ...minus(plus(op.i32Const(7), op.i32Const(5)), op.i32Const(2)), ...op.i32Store(0),
          ...increment(0), ...increment(0), ...op.i32Const(4), ...op.localGet(0), ...op.i32Store(0),
        ],
      }],
      exports: [['run', 0]],
    });
    const memory = new WebAssembly.Memory({ initial: 1 });
    (new WebAssembly.Instance(new WebAssembly.Module(bytes), { env: { memory } }).exports.run as () => void)();
    expect(Array.from(new Int32Array(memory.buffer, 0, 2))).toEqual([10, 2]);
  });
});
