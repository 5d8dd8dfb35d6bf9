import { InputError, expectedFound } from '../errors.js';
import { makePrior } from './makePrior.js';
import { wrapIntoPeriod } from './periodic.js';
import type { Prior, PriorSpec } from './prior.js';

/** One named parameter and its prior, as a config lists it. */
export interface ParameterEntry {
  readonly name: string;
  readonly prior: PriorSpec;
}

/** Plain JSON description of one prior (printed beside every Bayes factor). */
export interface PriorDescription {
  readonly name: string;
  readonly kind: PriorSpec['kind'];
  readonly fixed: boolean;
  readonly periodic: boolean;
  readonly lower: number | null;
  readonly upper: number | null;
  readonly mean?: number;
  readonly sigma?: number;
  readonly value?: number;
}

/**
 * The physical parameter vector (every parameter, fixed ones included, in `names` order) and
 * the free vector the samplers move (the non-fixed parameters, in the same relative order).
 * Likelihoods receive physical vectors. Methods write into caller-owned buffers at optional
 * offsets, so the hot path allocates nothing.
 */
export class ParameterSpace {
  /** Every parameter name, in physical order. */
  readonly names: readonly string[];
  /** Names of the sampled (non-fixed) parameters, in free order. */
  readonly freeNames: readonly string[];
  /** Physical index of each free parameter. */
  readonly freeIndices: Int32Array;
  /** Number of free parameters (dimension of the unit cube and of the MCMC). */
  readonly dim: number;
  /** Number of all parameters. */
  readonly physicalDim: number;
  /** For each free dimension, whether it is periodic. */
  readonly periodic: readonly boolean[];
  /** One prior per parameter, in physical order. */
  readonly priors: readonly Prior[];

  private readonly freePriors: readonly Prior[];
  private readonly fixedIndices: Int32Array;
  private readonly fixedValues: Float64Array;
  private readonly periodicIndices: Int32Array;
  private readonly periodicLower: Float64Array;
  private readonly periodicWidth: Float64Array;

  /**
   * @param entries the parameters with their priors; names must be unique and non-empty.
   * @param keyPrefix config key path of the list, used in error messages (e.g. `priors`).
   */
  constructor(entries: readonly ParameterEntry[], keyPrefix?: string) {
    if (!Array.isArray(entries)) {
      throw new InputError(expectedFound('a list of parameters with priors', entries), keyPlace(keyPrefix));
    }
    const seen = new Set<string>();
    const priors: Prior[] = [];
    entries.forEach((entry, index) => {
      const name = (entry as { name?: unknown } | null)?.name;
      const key = keyPrefix === undefined ? undefined : `${keyPrefix}[${index}]`;
      if (typeof name !== 'string' || name.length === 0) {
        throw new InputError(
          `parameter ${index}: name: ${expectedFound('a non-empty string', name)}`, keyPlace(key),
        );
      }
      if (seen.has(name)) {
        throw new InputError(
          `parameter names must be unique: expected one parameter "${name}", found a second at position ${index}`,
          keyPlace(key),
        );
      }
      seen.add(name);
      priors.push(makePrior(name, entry.prior, keyPlace(key === undefined ? undefined : `${key}.prior`)));
    });
    this.priors = Object.freeze(priors);
    this.names = Object.freeze(priors.map((p) => p.name));
    this.physicalDim = priors.length;
    const free = priors.map((p, i) => ({ p, i })).filter(({ p }) => !p.isFixed);
    const fixed = priors.map((p, i) => ({ p, i })).filter(({ p }) => p.isFixed);
    this.freePriors = Object.freeze(free.map(({ p }) => p));
    this.freeNames = Object.freeze(free.map(({ p }) => p.name));
    this.freeIndices = Int32Array.from(free.map(({ i }) => i));
    this.dim = free.length;
    this.periodic = Object.freeze(free.map(({ p }) => p.periodic));
    this.fixedIndices = Int32Array.from(fixed.map(({ i }) => i));
    this.fixedValues = Float64Array.from(fixed.map(({ p }) => p.lower));
    const periodic = priors.map((p, i) => ({ p, i })).filter(({ p }) => p.periodic);
    this.periodicIndices = Int32Array.from(periodic.map(({ i }) => i));
    this.periodicLower = Float64Array.from(periodic.map(({ p }) => p.lower));
    this.periodicWidth = Float64Array.from(periodic.map(({ p }) => p.upper - p.lower));
  }

  /** Maps a point of the unit cube (dim entries) to a physical vector, fixed values filled in. */
  fromUnitCube(unit: Float64Array, out: Float64Array, unitOffset = 0, outOffset = 0): void {
    const freePriors = this.freePriors;
    const freeIndices = this.freeIndices;
    for (let k = 0; k < this.dim; k++) {
      out[outOffset + freeIndices[k]] = freePriors[k].fromUnit(unit[unitOffset + k]);
    }
    this.fillFixed(out, outOffset);
  }

  /** Sum of the free parameters' log prior densities; -Infinity outside the support. */
  logPrior(physical: Float64Array, offset = 0): number {
    const freePriors = this.freePriors;
    const freeIndices = this.freeIndices;
    let sum = 0;
    for (let k = 0; k < this.dim; k++) {
      sum += freePriors[k].logDensity(physical[offset + freeIndices[k]]);
    }
    return sum;
  }

  /** Expands a free vector (dim entries) into a physical vector with the fixed values. */
  toPhysical(free: Float64Array, out: Float64Array, freeOffset = 0, outOffset = 0): void {
    const freeIndices = this.freeIndices;
    for (let k = 0; k < this.dim; k++) out[outOffset + freeIndices[k]] = free[freeOffset + k];
    this.fillFixed(out, outOffset);
  }

  /** Picks the free entries out of a physical vector. */
  toFree(physical: Float64Array, out: Float64Array, physicalOffset = 0, outOffset = 0): void {
    const freeIndices = this.freeIndices;
    for (let k = 0; k < this.dim; k++) out[outOffset + k] = physical[physicalOffset + freeIndices[k]];
  }

  /** Wraps every periodic parameter of a physical vector into [lower, upper), in place. */
  wrapPeriodic(physical: Float64Array, offset = 0): void {
    const indices = this.periodicIndices;
    for (let k = 0; k < indices.length; k++) {
      const at = offset + indices[k];
      physical[at] = wrapIntoPeriod(physical[at], this.periodicLower[k], this.periodicWidth[k]);
    }
  }

  /** Every prior as plain JSON (infinite bounds as null). */
  describe(): PriorDescription[] {
    return this.priors.map((prior) => {
      const spec = prior.spec;
      const base = {
        name: prior.name,
        kind: spec.kind,
        fixed: prior.isFixed,
        periodic: prior.periodic,
        lower: Number.isFinite(prior.lower) ? prior.lower : null,
        upper: Number.isFinite(prior.upper) ? prior.upper : null,
      };
      if (spec.kind === 'normal' || spec.kind === 'truncatedNormal') {
        return { ...base, mean: spec.mean, sigma: spec.sigma };
      }
      if (spec.kind === 'fixed') return { ...base, value: spec.value };
      return base;
    });
  }

  private fillFixed(out: Float64Array, outOffset: number): void {
    const fixedIndices = this.fixedIndices;
    for (let k = 0; k < fixedIndices.length; k++) out[outOffset + fixedIndices[k]] = this.fixedValues[k];
  }
}

function keyPlace(key: string | undefined): { key?: string } {
  return key === undefined ? {} : { key };
}
