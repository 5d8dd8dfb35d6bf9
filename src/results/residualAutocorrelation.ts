import { InputError } from '../errors.js';
import { gridNeighbours, type NeighbourScheme } from './gridNeighbours.js';
import { moransI, type MoransI } from './moransI.js';
import { moransIPermutationTest } from './moransIPermutationTest.js';

export interface ResidualAutocorrelationOptions {
  readonly neighbours: NeighbourScheme;
  readonly permutations: number;
  /**
   * The alarm sounds when the permutation p-value is at or below this: on white noise it then sounds
   * with probability floor(rate (permutations + 1)) / (permutations + 1), exactly the rate when that
   * product is whole (999 permutations at 0.01, 99 at 0.05).
   */
  readonly falseAlarmRate: number;
  readonly seed: number;
}

/** The misfit alarm's reading of one residual image. */
export interface ResidualAutocorrelation extends MoransI {
  readonly neighbours: NeighbourScheme;
  readonly pixels: number;
  readonly pValue: number;
  readonly permutations: number;
  readonly falseAlarmRate: number;
  /** True when the residuals are more alike between neighbours than chance allows: structure the model missed. */
  readonly alarm: boolean;
}

/**
 * A misfit alarm on normalised residuals (data - model) / noise inside the mask: Moran's I of the
 * residuals over neighbouring used pixels (moransI.ts), its moments, and a one-sided permutation
 * p-value (moransIPermutationTest.ts). A model that fits leaves independent residuals; a missed
 * arc, a source too simple or a lens too smooth leaves residuals that resemble their neighbours,
 * I above its expectation. The null assumes independent noise between pixels: an image whose noise
 * is correlated (resampled, drizzled) will raise it on noise alone. `residuals` is the image in
 * row-major order (column + columns * row), `used` the mask (non-zero = used).
 */
export function residualAutocorrelation(
  residuals: ArrayLike<number>, columns: number, rows: number, used: ArrayLike<number | boolean>,
  options: ResidualAutocorrelationOptions,
): ResidualAutocorrelation {
  const neighbours = gridNeighbours(columns, rows, used, options.neighbours);
  if (neighbours.count < 4 || neighbours.weightSum === 0) {
    throw new InputError(`the residual autocorrelation needs at least 4 used pixels with neighbours; the mask has ${neighbours.count}`);
  }
  const values = new Float64Array(neighbours.count);
  for (let k = 0; k < neighbours.count; k++) {
    const g = neighbours.pixels[k];
    values[k] = residuals[g];
    if (!Number.isFinite(values[k])) {
      throw new InputError(`normalised residual is ${values[k]} inside the mask`, { pixel: [g % columns, Math.floor(g / columns)] });
    }
  }
  const moments = moransI(values, neighbours);
  const test = moransIPermutationTest(values, neighbours, options.permutations, options.seed);
  return {
    ...moments,
    neighbours: options.neighbours,
    pixels: neighbours.count,
    pValue: test.pValue,
    permutations: options.permutations,
    falseAlarmRate: options.falseAlarmRate,
    alarm: test.pValue <= options.falseAlarmRate,
  };
}
