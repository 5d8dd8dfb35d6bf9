import { ConfigNode } from './configNode.js';
import { readConfigFile } from './readConfigFile.js';
import { readParameterEntry, type ParameterEntry } from './parameterEntry.js';
import { expectedFound } from '../errors.js';
import { PIXELATED_SETTING_KEYS, readPixelatedSource, type PixelatedSourceConfig } from './pixelatedSourceConfig.js';

/** A mass or light component as written: its kind and its parameter entries by name. */
export interface ComponentConfig {
  readonly kind: string;
  /** Dotted key of the component, e.g. `source.light[0]`. */
  readonly key: string;
  /** Whole-number settings that are not parameters (shapelet or multipole order). */
  readonly order: number | undefined;
  /** Fixed coefficient list (shapelet amplitudes for simulation), when given. */
  readonly coefficients: readonly number[] | undefined;
  readonly entries: Readonly<Record<string, ParameterEntry>>;
  /** Perturbers only: a joint prior on the position, uniform over a region (default: the box of the x and y priors). */
  readonly positionPrior?: PositionPriorConfig;
  /** A `pixelated` source's mesh and regularisation. */
  readonly pixelated?: PixelatedSourceConfig;
  /** True for a component `simulate` draws but a fit leaves out (e.g. the clumps of a mock source fitted by a pixelated one). */
  readonly simulateOnly?: boolean;
}

/** A uniform prior over the used pixels of the mask, or over a disc. */
export type PositionPriorConfig =
  | { readonly region: 'mask' }
  | { readonly region: 'disc'; readonly centerXArcsec: number; readonly centerYArcsec: number; readonly radiusArcsec: number };

function readPositionPrior(node: ConfigNode): PositionPriorConfig {
  if (node.value === 'mask') return { region: 'mask' };
  if (!node.isMapping() || !node.has('disc')) {
    node.fail(expectedFound('mask, or { disc: [centerXArcsec, centerYArcsec, radiusArcsec] }', node.value));
  }
  const disc = node.get('disc');
  const values = disc.list();
  if (values.length !== 3) disc.fail(expectedFound('a list of 3 numbers [centerXArcsec, centerYArcsec, radiusArcsec]', disc.value));
  const [centerXArcsec, centerYArcsec] = values.slice(0, 2).map((v) => v.number());
  const radiusArcsec = values[2].number({ min: 0, exclusiveMin: true });
  node.finish();
  return { region: 'disc', centerXArcsec, centerYArcsec, radiusArcsec };
}

export type PsfConfig =
  | { readonly shape: 'gaussian'; readonly fwhmArcsec: number; readonly sizePixels: number }
  | { readonly shape: 'moffat'; readonly fwhmArcsec: number; readonly moffatBeta: number; readonly sizePixels: number }
  | { readonly shape: 'file'; readonly path: string };

export type MaskConfig =
  | { readonly shape: 'all' }
  | { readonly shape: 'disc'; readonly outerRadiusArcsec: number; readonly centerXArcsec: number; readonly centerYArcsec: number }
  | { readonly shape: 'annulus'; readonly innerRadiusArcsec: number; readonly outerRadiusArcsec: number; readonly centerXArcsec: number; readonly centerYArcsec: number };

/**
 * The noise model `simulate` draws from: sigma = sqrt(skySigma^2 + model / integrationSeconds),
 * all in counts per second per pixel.
 */
export interface NoiseConfig {
  /** The sky background's (and read noise's) 1-sigma per pixel, counts/s. */
  readonly skySigma: number;
  /** The integration time whose photon counts make the source's Poisson noise, seconds. */
  readonly integrationSeconds: number;
}

/** Noise keys of earlier versions, refused with the name that replaced each. */
const RENAMED_NOISE_KEYS: Readonly<Record<string, string>> = {
  backgroundRms: 'skySigma (the sky background\'s 1-sigma per pixel, counts/s)',
  exposureSeconds: 'integrationSeconds (seconds)',
};

function readNoise(node: ConfigNode): NoiseConfig | undefined {
  if (node.value === undefined) return undefined;
  if (node.isMapping()) {
    for (const [old, now] of Object.entries(RENAMED_NOISE_KEYS)) {
      if (node.has(old)) node.fail(`${old} is no longer read: the key is now ${now}`, `${node.key}.${old}`);
    }
  }
  const skySigma = node.get('skySigma').number({ min: 0, exclusiveMin: true });
  const integrationSeconds = node.get('integrationSeconds').number({ min: 0, exclusiveMin: true });
  node.finish();
  return { skySigma, integrationSeconds };
}

/**
 * The observation a config describes. A fit takes its noise from the data and its PSF and mask
 * from the data when they bring them, so a config for fitting needs only the grid (and a PSF or
 * mask where the data have none); `simulate` needs the PSF and the noise as well.
 */
