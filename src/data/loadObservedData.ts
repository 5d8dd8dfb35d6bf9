import type { ObservationConfig } from '../config/arcsiftConfig.js';
import { InputError, pixelText } from '../errors.js';
import { CelestialWcs, parseFitsLocator, type CelestialWcsDescription, type FitsImage } from '../fits/index.js';
import { fileSha256 as fileSha256Of } from '../io/fileSha256.js';
import { pixelGrid } from '../imaging/pixelGrid.js';
import type { PsfKernel } from '../imaging/psfKernel.js';
import { cutOutValues, cutoutBox, type CutoutBox } from './cutoutBox.js';
import { resolveDataFiles, type ObservedDataSource } from './dataFiles.js';
import { dataMaskFromFlags, maskFlagsFromValues } from './dataMask.js';
import { dataPixelScaleArcsec, type DataImage } from './dataPixelScale.js';
import { countsPerSecondScale } from './imageUnits.js';
import { ImagePlaneSky, type SkyGrid } from './imagePlaneSky.js';
import { describeMaskConfig, maskOfObservation } from './maskOfObservation.js';
import { maskedPixelValues } from './maskedPixelValues.js';
import type { ObservedData } from './observedData.js';
import { describePsfConfig, psfOfObservation } from './psfOfObservation.js';
import { readDataImage } from './readDataImage.js';
import { readDataPsf, type DataPsf } from './readDataPsf.js';
import { sharedFloat64Array } from './sharedArrays.js';

/** What the data must match, usually the config's observation section. */
export interface ObservedDataExpectation {
  readonly columns?: number;
  readonly rows?: number;
  readonly pixelScaleArcsec?: number;
  /** Where these values come from, for messages. Default "the config's observation". */
  readonly from?: string;
  /**
   * The config's observation: its PSF and mask stand in for those the data lack, and where the
   * data bring their own the notices say which one is used.
   */
  readonly observation?: ObservationConfig;
  /** The config file: PSF paths in `observation` are relative to it. */
  readonly configFile?: string;
}

function requireShape(data: DataImage, columns: number, rows: number, expectedFrom: string): void {
  const { nx, ny } = data.image;
  if (nx === columns && ny === rows) return;
  throw new InputError(
    `${data.role} shape: expected ${columns} x ${rows} pixels (columns x rows, NAXIS1 x NAXIS2) as ${expectedFrom}, found ${nx} x ${ny}`,
    { file: data.path, key: nx !== columns ? 'NAXIS1' : 'NAXIS2' },
  );
}

function hduName(image: FitsImage): string {
  return `HDU ${image.hduIndex}${image.extname === undefined ? '' : ` (${image.extname})`}`;
}

/** The noise and the image must not be one HDU, which a multi-extension file named without its HDU gives. */
function requireDistinctHdus(image: DataImage, noise: DataImage, imagePath: string, noisePath: string): void {
  if (imagePath !== noisePath || image.image.hduIndex !== noise.image.hduIndex) return;
  throw new InputError(
    `${noise.role} map and image are the same HDU (${hduName(noise.image)}): name the ${noise.role} map's HDU, e.g. ${noisePath}[ERR] for a 1-sigma map or a weight map ${noisePath}[WHT]`,
    { file: noise.path },
  );
}

/**
 * Per-pixel 1-sigma noise, in counts per second, from an inverse-variance map in the image's
 * stored unit: sigma = factor / sqrt(weight). A weight of 0 inside the mask marks a pixel
 * without data: it leaves the mask (`flags` is changed) and is counted. A negative or non-finite
 * weight inside the mask throws InputError naming the pixel of the file.
 */
function noiseFromWeights(
  weights: Float64Array, factor: number, flags: Uint8Array, columns: number, file: string, offset: readonly [number, number],
): { sigma: Float64Array; dropped: number; first: readonly [number, number] | undefined } {
  const sigma = new Float64Array(weights.length);
  let dropped = 0;
  let first: [number, number] | undefined;
  for (let k = 0; k < weights.length; k++) {
    const w = weights[k];
    sigma[k] = factor / Math.sqrt(w);
    if (flags[k] === 0) continue;
    const pixel: [number, number] = [offset[0] + (k % columns), offset[1] + Math.floor(k / columns)];
    if (w === 0) {
      flags[k] = 0;
      dropped++;
      first ??= pixel;
    } else if (!(w > 0) || !Number.isFinite(w)) {
      throw new InputError(`weight value (inverse variance): expected a finite value >= 0 inside the mask (0 = no data), found ${w}`, { file, pixel });
    }
  }
  return { sigma, dropped, first };
}

