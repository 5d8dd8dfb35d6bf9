import { existsSync } from 'node:fs';
import { join } from 'node:path';
import type { ArcsiftConfig } from '../config/arcsiftConfig.js';
import { InputError } from '../errors.js';
import { writeFits } from '../fits/index.js';
import type { HeaderCard } from '../fits/headerCard.js';
import type { PixelGrid } from '../imaging/pixelGrid.js';
import { writeJsonAtomic } from '../io/writeFileAtomic.js';
import { simulateObservation, type Simulation, type SimulationOptions } from './simulateObservation.js';
import { packageVersion } from '../io/packageVersion.js';
import type { TruthFile, TruthPerturber } from '../records/truthFile.js';

/** Cards saying what a pixel is: the pixel scale as CDELT in degrees, centred reference pixel. */
export function gridCards(grid: PixelGrid, unit: string, what: string): HeaderCard[] {
  const degrees = grid.pixelScaleArcsec / 3600;
  return [
    { keyword: 'BUNIT', kind: 'string', value: unit },
    { keyword: 'CTYPE1', kind: 'string', value: 'OFFSET-X', comment: 'x offset from the image centre' },
    { keyword: 'CTYPE2', kind: 'string', value: 'OFFSET-Y', comment: 'y offset from the image centre' },
    { keyword: 'CUNIT1', kind: 'string', value: 'deg' },
    { keyword: 'CUNIT2', kind: 'string', value: 'deg' },
    { keyword: 'CRPIX1', kind: 'float', value: (grid.columns + 1) / 2 },
    { keyword: 'CRPIX2', kind: 'float', value: (grid.rows + 1) / 2 },
    { keyword: 'CRVAL1', kind: 'float', value: 0 },
    { keyword: 'CRVAL2', kind: 'float', value: 0 },
    { keyword: 'CDELT1', kind: 'float', value: degrees, comment: `${grid.pixelScaleArcsec} arcsec per pixel` },
    { keyword: 'CDELT2', kind: 'float', value: degrees },
    { keyword: 'ORIGIN', kind: 'string', value: `arcsift ${packageVersion()}` },
    { keyword: 'COMMENT', kind: 'commentary', text: what },
  ];
}

/** The truth file's content: every parameter with its unit, the cosmology and derived masses. */
export function truthRecord(config: ArcsiftConfig, simulation: Simulation, options: SimulationOptions): TruthFile {
  const { system } = simulation;
  const lensing = system.lensing;
  return {
    title: config.title,
    config: config.file,
    arcsiftVersion: packageVersion(),
    seed: options.seed,
    noiseless: options.noiseless,
    observation: config.observation,
    cosmology: {
      name: lensing.cosmologyName,
      hubbleConstantKmPerSecPerMpc: 100 * lensing.littleH,
    },
    redshifts: { lens: lensing.lensRedshift, source: lensing.sourceRedshift },
    lensing: {
      lensDistanceMpc: lensing.lensDistanceMpc,
      sourceDistanceMpc: lensing.sourceDistanceMpc,
      lensToSourceDistanceMpc: lensing.lensToSourceDistanceMpc,
      criticalSurfaceDensitySolarPerMpc2: lensing.criticalSurfaceDensitySolarPerMpc2,
      criticalSurfaceDensitySolarPerArcsec2: lensing.criticalSurfaceDensitySolarPerArcsec2,
      kpcPerArcsec: lensing.kpcPerArcsec,
    },
    parameters: system.parameters.map((p, index) => ({ name: p.name, value: simulation.truthVector[index], unit: p.unit })),
    amplitudes: system.amplitudeNames.map((name, index) => ({
      name, value: simulation.amplitudes[index], unit: 'counts/s/arcsec^2',
    })),
    perturbers: simulation.perturbers.map((p): TruthPerturber => ({ ...p })),
    imageUnit: 'counts/s per pixel',
    files: {
      'image.fits': 'observed image (model plus noise, or the model with --noiseless)',
      'noise.fits': 'per-pixel 1-sigma noise: sqrt(skySigma^2 + model / integrationSeconds)',
      'psf.fits': 'PSF kernel, summing to 1',
      'mask.fits': '1 where a pixel is used in a fit, 0 elsewhere',
    },
  };
}

/** The files `simulateToFolder` writes, in order. */
export const SIMULATED_FILES: readonly string[] = ['image.fits', 'noise.fits', 'psf.fits', 'mask.fits', 'truth.json'];

/**
 * Simulates the config and writes image.fits, noise.fits, psf.fits, mask.fits and truth.json
 * into `folder`. A folder that already holds any of them is refused (an InputError naming them)
 * unless `overwrite`: a finished run's record names its data files, and silently replacing them
 * would make its report show data it was not fitted to. Everything is computed before anything
 * is written, and each file is written atomically. Returns the paths written.
 */
export function simulateToFolder(config: ArcsiftConfig, folder: string, options: SimulationOptions & { readonly overwrite?: boolean }): string[] {
  const present = SIMULATED_FILES.filter((name) => existsSync(join(folder, name)));
  if (present.length > 0 && options.overwrite !== true) {
    throw new InputError(`already holds a data set (${present.join(', ')}): choose another --out, or pass --force to replace it`, { file: folder });
  }
  const simulation = simulateObservation(config, options);
  const { grid, psf } = simulation;
  const psfGrid = { columns: psf.columns, rows: psf.rows, pixelScaleArcsec: grid.pixelScaleArcsec };
  const files: [string, Float64Array, PixelGrid, string, string, -64 | 8][] = [
    ['image.fits', simulation.image, grid, 'counts/s', 'arcsift simulated observation', -64],
    ['noise.fits', simulation.noise, grid, 'counts/s', 'per-pixel 1-sigma noise', -64],
    ['psf.fits', psf.values, psfGrid, '', 'PSF kernel, sum 1', -64],
    ['mask.fits', Float64Array.from(simulation.mask), grid, '', '1 = pixel used in fits', 8],
  ];
  const written: string[] = [];
  const truth = truthRecord(config, simulation, options);
  for (const [name, data, g, unit, what, bitpix] of files) {
    const path = join(folder, name);
    writeFits(path, { primary: { data, nx: g.columns, ny: g.rows, bitpix, cards: gridCards(g, unit, what) } });
    written.push(path);
  }
  const truthPath = join(folder, 'truth.json');
  writeJsonAtomic(truthPath, truth);
  written.push(truthPath);
  return written;
}