export interface ObservationConfig {
  readonly columns: number;
  readonly rows: number;
  readonly pixelScaleArcsec: number;
  readonly supersampling: number;
  /** Absent when the config gives no PSF (the data must then bring one). */
  readonly psf: PsfConfig | undefined;
  /** Absent when the config gives no noise model (fitting reads the data's noise map). */
  readonly noise: NoiseConfig | undefined;
  /** Absent when the config gives no mask: the data's mask, or every pixel. */
  readonly mask: MaskConfig | undefined;
}

/**
 * The cosmology a config asks for: a named published parameter set (`cosmology: wmap9`; the
 * cosmology module knows the names), or explicit values (`cosmology: { hubbleConstant: 70,
 * matterDensity: 0.3 }`).
 */
export type CosmologyConfig =
  | { readonly set: string }
  | { readonly hubbleConstantKmPerSecPerMpc: number; readonly matterDensity: number };

export interface ArcsiftConfig {
  /** The file the config came from (for messages). */
  readonly file: string;
  readonly title: string;
  readonly observation: ObservationConfig;
  /** Undefined means the default cosmology. */
  readonly cosmology: CosmologyConfig | undefined;
  readonly lensRedshift: number;
  readonly sourceRedshift: number;
  readonly lensMass: readonly ComponentConfig[];
  readonly shear: ComponentConfig | undefined;
  readonly multipoles: readonly ComponentConfig[];
  readonly lensLight: readonly ComponentConfig[];
  readonly sourceLight: readonly ComponentConfig[];
  readonly perturbers: readonly ComponentConfig[];
  /** Width (1 sigma) of the Gaussian prior on every linear light amplitude, image units. */
  readonly amplitudePriorSigma: number;
}

function readComponent(node: ConfigNode, kindRequired = true): ComponentConfig {
  if (!node.isMapping()) node.fail(expectedFound('a mapping describing one component', node.value));
  const kind = kindRequired ? node.get('kind').string() : '';
  const entries: Record<string, ParameterEntry> = {};
  let order: number | undefined;
  let coefficients: number[] | undefined;
  let positionPrior: PositionPriorConfig | undefined;
  let simulateOnly: boolean | undefined;
  const pixelated = kind === 'pixelated' && node.key.startsWith('source') ? readPixelatedSource(node) : undefined;
  for (const name of node.keys()) {
    if (name === 'kind' || (pixelated !== undefined && (PIXELATED_SETTING_KEYS as readonly string[]).includes(name))) continue;
    const child = node.get(name);
    if (name === 'simulateOnly') {
      simulateOnly = child.boolean();
    } else if (name === 'positionPrior' && node.key.startsWith('perturbers')) {
      positionPrior = readPositionPrior(child);
    } else if (name === 'order') {
      order = child.number({ integer: true, min: 0 });
    } else if (name === 'coefficients') {
      coefficients = child.list().map((c) => c.number());
    } else {
      entries[name] = readParameterEntry(child);
    }
  }
  return {
    kind, key: node.key, order, coefficients, entries,
    ...(positionPrior === undefined ? {} : { positionPrior }),
    ...(pixelated === undefined ? {} : { pixelated }),
    ...(simulateOnly === undefined ? {} : { simulateOnly }),
  };
}

function readComponentList(node: ConfigNode): ComponentConfig[] {
  if (node.value === undefined) return [];
  return node.list().map((item) => readComponent(item));
}

function readPsf(node: ConfigNode): PsfConfig {
  const shape = node.get('shape').oneOf(['gaussian', 'moffat', 'file'] as const);
  let psf: PsfConfig;
  if (shape === 'file') {
    psf = { shape, path: node.get('path').string() };
  } else {
    const fwhmArcsec = node.get('fwhmArcsec').number({ min: 0, exclusiveMin: true });
    const sizeNode = node.get('sizePixels');
    const sizePixels = sizeNode.optionalNumber(21, { integer: true, min: 1 });
    if (sizePixels % 2 === 0) sizeNode.fail(expectedFound('an odd whole number (the PSF needs a centre pixel)', sizePixels));
    psf = shape === 'gaussian'
      ? { shape, fwhmArcsec, sizePixels }
      : { shape, fwhmArcsec, sizePixels, moffatBeta: node.get('moffatBeta').optionalNumber(3, { min: 1, exclusiveMin: true }) };
  }
  node.finish();
  return psf;
}

