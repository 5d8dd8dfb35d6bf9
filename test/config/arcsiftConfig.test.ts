import { describe, expect, it } from 'vitest';
import { fileURLToPath } from 'node:url';
import { parse } from 'yaml';
import { readFileSync } from 'node:fs';
import { loadConfig, parseConfig } from '../../src/config/arcsiftConfig.js';
import { InputError } from '../../src/errors.js';

// These tests check arcsift's own validation contract (common practice: every message names the
// file and the key path, says what was expected and what was found).
const demoPath = fileURLToPath(new URL('../../configs/demo.yaml', import.meta.url));
const demo = (): any => parse(readFileSync(demoPath, 'utf8'));

function messageOf(data: unknown): string {
  try {
    parseConfig(data, 'broken.yaml');
  } catch (error) {
    expect(error).toBeInstanceOf(InputError);
    return (error as Error).message;
  }
  throw new Error('expected the config to be rejected');
}

describe('config loading', () => {
  it('reads the demo scenario', () => {
    const config = loadConfig(demoPath);
    expect(config.observation.columns).toBe(100);
    expect(config.observation.psf).toEqual({ shape: 'gaussian', fwhmArcsec: 0.1, sizePixels: 21 });
    expect(config.lensMass[0].entries.einsteinRadiusArcsec).toEqual({
      key: 'lens.mass[0].einsteinRadiusArcsec', value: 1.18, prior: { kind: 'uniform', lower: 1.05, upper: 1.3 },
    });
    expect(config.perturbers).toHaveLength(1);
  });

  it('rejects an unknown key and names its path', () => {
    const data = demo();
    data.observation.pixelScale = 0.05;
    expect(messageOf(data)).toMatch(/^broken\.yaml, key observation\.pixelScale: unknown key/);
  });

  it('refuses the noise keys of earlier versions, naming the key that replaced each', () => {
    const old = demo();
    old.observation.noise = { backgroundRms: 0.003, exposureSeconds: 10000 };
    expect(messageOf(old)).toBe('broken.yaml, key observation.noise.backgroundRms: backgroundRms is no longer read: ' +
      "the key is now skySigma (the sky background's 1-sigma per pixel, counts/s)");
    old.observation.noise = { skySigma: 0.003, exposureSeconds: 10000 };
    expect(messageOf(old)).toBe('broken.yaml, key observation.noise.exposureSeconds: exposureSeconds is no longer read: the key is now integrationSeconds (seconds)');
    const now = demo();
    expect(parseConfig(now, 'demo.yaml').observation.noise).toEqual({ skySigma: 0.003, integrationSeconds: 10000 });
  });

  it('names the key, the expectation and the finding for a wrong type', () => {
    const data = demo();
    data.observation.columns = 'one hundred';
    expect(messageOf(data)).toBe('broken.yaml, key observation.columns: expected a whole number, found "one hundred"');
  });

  it('rejects an even PSF size, a source below the lens and a bad prior form', () => {
    let data = demo();
    data.observation.psf.sizePixels = 20;
    expect(messageOf(data)).toMatch(/observation\.psf\.sizePixels: expected an odd whole number/);
    data = demo();
    data.redshifts.source = 0.4;
    expect(messageOf(data)).toMatch(/redshifts\.source: expected a redshift above the lens redshift \(0\.5\), found 0\.4/);
    data = demo();
    data.lens.mass[0].axisRatio.prior = { uniform: [0.6] };
    expect(messageOf(data)).toMatch(/lens\.mass\[0\]\.axisRatio\.prior\.uniform: expected a list of 2 numbers \[lower, upper\]/);
  });

  it('reads an adaptive mesh\'s bright share and names the key of a bad one', () => {
    const pixelatedPath = fileURLToPath(new URL('../../configs/demo-pixelated.yaml', import.meta.url));
    const raw = (): any => parse(readFileSync(pixelatedPath, 'utf8'));
    const meshOf = (data: any): any => data.source.light.find((c: any) => c.kind === 'pixelated').mesh;
    let data = raw();
    data.source.light.find((c: any) => c.kind === 'pixelated').mesh = { kind: 'adaptive', cells: 1000, brightShare: 0.5 };
    const component = parseConfig(data, 'pixelated.yaml').sourceLight.find((c) => c.kind === 'pixelated');
    expect((component as any).pixelated.mesh).toEqual({ kind: 'adaptive', cells: 1000, brightShare: 0.5, brightSignalToNoise: 10 });
    data = raw();
    meshOf(data).brightShare = 1.2;
    expect(messageOf(data)).toMatch(/source\.light\[5\]\.mesh\.brightShare: expected a number <= 0\.95, found 1\.2/);
    data = raw();
    meshOf(data).brightSignalToNoise = 0;
    expect(messageOf(data)).toMatch(/source\.light\[5\]\.mesh\.brightSignalToNoise: expected a number > 0, found 0/);
  });

  it('reports unreadable and malformed files by name', () => {
    expect(() => loadConfig('/nonexistent/arcsift.yaml')).toThrow(/\/nonexistent\/arcsift\.yaml: cannot read the config file \(ENOENT\)/);
  });
});

describe('example configs', () => {
  it('every config in configs/ loads and assembles into a model with priors', async () => {
    const { readdirSync } = await import('node:fs');
    const { buildLensSystem } = await import('../../src/model/lensSystem.js');
    const { modelParameterSpace } = await import('../../src/model/modelParameterSpace.js');
    const folder = fileURLToPath(new URL('../../configs/', import.meta.url));
    const files = readdirSync(folder).filter((f) => f.endsWith('.yaml'));
    expect(files.length).toBeGreaterThanOrEqual(2);
    const { loadSimulationConfig } = await import('../../src/config/verdictConfig.js');
    for (const file of files) {
      // A verdict config's base (its families are checked in test/verdict/exampleConfig.test.ts).
      const config = loadSimulationConfig(`${folder}${file}`);
      const space = modelParameterSpace(buildLensSystem(config));
      expect(space.dim, file).toBeGreaterThan(0);
    }
  });
});
