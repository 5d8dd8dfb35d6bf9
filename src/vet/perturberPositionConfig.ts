import type { ArcsiftConfig, ComponentConfig } from '../config/arcsiftConfig.js';
import { InputError } from '../errors.js';

/** The config's first perturber, or an InputError saying vetting needs one. */
export function firstPerturber(config: ArcsiftConfig): ComponentConfig {
  if (config.perturbers.length === 0) {
    throw new InputError(
      'vetting needs a perturber to place at each flag: expected at least one entry under perturbers (its kind and mass prior are used), found none',
      { file: config.file, key: 'perturbers' },
    );
  }
  return config.perturbers[0];
}

/**
 * The config with only its first perturber, whose centre priors are uniform on
 * [xLower, xUpper] x [yLower, yUpper] arcsec; every other entry (mass prior, profile settings)
 * is kept as written. A region prior on the position (`positionPrior`) is dropped: the box replaces it.
 */
export function perturberPositionConfig(
  config: ArcsiftConfig, x: readonly [number, number], y: readonly [number, number],
): ArcsiftConfig {
  const perturber = firstPerturber(config);
  const entry = (name: 'centerXArcsec' | 'centerYArcsec', [lower, upper]: readonly [number, number]) => ({
    key: perturber.entries[name]?.key ?? `${perturber.key}.${name}`,
    value: perturber.entries[name]?.value,
    prior: { kind: 'uniform' as const, lower, upper },
  });
  return {
    ...config,
    perturbers: [{
      ...perturber,
      positionPrior: undefined,
      entries: { ...perturber.entries, centerXArcsec: entry('centerXArcsec', x), centerYArcsec: entry('centerYArcsec', y) },
    }],
  };
}

/** The square window of side `windowArcsec` centred on (x, y). */
export function windowAround(xArcsec: number, yArcsec: number, windowArcsec: number): { x: [number, number]; y: [number, number] } {
  const half = windowArcsec / 2;
  return { x: [xArcsec - half, xArcsec + half], y: [yArcsec - half, yArcsec + half] };
}