function readMask(node: ConfigNode): MaskConfig | undefined {
  if (node.value === undefined) return undefined;
  const shape = node.get('shape').oneOf(['all', 'disc', 'annulus'] as const);
  let mask: MaskConfig;
  if (shape === 'all') {
    mask = { shape };
  } else {
    const outerRadiusArcsec = node.get('outerRadiusArcsec').number({ min: 0, exclusiveMin: true });
    const centerXArcsec = node.get('centerXArcsec').optionalNumber(0);
    const centerYArcsec = node.get('centerYArcsec').optionalNumber(0);
    if (shape === 'disc') {
      mask = { shape, outerRadiusArcsec, centerXArcsec, centerYArcsec };
    } else {
      const innerNode = node.get('innerRadiusArcsec');
      const innerRadiusArcsec = innerNode.number({ min: 0 });
      if (innerRadiusArcsec >= outerRadiusArcsec) {
        innerNode.fail(expectedFound(`a radius below outerRadiusArcsec (${outerRadiusArcsec})`, innerRadiusArcsec));
      }
      mask = { shape, innerRadiusArcsec, outerRadiusArcsec, centerXArcsec, centerYArcsec };
    }
  }
  node.finish();
  return mask;
}

function readObservation(node: ConfigNode): ObservationConfig {
  const columns = node.get('columns').number({ integer: true, min: 4 });
  const rows = node.get('rows').number({ integer: true, min: 4 });
  const pixelScaleArcsec = node.get('pixelScaleArcsec').number({ min: 0, exclusiveMin: true });
  const supersampling = node.get('supersampling').optionalNumber(2, { integer: true, min: 1, max: 16 });
  const psfNode = node.get('psf');
  const psf = psfNode.value === undefined ? undefined : readPsf(psfNode);
  const noise = readNoise(node.get('noise'));
  const mask = readMask(node.get('mask'));
  node.finish();
  return { columns, rows, pixelScaleArcsec, supersampling, psf, noise, mask };
}

function readCosmology(node: ConfigNode): CosmologyConfig | undefined {
  if (node.value === undefined) return undefined;
  if (typeof node.value === 'string') return { set: node.string() };
  if (!node.isMapping()) node.fail(expectedFound('the name of a parameter set (e.g. planck2018) or { hubbleConstant, matterDensity }', node.value));
  const hubbleConstantKmPerSecPerMpc = node.get('hubbleConstant').number({ min: 0, exclusiveMin: true });
  const matterDensity = node.get('matterDensity').number({ min: 0, exclusiveMin: true, max: 1 });
  node.finish();
  return { hubbleConstantKmPerSecPerMpc, matterDensity };
}

/** Validates parsed config data (from any source) into an ArcsiftConfig. */
export function parseConfig(data: unknown, file: string): ArcsiftConfig {
  const root = new ConfigNode(data, file, '');
  if (!root.isMapping()) root.fail(expectedFound('a mapping at the top of the config', data));
  const title = root.has('title') ? root.get('title').string() : '';
  const observation = readObservation(root.get('observation'));
  const cosmology = readCosmology(root.get('cosmology'));
  const redshifts = root.get('redshifts');
  const lensRedshift = redshifts.get('lens').number({ min: 0, exclusiveMin: true });
  const sourceNode = redshifts.get('source');
  const sourceRedshift = sourceNode.number({ min: 0, exclusiveMin: true });
  if (sourceRedshift <= lensRedshift) sourceNode.fail(expectedFound(`a redshift above the lens redshift (${lensRedshift})`, sourceRedshift));
  redshifts.finish();

  const lens = root.get('lens');
  const lensMass = readComponentList(lens.get('mass'));
  if (lensMass.length === 0) lens.fail('the lens needs at least one mass component under lens.mass');
  const shearNode = lens.get('shear');
  const shear = shearNode.value === undefined ? undefined : { ...readComponent(shearNode, false), kind: 'externalShear' };
  const multipoles = lens.has('multipoles')
    ? lens.get('multipoles').list().map((item) => ({ ...readComponent(item, false), kind: 'multipole' }))
    : [];
  const lensLight = readComponentList(lens.get('light'));
  lens.finish();

  const source = root.get('source');
  const sourceLight = readComponentList(source.get('light'));
  if (sourceLight.length === 0) source.fail('the source needs at least one light component under source.light');
  source.finish();

  const perturbers = readComponentList(root.get('perturbers'));
  const amplitudePriorSigma = root.get('amplitudePriorSigma').optionalNumber(100, { min: 0, exclusiveMin: true });
  root.finish();
  return {
    file, title, observation, cosmology, lensRedshift, sourceRedshift,
    lensMass, shear, multipoles, lensLight, sourceLight, perturbers, amplitudePriorSigma,
  };
}

/** Reads and validates a YAML or JSON config file. */
export function loadConfig(path: string): ArcsiftConfig {
  return parseConfig(readConfigFile(path), path);
}
