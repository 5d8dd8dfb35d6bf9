import { FftConvolver } from '../../src/imaging/convolver.js';
import type { PixelGrid } from '../../src/imaging/pixelGrid.js';
import type { PsfKernel } from '../../src/imaging/psfKernel.js';
import type { LensSystem } from '../../src/model/lensSystem.js';

/**
 * The reference forward model, written for clarity only: for every pixel whose light is
 * computed, the mean over S x S sub-pixel centres (the midpoint rule, common practice) of each
 * basis image, the source traced with the profiles' own deflections (plain Math functions),
 * times the pixel area, then the whole PSF kernel applied by FFT (FftConvolver, itself tested
 * against direct convolution in test/imaging). Returns the model image for `amplitudes`.
 */
export function bruteForceImage(
  system: LensSystem, grid: PixelGrid, supersampling: number, psf: PsfKernel,
  model: Float64Array, amplitudes: Float64Array, computed?: Uint8Array,
): Float64Array {
  const { columns, rows, pixelScaleArcsec: s } = grid;
  const profile = new Float64Array(system.profileVectorLength);
  system.writeProfileVector(model, profile);
  const run = supersampling * supersampling;
  const x = new Float64Array(run), y = new Float64Array(run);
  const ax = new Float64Array(run), ay = new Float64Array(run);
  const bx = new Float64Array(run), by = new Float64Array(run);
  const light = new Float64Array(system.amplitudeCount * run);
  const unconvolved = new Float64Array(columns * rows);
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < columns; i++) {
      const pixel = j * columns + i;
      if (computed !== undefined && computed[pixel] === 0) continue;
      for (let b = 0, r = 0; b < supersampling; b++) {
        for (let a = 0; a < supersampling; a++, r++) {
          x[r] = (i - (columns - 1) / 2 + (a + 0.5) / supersampling - 0.5) * s;
          y[r] = (j - (rows - 1) / 2 + (b + 0.5) / supersampling - 0.5) * s;
        }
      }
      ax.fill(0);
      ay.fill(0);
      for (const term of system.massTerms) term.profile.addDeflection(profile, term.offset, x, y, run, ax, ay);
      for (let r = 0; r < run; r++) {
        bx[r] = x[r] - ax[r];
        by[r] = y[r] - ay[r];
      }
      for (const term of system.sourceTerms) term.profile.writeBasis(profile, term.offset, bx, by, run, light, term.amplitudeOffset * run, run);
      for (const term of system.lensLightTerms) term.profile.writeBasis(profile, term.offset, x, y, run, light, term.amplitudeOffset * run, run);
      let sum = 0;
      for (let k = 0; k < system.amplitudeCount; k++) {
        for (let r = 0; r < run; r++) sum += amplitudes[k] * light[k * run + r];
      }
      unconvolved[pixel] = (sum / run) * s * s;
    }
  }
  const image = new Float64Array(columns * rows);
  new FftConvolver(columns, rows, psf).convolve(unconvolved, image);
  return image;
}
