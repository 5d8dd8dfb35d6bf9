import { InputError } from '../errors.js';
import type { ArcsiftConfig, ComponentConfig } from '../config/arcsiftConfig.js';
import type { MassProfilePair } from '../lens/massProfile.js';
import type { LightProfile, LightProfilePair } from '../light/lightProfile.js';
import { mainLensProfiles, multipole } from '../lens/index.js';
import { lightProfiles, shapeletsOfOrder } from '../light/index.js';
import type { MassTerm } from '../lensing/massTerm.js';
import { pixelatedParameterNames, type PixelatedSourceTerm } from './pixelatedSourceTerm.js';
import { ParameterCollector, copyWriter } from './componentBinding.js';
import type { ModelParameter } from './modelParameter.js';
import { bindPerturber, type PerturberBinding } from './perturberBinding.js';
import { bindPhysicalMainLens, physicalMainLensKinds } from './mainLensBinding.js';
import type { HostLens } from './tidalPerturberBinding.js';
import { buildLensingContext } from './buildLensingContext.js';
import type { LensingContext } from '../cosmology/index.js';

type VectorWriter = (model: Float64Array, profile: Float64Array) => void;

export type { MassTerm } from '../lensing/massTerm.js';

export interface LightTerm {
  /** The reference formula. */
  readonly profile: LightProfile;
  /** The evaluation the forward model runs (see LightProfilePair). */
  readonly fast: LightProfile;
  readonly offset: number;
  /** Index of this component's first amplitude among all amplitudes. */
  readonly amplitudeOffset: number;
  readonly key: string;
}

/**
 * A config assembled for computation: the model parameter vector (what samplers move and
 * reports print), and the profile vector the mass and light profiles read, filled from it.
 */
export interface LensSystem {
  readonly file: string;
  readonly parameters: readonly ModelParameter[];
  readonly massTerms: readonly MassTerm[];
  readonly sourceTerms: readonly LightTerm[];
  /** The source reconstructed on a pixel mesh, when the config has one (fits only). */
  readonly pixelatedSource: PixelatedSourceTerm | undefined;
  readonly lensLightTerms: readonly LightTerm[];
  readonly perturbers: readonly PerturberBinding[];
  readonly profileVectorLength: number;
  /** Number of linear amplitudes: source components first, then lens light. */
  readonly amplitudeCount: number;
  /** Names of the amplitudes, e.g. `source.light[0].amplitude`. */
  readonly amplitudeNames: readonly string[];
  /** Amplitudes given in the config (all of them, or undefined if any is missing). */
  readonly configuredAmplitudes: Float64Array | undefined;
  readonly lensing: LensingContext;
  /** Fills the profile vector from a model vector (allocates nothing). */
  writeProfileVector(model: Float64Array, profile: Float64Array): void;
  /** The model vector holding every configured value (undefined entries become NaN). */
  configuredValues(): Float64Array;
}

export interface LensSystemOptions {
  /** How many of the config's perturbers to include (default: all). 0 gives the smooth model. */
  readonly perturberCount?: number;
  /**
   * 'fit' (default) leaves out the source components marked simulateOnly; 'simulate' leaves out
   * a pixelated source (it has no values to draw an image from) and keeps the rest.
   */
  readonly purpose?: 'fit' | 'simulate';
}

function lightProfileOf(component: ComponentConfig, file: string): LightProfilePair {
  if (component.kind === 'shapelets') {
    if (component.order === undefined) {
      throw new InputError('a shapelets component needs `order` (the maximum n1 + n2), e.g. order: 6', { file, key: component.key });
    }
    return shapeletsOfOrder(component.order);
  }
  const profile = (lightProfiles as Record<string, LightProfilePair>)[component.kind];
  if (profile === undefined) {
    throw new InputError(
      `unknown light kind ${JSON.stringify(component.kind)} (known: ${[...Object.keys(lightProfiles), 'shapelets'].join(', ')})`,
      { file, key: `${component.key}.kind` },
    );
  }
  return profile;
}

/**
 * A perturber with a region prior (`positionPrior`) gets uniform priors on its centre over the
 * region's bounding box (the whole image for `mask`); the sampler then maps those two unit
 * coordinates onto the region itself (inference/positionRegion.ts).
 */
