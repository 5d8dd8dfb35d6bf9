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
});
