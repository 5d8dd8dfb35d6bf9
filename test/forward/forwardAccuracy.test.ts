import { describe, expect, it } from 'vitest';
import { createRequire } from 'node:module';
import type erfType from '@stdlib/math/base/special/erf';
import { parseConfig } from '../../src/config/arcsiftConfig.js';
import { buildLensSystem } from '../../src/model/lensSystem.js';
import { ForwardModel } from '../../src/forward/forwardModel.js';
import { gridOfObservation, psfOfObservation } from '../../src/model/observationSetup.js';
import { gaussianPsfKernel } from '../../src/imaging/gaussianPsf.js';
import { growMaskByKernel } from '../../src/likelihood/growMaskByKernel.js';
import { simulateObservation, type Simulation } from '../../src/simulate/simulateObservation.js';
import { BENCH_SUPERSAMPLING, fitForwardModel, forwardScenarios } from '../../src/bench/forward.js';
import { bruteForceImage } from './bruteForceImage.js';

const require = createRequire(import.meta.url);
const erf = require('@stdlib/math/base/special/erf') as typeof erfType;

/** A small unlensed scene: one circular Gaussian source through a Gaussian PSF. */
function unlensedGaussianScene(supersampling: number): unknown {
  return {
    observation: {
      columns: 40, rows: 36, pixelScaleArcsec: 0.05, supersampling,
      psf: { shape: 'gaussian', fwhmArcsec: 0.12, sizePixels: 21 },
      noise: { skySigma: 0.01, integrationSeconds: 1000 },
    },
    redshifts: { lens: 0.5, source: 2 },
    lens: { mass: [{ kind: 'isothermalEllipsoid', einsteinRadiusArcsec: 0, axisRatio: 0.8,
      positionAngleDeg: 20, centerXArcsec: 0, centerYArcsec: 0 }] },
    source: { light: [{ kind: 'ellipticalGaussian', amplitude: 5, sigmaArcsec: 0.1, axisRatio: 1,
      positionAngleDeg: 0, centerXArcsec: 0.1, centerYArcsec: -0.05 }] },
  };
}

describe('PSF sampling of the forward model', () => {
  it('samples an analytic Gaussian PSF at the pixel centres', () => {
    // Definition (PsfSampling in src/imaging/psfKernel.ts): exp(-r^2 / (2 sigma^2)) at the pixel
    // centres, normalised to sum 1; sigma = FWHM / (2 sqrt(2 ln 2)) (common practice).
    const kernel = gaussianPsfKernel(0.12, 0.05, 7, 'pixelCentre');
    const sigma = 0.12 / (2 * Math.sqrt(2 * Math.LN2));
    let sum = 0;
    for (let b = -3; b <= 3; b++) for (let a = -3; a <= 3; a++) sum += Math.exp(-((a * a + b * b) * 0.0025) / (2 * sigma * sigma));
    for (let b = -3; b <= 3; b++) {
      for (let a = -3; a <= 3; a++) {
        const expected = Math.exp(-((a * a + b * b) * 0.0025) / (2 * sigma * sigma)) / sum;
        expect(kernel.values[(b + 3) * 7 + a + 3]).toBeCloseTo(expected, 15);
      }
    }
  });

  it('without lensing, a Gaussian source through a Gaussian PSF is the pixel-integrated Gaussian of summed variances', () => {
    // Reference: the convolution of two Gaussians is a Gaussian whose variance is the sum
    // (common practice); the model pixel is the mean over the pixel, i.e. that Gaussian
    // integrated over the pixel, exactly with erf (@stdlib/math/base/special/erf). The model
    // takes the pixel mean of the source (supersampling 8: midpoint error ~ (s/8)^2 / 24 times
    // the curvature, < 1e-4 of the peak here) and convolves it with the PSF sampled at pixel
    // centres, a discrete sum standing for the continuous convolution. Measured: 2.4e-4 of the
    // peak; the same model with the pixel-integrated kernel (pixel box applied twice) is off by
    // 1.5e-2 of the peak, so the tolerance 2e-3 tells the two apart with room on both sides.
    const config = parseConfig(unlensedGaussianScene(8), 'unlensed.yaml');
    const system = buildLensSystem(config);
    const grid = gridOfObservation(config.observation);
    const forward = new ForwardModel(system, grid, 8, psfOfObservation(config.observation, config.file));
    const image = forward.image(system.configuredValues(), system.configuredAmplitudes!, new Float64Array(forward.pixelCount));
    const psfSigma = 0.12 / (2 * Math.sqrt(2 * Math.LN2));
    const sigma = Math.hypot(0.1, psfSigma);
    const s = grid.pixelScaleArcsec;
    const cdf = (t: number): number => 0.5 * (1 + erf(t / (Math.SQRT2 * sigma)));
    let peak = 0;
    let worst = 0;
    for (let j = 0; j < grid.rows; j++) {
      for (let i = 0; i < grid.columns; i++) {
        const x = (i - (grid.columns - 1) / 2) * s - 0.1;
        const y = (j - (grid.rows - 1) / 2) * s + 0.05;
        const expected = 5 * (cdf(x + s / 2) - cdf(x - s / 2)) * (cdf(y + s / 2) - cdf(y - s / 2));
        peak = Math.max(peak, expected);
        worst = Math.max(worst, Math.abs(image[j * grid.columns + i] - expected));
      }
    }
    expect(worst / peak).toBeLessThan(2e-3);
  });
});

