import { createRequire } from 'node:module';
import type normalType from '@stdlib/random/base/normal';

const require = createRequire(import.meta.url);
const normal = require('@stdlib/random/base/normal') as typeof normalType;

/** The part of a @stdlib/random normal generator (made with fixed mean and deviation) used here. */
interface NormalSource {
  (): number;
  readonly PRNG: () => number;
  state: Uint32Array;
}

/**
 * The nested sampler's own seeded random stream: one 32-bit Mersenne Twister (Matsumoto &
 * Nishimura 1998) from @stdlib/random, feeding both 53-bit uniforms and standard normals (improved
 * ziggurat, Doornik 2005). Both draw from the same twister, so its state words alone capture the
 * stream exactly; `state` can be saved in a checkpoint and restored bit for bit.
 */
export class SeededStream {
  private readonly normalSource: NormalSource;
  private readonly uniformSource: () => number;

  private constructor(normalSource: NormalSource) {
    this.normalSource = normalSource;
    this.uniformSource = normalSource.PRNG;
  }

  /** A stream started from an integer seed in [1, 2^32 - 1]. */
  static fromSeed(seed: number): SeededStream {
    return new SeededStream(normal.factory(0, 1, { seed }) as unknown as NormalSource);
  }

  /** A stream continuing from saved state words (see `stateWords`). */
  static fromState(words: readonly number[]): SeededStream {
    return new SeededStream(
      normal.factory(0, 1, { state: Uint32Array.from(words), copy: true }) as unknown as NormalSource,
    );
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
}

/** Seeds derived from the run seed for the side streams (error simulation, rank jitter, resampling). */
export function derivedSeed(seed: number, stream: number): number {
  // Knuth's multiplicative hash constant spreads nearby seeds; kept in [1, 2^32 - 1].
  const mixed = (Math.imul(seed >>> 0, 2654435761) + Math.imul(stream + 1, 40503)) >>> 0;
  return mixed === 0 ? 1 : mixed;
}
