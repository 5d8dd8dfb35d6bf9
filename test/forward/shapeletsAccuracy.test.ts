import { describe, expect, it } from 'vitest';
import { fileURLToPath } from 'node:url';
import { parseConfig } from '../../src/config/arcsiftConfig.js';
import { readConfigFile } from '../../src/config/readConfigFile.js';
import { ForwardModel } from '../../src/forward/forwardModel.js';
import { usedPixelIndices } from '../../src/imaging/mask.js';
import { growMaskByKernel } from '../../src/likelihood/growMaskByKernel.js';
import { MarginalisedAmplitudes } from '../../src/likelihood/marginalisedAmplitudes.js';
import { buildLensSystem } from '../../src/model/lensSystem.js';
import { simulateObservation } from '../../src/simulate/simulateObservation.js';
import { scenarioConfig } from '../../src/bench/pixelSource.js';
import { bruteForceImage } from './bruteForceImage.js';

const configPath = fileURLToPath(new URL('../../configs/demo-pixelated.yaml', import.meta.url));

describe('fast forward model of a many-basis source against the brute-force model', () => {
  // The bench point of `npm run bench -- pixelSource --only shapelets10`: the clumpy source of
  // configs/demo-pixelated.yaml (seed 1) fitted with shapelets of order 10 (66 bases, beta
  // 0.1 arcsec, whose highest orders oscillate on the pixel scale), smooth lens at the config's
  // values. The reference is bruteForceImage.ts (S x S rays in every computed pixel, the plain
  // profiles, the whole PSF by FFT).
  const truth = parseConfig(readConfigFile(configPath), configPath);
  const simulation = simulateObservation(truth, { seed: 1, noiseless: false });
  const config = scenarioConfig('shapelets10');
  const system = buildLensSystem(config, { perturberCount: 0 });
  const { grid, psf, mask, image, noise } = simulation;
  const used = usedPixelIndices(mask);
  const computed = growMaskByKernel(mask, grid.columns, grid.rows, psf.columns, psf.rows);
  let peakBrightness = 0;
  for (const p of used) peakBrightness = Math.max(peakBrightness, image[p]);
  const model = system.configuredValues();
  const supersampling = config.observation.supersampling;
  const forward = new ForwardModel(system, grid, supersampling, psf, { computed, used, noise, peakBrightness });
  const marginal = new MarginalisedAmplitudes(
    Float64Array.from(used, (p) => image[p]), Float64Array.from(used, (p) => noise[p]), system.amplitudeCount, config.amplitudePriorSigma,
  );
  /** ln L of the data and the posterior-mean amplitudes for a model's basis images. */
  const fit = (basis: Float64Array): { logLikelihood: number; amplitudes: Float64Array } => {
    const packed = new Float64Array(system.amplitudeCount * used.length);
    for (let k = 0; k < system.amplitudeCount; k++) {
      for (let e = 0; e < used.length; e++) packed[k * used.length + e] = basis[k * forward.pixelCount + used[e]];
    }
    const logLikelihood = marginal.logLikelihood(packed);
    return { logLikelihood, amplitudes: Float64Array.from(marginal.amplitudes) };
  };
  const fast = fit(forward.computeBasis(model));

  it('is the scenario it claims to be (66 shapelet bases, most arc pixels at S x S)', () => {
    expect(forward.varying.basisCount).toBe(66);
    expect(forward.varying.pixelsByLevel[forward.varying.pixelsByLevel.length - 1]).toBeGreaterThan(1000);
  });

  it('within 1% of the noise in every used pixel at the fitted amplitudes', () => {
    // The criterion of test/forward/forwardAccuracy.test.ts, at the amplitudes a fit gives
    // (posterior mean of the fast basis; the source is a sum of 66 bases, so an error of each
    // counts as much as that basis's amplitude). Measured: 3.3e-5 of the noise.
    const fastImage = forward.image(model, fast.amplitudes, new Float64Array(forward.pixelCount));
    const reference = bruteForceImage(system, grid, supersampling, psf, model, fast.amplitudes, computed);
    let worst = 0;
    for (const p of used) worst = Math.max(worst, Math.abs(fastImage[p] - reference[p]) / noise[p]);
    expect(worst).toBeLessThan(0.01);
  });

  it('changes ln L by less than 0.01 from the brute-force basis', () => {
    // ln L with the amplitudes integrated out (MarginalisedAmplitudes) for the fast and for the
    // brute-force basis images (relativeTolerance 0: S x S rays everywhere, the whole PSF). 0.01
    // is a tenth of the error a nested-sampling ln Z usually carries, so differences below it do
    // not move a Bayes factor. Measured: 1.2e-3.
    const brute = new ForwardModel(system, grid, supersampling, psf, { computed, used, relativeTolerance: 0 });
    const reference = fit(brute.computeBasis(model));
    expect(Math.abs(fast.logLikelihood - reference.logLikelihood)).toBeLessThan(0.01);
  });
});
