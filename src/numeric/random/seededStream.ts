import { createRequire } from 'node:module';
import type normalType from '@stdlib/random/base/normal';
import { InputError, expectedFound } from '../../errors.js';

// @stdlib packages are CommonJS folders without an exports map: Node's ESM loader needs require.
const require = createRequire(import.meta.url);
const normal = require('@stdlib/random/base/normal') as typeof normalType;

/** The part of a @stdlib/random normal generator (made with fixed mean and deviation) used here. */
interface NormalSource {
  (): number;
  readonly PRNG: () => number;
  state: Uint32Array;
  readonly stateLength: number;
}

/** JSON form of a stream's exact state (the Mersenne Twister state words). */
export interface StreamState {
  readonly generator: 'mt19937';
  readonly words: number[];
}

/**
 * arcsift's one seeded random stream: a 32-bit Mersenne Twister (Matsumoto & Nishimura 1998) from
 * @stdlib/random feeding 53-bit uniforms and standard normals (improved ziggurat, Doornik 2005).
 * Both draw from the same twister, so its state words alone capture the stream exactly; they can
 * be saved in a checkpoint and restored bit for bit.
 */
export class SeededStream {
  private readonly normalSource: NormalSource;
  private readonly uniformSource: () => number;

  private constructor(normalSource: NormalSource) {
    this.normalSource = normalSource;
    this.uniformSource = normalSource.PRNG;
  }

  /** A stream started from an integer seed in [1, 2^32 - 1] (anything else is an InputError). */
  static fromSeed(seed: number): SeededStream {
    if (!Number.isInteger(seed) || seed < 1 || seed > 0xffffffff) {
      throw new InputError(`random seed: ${expectedFound('an integer from 1 to 4294967295', seed)}`);
    }
    return new SeededStream(normal.factory(0, 1, { seed }) as unknown as NormalSource);
  }

  /** A stream continuing from saved state words (see `stateWords`). */
  static fromState(words: readonly number[]): SeededStream {
    return new SeededStream(
      normal.factory(0, 1, { state: Uint32Array.from(words), copy: true }) as unknown as NormalSource,
    );
  }

  /** A stream continuing from a saved StreamState, checked (a damaged checkpoint is an InputError). */
  static fromSavedState(state: unknown, what: string): SeededStream {
    const expectedLength = SeededStream.fromSeed(1).normalSource.stateLength;
    const saved = state as Partial<StreamState> | null;
    const words = saved?.words;
    if (saved?.generator !== 'mt19937' || !Array.isArray(words) || words.length !== expectedLength) {
      throw new InputError(`${what}: ${expectedFound(`mt19937 state of ${expectedLength} words`, words)}`);
    }
    return SeededStream.fromState(words);
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

  /** The twister's state as plain numbers (each a 32-bit word), exact through JSON. */
  stateWords(): number[] {
    return Array.from(this.normalSource.state);
  }

  /** The state as saved in checkpoints. */
  savedState(): StreamState {
    return { generator: 'mt19937', words: this.stateWords() };
  }
}