/**
 * Whether the data's PSF is the config's, as in data `simulate` made from the same config (then
 * there is no difference to report): same size and values within 1e-12 of the peak, far below
 * the rounding of a kernel stored even as 64-bit floats after a resampling.
 */
function samePsf(data: PsfKernel, configKernel: () => PsfKernel): boolean {
  let config: PsfKernel;
  try {
    config = configKernel();
  } catch (error) {
    // The config's PSF cannot be built (a file it names is gone): it differs, and is not used.
    if (error instanceof InputError) return false;
    throw error;
  }
  if (data.columns !== config.columns || data.rows !== config.rows) return false;
  let peak = 0;
  let largest = 0;
  for (let k = 0; k < data.values.length; k++) {
    peak = Math.max(peak, Math.abs(config.values[k]));
    largest = Math.max(largest, Math.abs(data.values[k] - config.values[k]));
  }
  return largest <= 1e-12 * peak;
}

/** Whether two masks use the same pixels. */
function sameFlags(a: Uint8Array, b: Uint8Array): boolean {
  if (a.length !== b.length) return false;
  for (let k = 0; k < a.length; k++) if ((a[k] === 0) !== (b[k] === 0)) return false;
  return true;
}

/** The config's PSF and mask in one place, for the notices that say which one is used. */
function configPart(expected: ObservedDataExpectation): string {
  return expected.configFile === undefined ? "the config's" : `${expected.configFile}'s`;
}

function dataPsf(
  locator: ReturnType<typeof resolveDataFiles>['locators']['psf'], source: ObservedDataSource, expected: ObservedDataExpectation,
  pixelScaleArcsec: number, notices: string[],
): DataPsf {
  const observation = expected.observation;
  if (locator !== undefined) {
    const psf = readDataPsf(locator, pixelScaleArcsec, source.psfOversampling, notices);
    if (observation?.psf !== undefined && !(expected.configFile !== undefined && samePsf(psf.kernel, () => psfOfObservation(observation, expected.configFile as string)))) {
      notices.push(`PSF: the data's ${locator.text} is used; ${configPart(expected)} observation.psf (${describePsfConfig(observation)}) is ignored`);
    }
    return psf;
  }
  if (observation?.psf === undefined || expected.configFile === undefined) {
    throw new InputError(
      `no PSF: expected a PSF file (psf.fits in the data folder, or named explicitly) or observation.psf in the config, found neither`,
      { file: source.folder, key: 'psf' },
    );
  }
  if (source.psfOversampling !== undefined) {
    throw new InputError('PSF oversampling given without a PSF file: it applies to a PSF read from a file', { key: 'psf-oversampling' });
  }
  const kernel: PsfKernel = psfOfObservation(observation, expected.configFile);
  notices.push(`PSF: no PSF file given or found${source.folder === undefined ? '' : ` in ${source.folder}`}; ${configPart(expected)} observation.psf (${describePsfConfig(observation)}) is used`);
  const values = sharedFloat64Array(kernel.values.length);
  values.set(kernel.values);
  return { kernel: { columns: kernel.columns, rows: kernel.rows, values } };
}

/** Where the fitted pixels are on the sky and which way their axes point, so x and y can be read. */
function skyNotice(file: string, grid: SkyGrid & { wcs: CelestialWcsDescription }): string {
  const sky = new ImagePlaneSky(grid, grid.wcs);
  const centre = sky.skyOf(0, 0);
  const angle = (ccw: number): string => sky.eastOfNorthDeg(ccw).toFixed(2);
  return `${file}: celestial WCS (${grid.wcs.frame}, TAN): the image centre (x = y = 0) is at RA ${centre.raDeg.toFixed(6)}, Dec ${centre.decDeg.toFixed(6)} degrees; ` +
    `+x points ${angle(0)} and +y ${angle(90)} degrees east of north, so positions are also reported as RA/Dec and position angles also east of north`;
}

