import { describe, expect, it } from 'vitest';
import { fileURLToPath } from 'node:url';
import { loadConfig, parseConfig } from '../../src/config/arcsiftConfig.js';
import { buildLensSystem } from '../../src/model/lensSystem.js';
import { ForwardModel } from '../../src/forward/forwardModel.js';
import { gridOfObservation, psfOfObservation } from '../../src/model/observationSetup.js';
import { simulateObservation } from '../../src/simulate/simulateObservation.js';

const demoPath = fileURLToPath(new URL('../../configs/demo.yaml', import.meta.url));

function smallScenario(overrides: { einsteinRadius: number; sourceSigma: number; supersampling: number }): any {
  return {
    observation: {
      columns: 40, rows: 36, pixelScaleArcsec: 0.05, supersampling: overrides.supersampling,
      psf: { shape: 'gaussian', fwhmArcsec: 0.12, sizePixels: 21 },
      noise: { skySigma: 0.01, integrationSeconds: 1000 },
    },
    redshifts: { lens: 0.5, source: 2 },
    lens: { mass: [{ kind: 'isothermalEllipsoid', einsteinRadiusArcsec: overrides.einsteinRadius, axisRatio: 0.8,
      positionAngleDeg: 20, centerXArcsec: 0, centerYArcsec: 0 }] },
    source: { light: [{ kind: 'ellipticalGaussian', amplitude: 5, sigmaArcsec: overrides.sourceSigma, axisRatio: 1,
      positionAngleDeg: 0, centerXArcsec: 0.1, centerYArcsec: -0.05 }] },
  };
}

describe('forward model', () => {
  it('conserves surface brightness: a very wide source looks the same through any lens', () => {
    // Reference: lensing conserves surface brightness (Liouville; e.g. Schneider, Ehlers &
    // Falco 1992, sec. 3.4). A source much wider than the field is uniform to 1e-5 here.
    const config = parseConfig(smallScenario({ einsteinRadius: 0.6, sourceSigma: 200, supersampling: 2 }), 'wide.yaml');
    const system = buildLensSystem(config);
    const grid = gridOfObservation(config.observation);
    const forward = new ForwardModel(system, grid, 2, psfOfObservation(config.observation, config.file));
    const image = forward.image(system.configuredValues(), system.configuredAmplitudes!, new Float64Array(forward.pixelCount));
    const expected = (5 / (2 * Math.PI * 200 * 200)) * grid.pixelScaleArcsec ** 2;
    // Pixels at least 11 from every edge: the PSF kernel (21 x 21) then lies inside the image.
    for (let j = 11; j < grid.rows - 11; j++) {
      for (let i = 11; i < grid.columns - 11; i++) {
        expect(image[j * grid.columns + i] / expected).toBeCloseTo(1, 4);
      }
    }
  });

  it('simulates the demo scenario reproducibly and the subhalo changes the arc', () => {
    const config = loadConfig(demoPath);
    const a = simulateObservation(config, { seed: 5, noiseless: false });
    const b = simulateObservation(config, { seed: 5, noiseless: false });
    expect(Buffer.from(a.image.buffer).equals(Buffer.from(b.image.buffer))).toBe(true);
    const smooth = simulateObservation({ ...config, perturbers: [] }, { seed: 5, noiseless: true });
    let chi2 = 0;
    for (let p = 0; p < a.model.length; p++) if (a.mask[p]) chi2 += ((a.model[p] - smooth.model[p]) / a.noise[p]) ** 2;
    // The planted 1e9 Msun subhalo must leave a visible imprint (common practice: a change of
    // chi-square well above the number of fitted parameters) for the demo to be meaningful.
    expect(chi2).toBeGreaterThan(50);
    expect(a.perturbers[0].massM200Solar).toBeCloseTo(1e9, -3);
  });

  it('gives a likelihood the used pixels alone, the same bits as the whole-grid images there', () => {
    // Two source bases, so the convolver's paired path runs; the whole-grid images stay as they
    // were for computeUsedBasis (nothing reads them in a likelihood) and are right again after
    // computeBasis at another model.
    const raw = smallScenario({ einsteinRadius: 0.6, sourceSigma: 0.08, supersampling: 4 });
    raw.source.light.push({ kind: 'ellipticalGaussian', amplitude: 2, sigmaArcsec: 0.05, axisRatio: 0.7,
      positionAngleDeg: 40, centerXArcsec: -0.05, centerYArcsec: 0.08 });
    // Sampled parameters make the bases vary from call to call (fixed ones are drawn once).
    raw.lens.mass[0].einsteinRadiusArcsec = { value: 0.6, prior: { uniform: [0.5, 0.7] } };
    raw.source.light[0].centerXArcsec = { value: 0.1, prior: { uniform: [0, 0.2] } };
    const config = parseConfig(raw, 'two-bases.yaml');
    const system = buildLensSystem(config);
    const grid = gridOfObservation(config.observation);
    const make = (): ForwardModel => new ForwardModel(system, grid, 4, psfOfObservation(config.observation, config.file));
    const a = system.configuredValues();
    const b = Float64Array.from(a);
    const radius = system.parameters.findIndex((p) => p.name === 'lens.mass[0].einsteinRadiusArcsec');
    expect(radius).toBeGreaterThanOrEqual(0);
    b[radius] = 0.63;
    const lazy = make();
    const before = Float64Array.from(lazy.basis);
    const used = Float64Array.from(lazy.computeUsedBasis(a));
    expect(Array.from(lazy.basis)).toEqual(Array.from(before));
    const whole = make();
    const wholeBasis = whole.computeBasis(a);
    expect(Array.from(used)).toEqual(Array.from(whole.usedBasis));
    const n = whole.usedPixels.length;
    expect(used.length).toBe(2 * n);
    for (let k = 0; k < 2; k++) {
      whole.usedPixels.forEach((p, e) => expect(used[k * n + e]).toBe(wholeBasis[k * grid.columns * grid.rows + p]));
    }
    expect(used.some((v) => v > 0)).toBe(true);
    // After the lazy call, a whole-grid call at another model equals a fresh model's.
    expect(Array.from(lazy.computeBasis(b))).toEqual(Array.from(make().computeBasis(b)));
  });
});