function withRegionBounds(component: ComponentConfig, config: ArcsiftConfig, file: string): ComponentConfig {
  const region = component.positionPrior;
  if (region === undefined) return component;
  const entries = { ...component.entries };
  const halfX = (config.observation.columns / 2) * config.observation.pixelScaleArcsec;
  const halfY = (config.observation.rows / 2) * config.observation.pixelScaleArcsec;
  const bounds = region.region === 'mask'
    ? { x: [-halfX, halfX], y: [-halfY, halfY] }
    : { x: [region.centerXArcsec - region.radiusArcsec, region.centerXArcsec + region.radiusArcsec],
        y: [region.centerYArcsec - region.radiusArcsec, region.centerYArcsec + region.radiusArcsec] };
  for (const [name, [lower, upper]] of [['centerXArcsec', bounds.x], ['centerYArcsec', bounds.y]] as const) {
    const entry = entries[name];
    if (entry?.prior !== undefined) {
      throw new InputError('with positionPrior the centre takes only a value (the truth for simulate), not a prior of its own', { file, key: entry.key });
    }
    entries[name] = { key: entry?.key ?? `${component.key}.${name}`, value: entry?.value, prior: { kind: 'uniform', lower, upper } };
  }
  return { ...component, entries };
}

export function buildLensSystem(config: ArcsiftConfig, options: LensSystemOptions = {}): LensSystem {
  const file = config.file;
  const collector = new ParameterCollector(file);
  const writers: VectorWriter[] = [];
  const massTerms: MassTerm[] = [];
  let profileLength = 0;

  const lensing = buildLensingContext(config);
  // For each main-lens component, the model index of a parameter by name (-1 when it has none).
  const mainIndexOf: Array<(name: string) => number> = [];
  config.lensMass.forEach((component) => {
    if ((physicalMainLensKinds as readonly string[]).includes(component.kind)) {
      const binding = bindPhysicalMainLens(component, collector, lensing, profileLength, file);
      mainIndexOf.push(binding.indexOf);
      writers.push(binding.write);
      massTerms.push({ profile: binding.pair.reference, fast: binding.pair.fast, offset: profileLength });
      profileLength += binding.pair.reference.parameterNames.length;
      return;
    }
    const pair = (mainLensProfiles as Record<string, MassProfilePair>)[component.kind];
    if (pair === undefined || component.kind === 'externalShear') {
      throw new InputError(
        `unknown main-lens mass kind ${JSON.stringify(component.kind)} (known: isothermalEllipsoid, powerLawEllipsoid, ${physicalMainLensKinds.join(', ')})`,
        { file, key: `${component.key}.kind` },
      );
    }
    const defaults: Record<string, number> = component.kind === 'isothermalEllipsoid' ? { coreRadiusArcsec: 0 } : {};
    const names = pair.reference.parameterNames;
    const indices = collector.bind(component, names, defaults);
    mainIndexOf.push((name) => (names.includes(name) ? indices[names.indexOf(name)] : -1));
    writers.push(copyWriter(indices, profileLength));
    massTerms.push({ profile: pair.reference, fast: pair.fast, offset: profileLength });
    profileLength += names.length;
  });
  // The main lens as a tidally truncated perturber sees it: its components, centre and writers.
  const mainWriters = writers.slice();
  const firstNames = massTerms[0].profile.parameterNames;
  const host: HostLens = {
    components: massTerms.map(({ profile, offset }) => ({ profile, offset })),
    centerXOffset: firstNames.indexOf('centerXArcsec'),
    centerYOffset: firstNames.indexOf('centerYArcsec'),
    writeMainLens: (model, profile) => { for (const write of mainWriters) write(model, profile); },
    profileLength,
  };

  if (config.shear !== undefined) {
    const { reference: profile, fast } = mainLensProfiles.externalShear;
    const indices = collector.bind(config.shear, profile.parameterNames);
    writers.push(copyWriter(indices, profileLength));
    massTerms.push({ profile, fast, offset: profileLength });
    profileLength += profile.parameterNames.length;
  }

  // Multipoles ride on the first main-lens component: its centre, and its Einstein radius and slope
  // where it has them. A decomposed lens (stellarSersic, haloes) has neither: its multipoles give
  // their own einsteinRadiusArcsec, the radius of the isothermal profile their strength refers to.
  const linkedIndex = mainIndexOf[0];
  for (const component of config.multipoles) {
    if (component.order === undefined || ![1, 3, 4].includes(component.order)) {
      throw new InputError(`a multipole needs order: 1, 3 or 4`, { file, key: `${component.key}.order` });
    }
    const profile = multipole(component.order as 1 | 3 | 4);
    const ownRadius = linkedIndex('einsteinRadiusArcsec') < 0;
    const own = collector.bind(component, ['multipoleStrength', 'multipoleAngleDeg', ...(ownRadius ? ['einsteinRadiusArcsec'] : [])]);
    const slopeIndex = linkedIndex('slope');
    const links = [linkedIndex('centerXArcsec'), linkedIndex('centerYArcsec'), ownRadius ? own[2] : linkedIndex('einsteinRadiusArcsec')];
    const offset = profileLength;
    writers.push((model, p) => {
      p[offset] = model[own[0]];
      p[offset + 1] = model[own[1]];
      p[offset + 2] = model[links[0]];
      p[offset + 3] = model[links[1]];
      p[offset + 4] = model[links[2]];
      p[offset + 5] = slopeIndex >= 0 ? model[slopeIndex] : 2;
    });
    massTerms.push({ profile, fast: profile, offset });
    profileLength += profile.parameterNames.length;
  }

  const perturbers: PerturberBinding[] = [];
  const perturberCount = Math.min(options.perturberCount ?? config.perturbers.length, config.perturbers.length);
  for (let k = 0; k < perturberCount; k++) {
    const binding = bindPerturber(withRegionBounds(config.perturbers[k], config, file), collector, lensing, profileLength, file, host);
    perturbers.push(binding);
    writers.push(binding.write);
    massTerms.push({ profile: binding.profile, fast: binding.fast, offset: profileLength });
    profileLength += binding.profile.parameterNames.length;
  }

  const amplitudeNames: string[] = [];
  const amplitudeValues: (number | undefined)[] = [];
  const bindLight = (components: readonly ComponentConfig[]): LightTerm[] => components.map((component) => {
    const { reference: profile, fast } = lightProfileOf(component, file);
    const indices = collector.bind(component, profile.parameterNames, {}, ['amplitude']);
    const term: LightTerm = { profile, fast, offset: profileLength, amplitudeOffset: amplitudeNames.length, key: component.key };
    writers.push(copyWriter(indices, profileLength));
    profileLength += profile.parameterNames.length;
    if (profile.basisCount === 1) {
      if (component.coefficients !== undefined) {
        throw new InputError('coefficients are for shapelets; use amplitude', { file, key: `${component.key}.coefficients` });
      }
      amplitudeNames.push(`${component.key}.amplitude`);
      amplitudeValues.push(component.entries.amplitude?.value);
    } else {
      if (component.entries.amplitude !== undefined) {
        throw new InputError('a shapelets component takes a list `coefficients`, not amplitude', { file, key: `${component.key}.amplitude` });
      }
      if (component.coefficients !== undefined && component.coefficients.length !== profile.basisCount) {
        throw new InputError(
          `expected ${profile.basisCount} coefficients for order ${component.order}, found ${component.coefficients.length}`,
          { file, key: `${component.key}.coefficients` },
        );
      }
      for (let b = 0; b < profile.basisCount; b++) {
        amplitudeNames.push(`${component.key}.coefficient[${b}]`);
        amplitudeValues.push(component.coefficients?.[b]);
      }
    }
    return term;
  });
  const fitting = (options.purpose ?? 'fit') === 'fit';
  const pixelatedComponents = config.sourceLight.filter((c) => c.kind === 'pixelated');
  if (pixelatedComponents.length > 1) {
    throw new InputError('at most one pixelated source component', { file, key: pixelatedComponents[1].key });
  }
  for (const c of pixelatedComponents) {
    if (c.simulateOnly === true) throw new InputError('a pixelated source is fitted, never simulated: drop simulateOnly', { file, key: `${c.key}.simulateOnly` });
  }
  const sourceTerms = bindLight(config.sourceLight.filter((c) => c.kind !== 'pixelated' && !(fitting && c.simulateOnly === true)));
  let pixelatedSource: PixelatedSourceTerm | undefined;
  if (fitting && pixelatedComponents.length === 1) {
    const component = pixelatedComponents[0];
    const names = pixelatedParameterNames(component.pixelated!);
    const indices = collector.bind(component, names);
    writers.push(copyWriter(indices, profileLength));
    pixelatedSource = { key: component.key, settings: component.pixelated!, offset: profileLength, parameterNames: names };
    profileLength += names.length;
  }
  const lensLightTerms = bindLight(config.lensLight);
  const configuredAmplitudes = amplitudeValues.every((v) => v !== undefined)
    ? Float64Array.from(amplitudeValues as number[])
    : undefined;

  const parameters = collector.parameters;
  return {
    file,
    parameters,
    massTerms,
    sourceTerms,
    pixelatedSource,
    lensLightTerms,
    perturbers,
    profileVectorLength: profileLength,
    amplitudeCount: amplitudeNames.length,
    amplitudeNames,
    configuredAmplitudes,
    lensing,
    writeProfileVector(model, profile) {
      for (let w = 0; w < writers.length; w++) writers[w](model, profile);
    },
    configuredValues() {
      return Float64Array.from(parameters, (p) => (p.value === undefined ? Number.NaN : p.value));
    },
  };
}
