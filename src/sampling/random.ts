import { createRequire } from 'node:module';
import type improvedZigguratType from '@stdlib/random/base/improved-ziggurat';
import { InputError, expectedFound } from '../errors.js';

// @stdlib packages are CommonJS folders without an exports map: Node's ESM loader needs require.
const require = createRequire(import.meta.url);
const improvedZiggurat = require('@stdlib/random/base/improved-ziggurat') as typeof improvedZigguratType;

/** JSON form of a generator's exact state (the Mersenne Twister state words). */
export interface RandomState {
  readonly generator: 'mt19937';
  readonly words: number[];
}

/**
 * A seeded pseudorandom source: one 32-bit Mersenne Twister (Matsumoto & Nishimura 1998) feeding
 * 53-bit uniforms and standard normals by the improved ziggurat method (Doornik 2005). Uniforms and
 * normals draw from the same twister, so its state alone captures the generator exactly.
 */
export class Random {
  private readonly normalSource: ReturnType<typeof improvedZiggurat.factory>;
  private readonly uniformSource: () => number;

  /** @param seed integer in [1, 2^32 - 1]. */
  constructor(seed: number) {
    if (!Number.isInteger(seed) || seed < 1 || seed > 0xffffffff) {
      throw new InputError(`random seed: ${expectedFound('an integer from 1 to 4294967295', seed)}`);
    }
    this.normalSource = improvedZiggurat.factory({ seed });
    this.uniformSource = this.normalSource.PRNG;
  }

  /** Uniform on [0, 1). */
  uniform(): number {
    return this.uniformSource();
  }

  /** Standard normal. */
  normal(): number {
    return this.normalSource();
  }

  /** Uniform integer in [0, n). */
  integer(n: number): number {
    return Math.floor(this.uniformSource() * n);
  }

  getState(): RandomState {
    return { generator: 'mt19937', words: Array.from(this.normalSource.state) };
  }

  setState(state: RandomState): void {
    const words = (state as { words?: unknown } | null)?.words;
    if (state?.generator !== 'mt19937' || !Array.isArray(words) || words.length !== this.normalSource.stateLength) {
      throw new InputError(
        `random generator state: ${expectedFound(`mt19937 state of ${this.normalSource.stateLength} words`, words)}`,
      );
    }
    this.normalSource.state = Uint32Array.from(words as number[]);
  }
}
