import type { GaussianExpansion } from '../../numeric/approximation/gaussianExpansion.js';

/** How many shapes a cache keeps (a fit that samples a shape parameter makes a new one per call). */
const CAPACITY = 8;

/**
 * Gaussian expansions of one family of profiles by their shape parameters (up to two numbers,
 * e.g. Sersic index and mass-to-light gradient). Asking again for the shape of the previous call
 * costs two comparisons and allocates nothing; another shape looks in a small map (oldest
 * dropped first) and fits the expansion only when absent (milliseconds).
 */
export class ExpansionCache {
  private lastFirst = Number.NaN;
  private lastSecond = Number.NaN;
  private last: GaussianExpansion | undefined;
  private readonly stored = new Map<string, GaussianExpansion>();

  constructor(private readonly fit: (first: number, second: number) => GaussianExpansion) {}

  get(first: number, second = 0): GaussianExpansion {
    if (first === this.lastFirst && second === this.lastSecond && this.last !== undefined) return this.last;
    const key = `${first},${second}`;
    let expansion = this.stored.get(key);
    if (expansion === undefined) {
      expansion = this.fit(first, second);
      if (this.stored.size >= CAPACITY) this.stored.delete(this.stored.keys().next().value as string);
      this.stored.set(key, expansion);
    }
    this.lastFirst = first;
    this.lastSecond = second;
    this.last = expansion;
    return expansion;
  }
}
