// The inversion's own guard: a mesh with a bright share cannot be laid without the bright pixels
// (arcsift's contract between PixelLikelihood, which finds them once, and SourceInversion; common
// practice: a programming error stops at once with a plain message instead of a mesh without
// its share). Through PixelLikelihood the pixels are always given, so the guard is reached here
// by building the inversion from a likelihood's own setup without them.
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { parseConfig } from '../../src/config/arcsiftConfig.js';
import { readConfigFile } from '../../src/config/readConfigFile.js';
import { loadObservedData } from '../../src/data/index.js';
import { SourceInversion, type InversionSetup } from '../../src/inversion/sourceInversion.js';
import { PixelLikelihood } from '../../src/likelihood/pixelLikelihood.js';
import { simulateToFolder } from '../../src/simulate/simulateToFolder.js';

const configPath = fileURLToPath(new URL('../fixtures/inference/clumpy-lens.yaml', import.meta.url));

describe('SourceInversion with a bright share', () => {
  it('refuses a setup without the bright pixels, and lays the mesh with them', () => {
    const raw = readConfigFile(configPath) as { source: { light: Record<string, unknown>[] } };
    raw.source.light.find((c) => c.kind === 'pixelated')!.mesh = { kind: 'adaptive', cells: 200, brightShare: 0.5 };
    const config = parseConfig(raw, configPath);
    const folder = mkdtempSync(join(tmpdir(), 'arcsift-bright-'));
    simulateToFolder(config, folder, { seed: 3, noiseless: false });
    const likelihood = new PixelLikelihood(config, loadObservedData({ folder }, {}), 0);
    const setup = (likelihood.inversion as unknown as { setup: InversionSetup }).setup;
    expect(setup.brightPixels!.length).toBeGreaterThan(0);
    expect(() => new SourceInversion({ ...setup, brightPixels: undefined })).toThrow(new RangeError('SourceInversion: a bright share needs the bright pixels'));
    const inversion = new SourceInversion(setup);
    expect(Number.isFinite(likelihood.logLikelihood(likelihood.system.configuredValues()))).toBe(true);
    expect(inversion.brightCells).toEqual({ count: 100, signalToNoise: 10 });
  });
});
