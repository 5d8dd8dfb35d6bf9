import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { SeededStream } from '../../src/numeric/random/seededStream.js';
import { residualAutocorrelation } from '../../src/results/residualAutocorrelation.js';

// A 24 x 24 image with an annular mask (like a lensed arc's), about 270 used pixels.
const columns = 24, rows = 24;
const used = Array.from({ length: columns * rows }, (_, g) => {
  const r = Math.hypot((g % columns) - 11.5, Math.floor(g / columns) - 11.5);
  return r >= 4 && r <= 11 ? 1 : 0;
});
const whiteNoise = (seed: number): Float64Array => {
  const stream = SeededStream.fromSeed(seed);
  return Float64Array.from({ length: columns * rows }, () => stream.normal());
};
const options = { neighbours: 'rook', permutations: 99, falseAlarmRate: 0.05, seed: 1 } as const;

describe('residual autocorrelation alarm', () => {
  it('on white-noise residuals sounds at its nominal rate, and its z-scores are standard', () => {
    // Under the null the permutation p-value is uniform on {1, ..., 100}/100, so p <= 0.05 has
    // probability exactly 0.05 (Davison & Hinkley 1997, sec. 4.3). 1000 noise images (seeds fixed,
    // so the outcome is too): the binomial standard error is 0.0069; bound 0.021 (3 standard
    // errors). The z-scores (I - E) / sqrt(Var_R) should have mean 0 (SE 0.032) and variance 1
    // (SE about 0.045): bounds 0.1 and 0.15.
    let alarms = 0, sum = 0, square = 0;
    const trials = 1000;
    for (let s = 1; s <= trials; s++) {
      const reading = residualAutocorrelation(whiteNoise(10_000 + s), columns, rows, used, { ...options, seed: s });
      if (reading.alarm) alarms++;
      sum += reading.zScore;
      square += reading.zScore * reading.zScore;
    }
    const mean = sum / trials;
    expect(Math.abs(alarms / trials - 0.05)).toBeLessThan(0.021);
    expect(Math.abs(mean)).toBeLessThan(0.1);
    expect(Math.abs(square / trials - mean * mean - 1)).toBeLessThan(0.15);
  });

  it('sounds on residuals that keep a smooth misfit', () => {
    // White noise plus a Gaussian bump of 3 sigma and 2.5 pixels width on the arc (332 used pixels):
    // neighbours now share the bump, so I rises well above -1/(n - 1) (measured z = 7.3) and no
    // shuffle reaches it. (The same bump at 1.5 sigma gives p = 0.03, at 0.8 sigma z = 0.45: a misfit
    // that small and local is diluted over the mask.)
    const image = whiteNoise(77);
    for (let g = 0; g < image.length; g++) {
      const dx = (g % columns) - 18, dy = Math.floor(g / columns) - 11.5;
      image[g] += 3 * Math.exp(-(dx * dx + dy * dy) / (2 * 2.5 * 2.5));
    }
    const reading = residualAutocorrelation(image, columns, rows, used, options);
    expect(reading.alarm).toBe(true);
    expect(reading.pValue).toBe(0.01);
    expect(reading.zScore).toBeGreaterThan(3);
    expect(reading.statistic).toBeGreaterThan(reading.expectation);
  });

  it('names the pixel of a NaN residual inside the mask, and ignores one outside', () => {
    const image = whiteNoise(3);
    image[0] = Number.NaN; // corner: outside the annulus
    expect(() => residualAutocorrelation(image, columns, rows, used, options)).not.toThrow();
    const inside = 18 + columns * 11;
    image[inside] = Number.NaN;
    expect(() => residualAutocorrelation(image, columns, rows, used, options)).toThrow(InputError);
    expect(() => residualAutocorrelation(image, columns, rows, used, options)).toThrow('pixel (18, 11)');
  });

  it('refuses a mask with too few pixels', () => {
    const tiny = new Array(columns * rows).fill(0);
    tiny[0] = 1;
    tiny[1] = 1;
    expect(() => residualAutocorrelation(whiteNoise(4), columns, rows, tiny, options)).toThrow(InputError);
  });
});
