import { describe, expect, it } from 'vitest';
import { gaussianPsfKernel, GAUSSIAN_FWHM_PER_SIGMA } from '../../src/imaging/gaussianPsf.js';
import { moffatAlpha, moffatPsfKernel } from '../../src/imaging/moffatPsf.js';
import { checkPsfKernel, type PsfKernel } from '../../src/imaging/psfKernel.js';
import { InputError } from '../../src/errors.js';

/** Width at which the central row falls to `fraction` of its peak, by linear interpolation. */
function widthAtFraction(kernel: PsfKernel, fraction: number, pixelScale: number): number {
  const centre = (kernel.columns - 1) / 2;
  const row = kernel.values.subarray(centre * kernel.columns, (centre + 1) * kernel.columns);
  const level = fraction * row[centre];
  let a = centre;
  while (row[a + 1] > level) a++;
  const right = a + (row[a] - level) / (row[a] - row[a + 1]);
  let b = centre;
  while (row[b - 1] > level) b--;
  const left = b - (row[b] - level) / (row[b] - row[b - 1]);
  return (right - left) * pixelScale;
}

function sum(values: Float64Array): number {
  return values.reduce((s, v) => s + v, 0);
}

describe('Gaussian PSF kernel', () => {
  it('has the requested FWHM when finely sampled', () => {
    // FWHM 1 arcsec on 0.02 arcsec pixels (50 pixels per FWHM). Expected deviations: pixel
    // integration adds s^2/12 to sigma^2 (relative FWHM change 9e-5), linear interpolation of
    // the half-maximum crossing ~1e-4; the bound 1e-3 is above both.
    const kernel = gaussianPsfKernel(1, 0.02);
    expect(kernel.columns % 2).toBe(1);
    expect(Math.abs(widthAtFraction(kernel, 0.5, 0.02) - 1)).toBeLessThan(1e-3);
  });

  it('sums to 1 and matches a brute-force pixel integral (exact erf integration)', () => {
    // Coarse sampling, FWHM 1.5 pixels: the central and an off-centre pixel against a 400 x 400
    // midpoint-rule integral of the normalised Gaussian. The midpoint rule's relative error is
    // ~ (h / sigma)^2 / 24 = 6e-7 for h = s / 400; the kernel's truncation at 2.5 FWHM moves its
    // normalisation by < 1e-7; the bound 1e-5 is above both.
    const scale = 0.1;
    const fwhm = 0.15;
    const kernel = gaussianPsfKernel(fwhm, scale);
    expect(Math.abs(sum(kernel.values) - 1)).toBeLessThan(1e-14);
    const sigma = fwhm / GAUSSIAN_FWHM_PER_SIGMA;
    const centre = (kernel.columns - 1) / 2;
    for (const [a, b] of [[centre, centre], [centre + 1, centre - 2]]) {
      const steps = 400;
      let integral = 0;
      for (let v = 0; v < steps; v++) {
        for (let u = 0; u < steps; u++) {
          const x = (a - centre - 0.5 + (u + 0.5) / steps) * scale;
          const y = (b - centre - 0.5 + (v + 0.5) / steps) * scale;
          integral += Math.exp(-(x * x + y * y) / (2 * sigma * sigma));
        }
      }
      integral *= (scale / steps) ** 2 / (2 * Math.PI * sigma * sigma);
      expect(Math.abs(kernel.values[b * kernel.columns + a] / integral - 1)).toBeLessThan(1e-5);
    }
  });

  it('refuses a non-positive FWHM and an even size', () => {
    expect(() => gaussianPsfKernel(0, 0.05)).toThrow(InputError);
    expect(() => gaussianPsfKernel(0.1, 0.05, 10)).toThrow(InputError);
  });
});

describe('Moffat PSF kernel', () => {
  for (const beta of [2.5, 3, 4.765]) {
    it(`beta = ${beta}: FWHM = 2 alpha sqrt(2^(1/beta) - 1) (Moffat 1969) when finely sampled`, () => {
      // FWHM 1 arcsec on 0.02 arcsec pixels; same error budget as for the Gaussian (1e-3).
      const kernel = moffatPsfKernel(1, beta, 0.02, 201, 3);
      expect(Math.abs(widthAtFraction(kernel, 0.5, 0.02) - 1)).toBeLessThan(1e-3);
      // I(alpha) / I(0) = 2^(-beta): the radius alpha checks beta's role separately from the FWHM.
      const alpha = moffatAlpha(1, beta);
      expect(Math.abs(widthAtFraction(kernel, Math.pow(2, -beta), 0.02) / (2 * alpha) - 1)).toBeLessThan(1e-3);
      expect(Math.abs(sum(kernel.values) - 1)).toBeLessThan(1e-14);
    });
  }

  it('default size leaves about 1e-3 of the flux outside (closed-form enclosed flux)', () => {
    // (1 + r^2 / alpha^2)^(1 - beta) = 1e-3 at the half-width: for beta = 3, FWHM 0.1 arcsec,
    // alpha = 0.0981, r = 0.0981 sqrt(sqrt(1000) - 1) = 0.543 arcsec, 0.05 arcsec pixels:
    // 2 ceil(10.86) + 1 = 23 pixels.
    expect(moffatPsfKernel(0.1, 3, 0.05).columns).toBe(23);
  });

  it('refuses beta <= 1 (infinite flux)', () => {
    expect(() => moffatPsfKernel(0.1, 1, 0.05)).toThrow(/beta/);
  });
});

describe('user PSF kernels', () => {
  it('are checked: odd sizes, finite values, positive sum', () => {
    expect(() => checkPsfKernel(new Float64Array(12), 4, 3, { file: 'psf.fits' })).toThrow(/psf\.fits.*odd/);
    expect(() => checkPsfKernel(new Float64Array(8), 3, 3)).toThrow(/9 values/);
    const withNaN = new Float64Array(9).fill(0.1);
    withNaN[5] = Number.NaN;
    expect(() => checkPsfKernel(withNaN, 3, 3, { file: 'psf.fits' })).toThrow(/pixel \(2, 1\)/);
    expect(() => checkPsfKernel(new Float64Array(9), 3, 3)).toThrow(InputError);
    expect(() => checkPsfKernel(new Float64Array(9).fill(-1), 3, 3)).toThrow(/positive sum/);
  });

  it('are renormalised when they do not sum to 1, and say so', () => {
    const raw = Float64Array.of(0, 1, 0, 1, 4, 1, 0, 1, 0);
    const checked = checkPsfKernel(raw, 3, 3);
    expect(checked.renormalised).toBe(true);
    expect(checked.inputSum).toBe(8);
    expect(checked.kernel.values[4]).toBe(0.5);
    expect(raw[4]).toBe(4); // the input is not modified
    const normalised = checkPsfKernel(raw.map((v) => v / 8), 3, 3);
    expect(normalised.renormalised).toBe(false);
  });
});