/** max over the mask of |a - b| / noise. */
function worstOverNoise(simulation: Simulation, a: Float64Array, b: Float64Array): number {
  let worst = 0;
  for (let p = 0; p < a.length; p++) {
    if (simulation.mask[p] !== 0) worst = Math.max(worst, Math.abs(a[p] - b[p]) / simulation.noise[p]);
  }
  return worst;
}

/** The brute-force reference image of a simulation at a model vector (see bruteForceImage.ts). */
function referenceImage(simulation: Simulation, model: Float64Array, supersampling: number): Float64Array {
  const { grid, psf, mask, system, amplitudes } = simulation;
  const computed = growMaskByKernel(mask, grid.columns, grid.rows, psf.columns, psf.rows);
  return bruteForceImage(system, grid, supersampling, psf, model, amplitudes, computed);
}

describe('fast forward model against the brute-force model (supersampling 8 everywhere)', () => {
  // Criterion of the speed work: in every used pixel the fast image agrees with the brute-force
  // image of the same model to better than 1% of that pixel's noise (noise map of the simulated
  // data: background plus the model's Poisson term). The reference is written independently in
  // bruteForceImage.ts: S x S rays in every computed pixel, the profiles' plain Math code, the
  // whole 21 x 21 PSF by FFT.
  const scenarios = forwardScenarios();
  const simulations = new Map(scenarios.map((s) => [s.name, simulateObservation(s.config, { seed: 1, noiseless: false })]));

  it('the criterion is not met by plain supersampling 2 on the demo (so the check can fail)', () => {
    const simulation = simulations.get('demo')!;
    const model = simulation.truthVector;
    const coarse = referenceImage(simulation, model, 2);
    expect(worstOverNoise(simulation, coarse, referenceImage(simulation, model, BENCH_SUPERSAMPLING))).toBeGreaterThan(0.05);
  });

  for (const name of ['demo', 'compactSource']) {
    it(`${name}: within 1% of the noise in every used pixel`, () => {
      const simulation = simulations.get(name)!;
      const model = simulation.truthVector;
      const forward = fitForwardModel(simulation);
      const fast = forward.image(model, simulation.amplitudes, new Float64Array(forward.pixelCount));
      expect(worstOverNoise(simulation, fast, referenceImage(simulation, model, BENCH_SUPERSAMPLING))).toBeLessThan(0.01);
    });
  }

  it('demo at other parameters (rounder, steeper, off-centre source; flatter lens; lighter subhalo elsewhere)', () => {
    // Parameter values inside the demo's priors, far from the truth, so the adaptive sampling
    // meets light it was not tuned on; the same model is evaluated twice in a row (the second
    // time the fixed lens light comes from the cache).
    const simulation = simulations.get('demo')!;
    const model = Float64Array.from(simulation.truthVector);
    const set = (name: string, value: number): void => {
      const index = simulation.system.parameters.findIndex((p) => p.name.endsWith(name));
      expect(index).toBeGreaterThanOrEqual(0);
      model[index] = value;
    };
    set('lens.mass[0].axisRatio', 0.65);
    set('source.light[0].sersicIndex', 3.2);
    set('source.light[0].axisRatio', 0.45);
    set('source.light[0].centerXArcsec', -0.12);
    set('source.light[0].effectiveRadiusArcsec', 0.08);
    set('perturbers[0].log10MassSolar', 8.3);
    set('perturbers[0].centerXArcsec', -1.0);
    const forward = fitForwardModel(simulation);
    const out = new Float64Array(forward.pixelCount);
    forward.image(simulation.truthVector, simulation.amplitudes, out);
    const fast = Float64Array.from(forward.image(model, simulation.amplitudes, out));
    expect(worstOverNoise(simulation, fast, referenceImage(simulation, model, BENCH_SUPERSAMPLING))).toBeLessThan(0.01);
  });

  it('demo at six random draws from its priors (amplitudes held at the truth)', () => {
    // Draws cover the prior box: Sersic index 0.5-4, R_e 0.03-0.6 arcsec, subhalo anywhere in
    // the field, 1e7-1e11 Msun. With the amplitudes at the truth a draw can be three times
    // brighter than the data the tolerance was set from, so this is harsher than a fit, where
    // the amplitudes follow the data.
    const simulation = simulations.get('demo')!;
    const forward = fitForwardModel(simulation);
    const out = new Float64Array(forward.pixelCount);
    let state = 20240601;
    const next = (): number => {
      state = (state * 16807) % 2147483647;
      return state / 2147483647;
    };
    for (let draw = 0; draw < 6; draw++) {
      const model = Float64Array.from(simulation.truthVector);
      simulation.system.parameters.forEach((parameter, index) => {
        const prior = parameter.prior;
        if (prior === undefined) return;
        const u = next();
        if (prior.kind === 'uniform' || prior.kind === 'periodic') model[index] = prior.lower + (prior.upper - prior.lower) * u;
        else if (prior.kind === 'logUniform') model[index] = prior.lower * Math.pow(prior.upper / prior.lower, u);
        else if (prior.kind === 'normal') model[index] = prior.mean + prior.sigma * (2 * u - 1);
      });
      const fast = forward.image(model, simulation.amplitudes, out);
      expect(worstOverNoise(simulation, fast, referenceImage(simulation, model, BENCH_SUPERSAMPLING))).toBeLessThan(0.01);
    }
  });
});
