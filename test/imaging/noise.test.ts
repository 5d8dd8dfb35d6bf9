import { describe, expect, it } from 'vitest';
import { addGaussianNoise, noiseSigmaMap } from '../../src/imaging/noise.js';
import { InputError } from '../../src/errors.js';

describe('noise map', () => {
  it('sigma = sqrt(rms^2 + max(model, 0) / t) (Poisson in electrons; hand-computed)', () => {
    const model = Float64Array.of(4, -1, 0, 9);
    const sigma = new Float64Array(4);
    noiseSigmaMap(model, 0.3, 100, sigma);
    // 0.09 + 0.04 = 0.13; negative and zero model: 0.09; 0.09 + 0.09 = 0.18.
    expect(sigma[0]).toBeCloseTo(Math.sqrt(0.13), 15);
    expect(sigma[1]).toBeCloseTo(0.3, 15);
    expect(sigma[2]).toBeCloseTo(0.3, 15);
    expect(sigma[3]).toBeCloseTo(Math.sqrt(0.18), 15);
  });

  it('refuses a non-positive exposure time and a negative rms', () => {
    const s = new Float64Array(1);
    expect(() => noiseSigmaMap(Float64Array.of(1), 0.1, 0, s)).toThrow(InputError);
    expect(() => noiseSigmaMap(Float64Array.of(1), -0.1, 10, s)).toThrow(InputError);
  });
});

describe('seeded Gaussian noise', () => {
  const count = 200_000;
  const image = Float64Array.from({ length: count }, (_, k) => Math.sin(k));
  const sigma = Float64Array.from({ length: count }, (_, k) => 0.5 + (k % 7) * 0.25);

  it('has zero mean and unit variance after dividing by sigma, within the statistical error', () => {
    const out = new Float64Array(count);
    addGaussianNoise(image, sigma, 12345, out);
    let sum = 0;
    let sum2 = 0;
    for (let k = 0; k < count; k++) {
      const z = (out[k] - image[k]) / sigma[k];
      sum += z;
      sum2 += z * z;
    }
    const mean = sum / count;
    const variance = sum2 / count - mean * mean;
    // Standard errors for N(0, 1) samples: mean 1/sqrt(N) = 0.0022, variance sqrt(2/N) = 0.0032.
    // Bounds of 4 standard errors (a false alarm once in ~16000 seeds).
    expect(Math.abs(mean)).toBeLessThan(4 / Math.sqrt(count));
    expect(Math.abs(variance - 1)).toBeLessThan(4 * Math.sqrt(2 / count));
    // And the plain sample standard deviation at one sigma value (1.0, every 7th pixel from k = 2).
    let n = 0;
    let s2 = 0;
    for (let k = 2; k < count; k += 7) {
      const d = out[k] - image[k];
      s2 += d * d;
      n++;
    }
    expect(Math.abs(Math.sqrt(s2 / n) - 1)).toBeLessThan(4 / Math.sqrt(2 * n));
  });

  it('is identical for the same seed and different for another', () => {
    const a = new Float64Array(count);
    const b = new Float64Array(count);
    const c = new Float64Array(count);
    addGaussianNoise(image, sigma, 777, a);
    addGaussianNoise(image, sigma, 777, b);
    addGaussianNoise(image, sigma, 778, c);
    expect(Array.from(a)).toEqual(Array.from(b));
    expect(a.some((v, k) => v !== c[k])).toBe(true);
  });

  it('refuses a seed that is not a whole number from 1 to 2^32 - 1', () => {
    const out = new Float64Array(count);
    expect(() => addGaussianNoise(image, sigma, 0, out)).toThrow(InputError);
    expect(() => addGaussianNoise(image, sigma, 1.5, out)).toThrow(InputError);
  });
});