/**
 * Reads and checks an observed data set before any fitting starts. Files may name one HDU of
 * a multi-extension file (`obs.fits[SCI]`); the noise is a 1-sigma map or an inverse-variance
 * (weight) map. Checks and conversions, in order: the files exist and hold 2-D FITS images
 * (noise and image not the same HDU); image, noise and mask share the image's frame; the pixel
 * scale (dataPixelScaleArcsec); the image and noise become counts per second from BUNIT and
 * EXPTIME (countsPerSecondScale); the cut-out, when asked for (cutoutBox); the shape `expected`
 * gives; the PSF, from the data (readDataPsf, oversampled ones sampled at pixel centres) or
 * else the config's; the mask, from the data, else the config's, else every pixel; pixels of
 * zero weight leave the mask; image and noise finite and the noise positive inside the mask.
 * Whatever was assumed or which of config and data was used is said in `notices`; every failure
 * is an InputError naming the file (with its HDU) and, for one pixel, the pixel (column, row)
 * of that file, counted from 0. The sha256 of every file read is kept for the run records.
 */
export function loadObservedData(source: ObservedDataSource, expected: ObservedDataExpectation = {}): ObservedData {
  const { files, locators } = resolveDataFiles(source);
  const fileSha256 = Object.fromEntries(Object.entries(files).map(([role, text]) => [role, fileSha256Of(parseFitsLocator(text).path)]));
  const notices: string[] = [];
  const noiseRole = locators.noiseIsWeight ? 'weight' : 'noise';
  const image: DataImage = { role: 'image', path: files.image, image: readDataImage(locators.image, 'image') };
  const noise: DataImage = { role: noiseRole, path: locators.noise.text, image: readDataImage(locators.noise, noiseRole) };
  const mask: DataImage | undefined = locators.mask === undefined
    ? undefined
    : { role: 'mask', path: locators.mask.text, image: readDataImage(locators.mask, 'mask') };
  requireDistinctHdus(image, noise, locators.image.path, locators.noise.path);
  if (locators.image.selection.hdu === undefined && image.image.hduIndex > 0) {
    notices.push(`${files.image}: the image is ${hduName(image.image)}, the file's first 2-D image; name another HDU as ${files.image}[NAME] or [N]`);
  }

  const expectedFrom = expected.from ?? "the config's observation";
  const { nx: frameColumns, ny: frameRows } = image.image;
  const imageFrom = `the image ${files.image} has`;
  requireShape(noise, frameColumns, frameRows, imageFrom);
  if (mask !== undefined) requireShape(mask, frameColumns, frameRows, imageFrom);
  const others = mask === undefined ? [noise] : [noise, mask];
  const pixelScaleArcsec = dataPixelScaleArcsec(image, others, expected.pixelScaleArcsec, expectedFrom, notices);
  const frameWcs = CelestialWcs.fromHeader(image.image.header, hduName(image.image));

  const imageUnit = countsPerSecondScale(image.image, files.image);
  if (imageUnit.factor !== 1 || imageUnit.bunit === null) notices.push(`${files.image}: ${imageUnit.how}`);
  const noiseUnit = locators.noiseIsWeight ? imageUnit : countsPerSecondScale(noise.image, noise.path, imageUnit);
  if (!locators.noiseIsWeight && noiseUnit.factor !== 1 && noiseUnit.bunit !== null) notices.push(`${noise.path}: ${noiseUnit.how}`);

  let box: CutoutBox | undefined;
  if (source.cutout !== undefined) box = cutoutBox(source.cutout, frameColumns, frameRows, pixelScaleArcsec, frameWcs, files.image, notices);
  const cut = (values: Float64Array): Float64Array => (box === undefined ? values : cutOutValues(values, frameColumns, box));
  const offset: readonly [number, number] = box === undefined ? [0, 0] : [box.column0, box.row0];
  const columns = box?.columns ?? frameColumns;
  const rows = box?.rows ?? frameRows;
  if ((expected.columns !== undefined && expected.columns !== columns) || (expected.rows !== undefined && expected.rows !== rows)) {
    const what = `${columns} x ${rows}${box === undefined ? '' : ' in the cut-out'}`;
    const hint = box === undefined && columns >= (expected.columns ?? 0) && rows >= (expected.rows ?? 0) ? '; to fit part of a larger frame, ask for a cut-out' : '';
    throw new InputError(
      `image shape: expected ${expected.columns ?? columns} x ${expected.rows ?? rows} pixels (columns x rows) as ${expectedFrom} gives, found ${what}${hint}`,
      { file: files.image, key: expected.columns !== undefined && expected.columns !== columns ? 'NAXIS1' : 'NAXIS2' },
    );
  }

  const psf = dataPsf(locators.psf, source, expected, pixelScaleArcsec, notices);

  let flags: Uint8Array;
  let maskWhat = 'the mask';
  const configMask = expected.observation?.mask;
  if (mask !== undefined) {
    flags = Uint8Array.from(cut(Float64Array.from(maskFlagsFromValues(mask.image.data, frameColumns, mask.path))));
    const same = configMask !== undefined && sameFlags(flags, maskOfObservation(configMask, pixelGrid(columns, rows, pixelScaleArcsec)));
    if (configMask !== undefined && !same) {
      notices.push(`mask: the data's ${mask.path} is used; ${configPart(expected)} observation.mask (${describeMaskConfig(configMask)}) is ignored`);
    }
  } else if (configMask !== undefined) {
    flags = maskOfObservation(configMask, pixelGrid(columns, rows, pixelScaleArcsec));
    maskWhat = `${configPart(expected)} observation.mask`;
    notices.push(`mask: no mask file given or found${source.folder === undefined ? '' : ` in ${source.folder}`}; ${configPart(expected)} observation.mask (${describeMaskConfig(configMask)}) is used`);
  } else {
    flags = new Uint8Array(columns * rows).fill(1);
    notices.push(`no mask file given or found${source.folder === undefined ? '' : ` in ${source.folder}`}, nor a mask in the config: every pixel is used`);
  }

  const imageValues = cut(image.image.data).map((v) => v * imageUnit.factor);
  let noiseValues: Float64Array;
  if (locators.noiseIsWeight) {
    const fromWeights = noiseFromWeights(cut(noise.image.data), imageUnit.factor, flags, columns, noise.path, offset);
    noiseValues = fromWeights.sigma;
    if (fromWeights.dropped > 0 && fromWeights.first !== undefined) {
      notices.push(`${noise.path}: ${fromWeights.dropped} pixels inside the mask have weight 0 (no data), first ${pixelText(...fromWeights.first)}; they are not used`);
    }
  } else {
    noiseValues = cut(noise.image.data).map((v) => v * noiseUnit.factor);
  }
  const used = dataMaskFromFlags(flags, maskWhat, mask?.path);
  const checkedImage = maskedPixelValues(imageValues, used.mask, columns, 0, false, files.image, 'image value', offset);
  const checkedNoise = maskedPixelValues(noiseValues, used.mask, columns, 1, true, noise.path, 'noise value (1-sigma)', offset);
  for (const [values, path, replacement] of [[checkedImage, files.image, 0], [checkedNoise, noise.path, 1]] as const) {
    if (values.nonFiniteOutside > 0) {
      notices.push(`${path}: ${values.nonFiniteOutside} pixels outside the mask hold NaN or infinite values; they are not used (set to ${replacement})`);
    }
  }

  const wcs = frameWcs === undefined ? undefined : (box === undefined ? frameWcs : frameWcs.cutOut(box.column0, box.row0)).description;
  if (wcs !== undefined) notices.push(skyNotice(files.image, { columns, rows, pixelScaleArcsec, wcs }));
  return {
    files,
    fileSha256,
    columns,
    rows,
    pixelScaleArcsec,
    image: checkedImage.values,
    noise: checkedNoise.values,
    psf: psf.kernel,
    mask: used.mask,
    usedPixels: used.usedPixels,
    notices,
    imageUnit: imageUnit.how,
    ...(wcs === undefined ? {} : { wcs }),
    ...(psf.oversampled === undefined ? {} : { psfOversampled: psf.oversampled }),
    ...(box === undefined ? {} : { cutout: { column0: box.column0, row0: box.row0, columns: box.columns, rows: box.rows } }),
  };
}
