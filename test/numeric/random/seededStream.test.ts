import { describe, expect, it } from 'vitest';
import { InputError } from '../../../src/errors.js';
import { SeededStream } from '../../../src/numeric/random/seededStream.js';

describe('SeededStream', () => {
  it('restores its exact state from JSON', () => {
    const random = SeededStream.fromSeed(99);
    for (let i = 0; i < 1000; i++) random.normal();
    const saved = JSON.parse(JSON.stringify(random.savedState()));
    const ahead = [random.uniform(), random.normal(), random.integer(7), random.normal()];
    const other = SeededStream.fromSavedState(saved, 'saved state');
    expect([other.uniform(), other.normal(), other.integer(7), other.normal()]).toEqual(ahead);
    expect(() => SeededStream.fromSavedState({ generator: 'mt19937', words: [1, 2, 3] }, 'saved state')).toThrow(InputError);
  });

  it('is fixed by the seed', () => {
    const a = SeededStream.fromSeed(5);
    const b = SeededStream.fromSeed(5);
    const c = SeededStream.fromSeed(6);
    const first = Array.from({ length: 5 }, () => a.uniform());
    expect(Array.from({ length: 5 }, () => b.uniform())).toEqual(first);
    expect(Array.from({ length: 5 }, () => c.uniform())).not.toEqual(first);
    expect(() => SeededStream.fromSeed(0)).toThrow(/seed: expected an integer from 1 to 4294967295, found 0/);
    expect(() => SeededStream.fromSeed(1.5)).toThrow(InputError);
  });

  it('draws uniforms, normals and integers with the right moments', () => {
    // Standard results: U(0,1) has mean 1/2, variance 1/12; N(0,1) mean 0, variance 1, fourth
    // moment 3. With n = 2e5 the standard errors are 6.5e-4 (uniform mean), 2.2e-3 (normal mean),
    // 3.2e-3 (normal variance, sd sqrt(2/n)) and 0.022 (fourth moment, sd sqrt(96/n)); bounds are
    // 5 of those.
    const random = SeededStream.fromSeed(2024);
    const n = 200000;
    let su = 0;
    let sz = 0;
    let sz2 = 0;
    let sz4 = 0;
    const counts = new Float64Array(5);
    for (let i = 0; i < n; i++) {
      su += random.uniform();
      const z = random.normal();
      sz += z;
      sz2 += z * z;
      sz4 += z ** 4;
      counts[random.integer(5)]++;
    }
    expect(Math.abs(su / n - 0.5)).toBeLessThan(5 * Math.sqrt(1 / 12 / n));
    expect(Math.abs(sz / n)).toBeLessThan(5 / Math.sqrt(n));
    expect(Math.abs(sz2 / n - 1)).toBeLessThan(5 * Math.sqrt(2 / n));
    expect(Math.abs(sz4 / n - 3)).toBeLessThan(5 * Math.sqrt(96 / n));
    // integer(5): each face n/5 with binomial sd sqrt(n p (1 - p)).
    for (const count of counts) expect(Math.abs(count - n / 5)).toBeLessThan(5 * Math.sqrt(n * 0.2 * 0.8));
  });
});
