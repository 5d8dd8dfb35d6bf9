import { InputError, expectedFound } from '../errors.js';
import { noRejections, REJECTION_REASONS, type InversionRejections } from '../inversion/inversionRejections.js';
import type { ModelPool } from '../parallel/likelihoodPool.js';
import type { RunTallies } from '../sampling/runTallies.js';

/**
 * A run's pixelated-source rejections by reason, as the sampler's RunTallies: the counts read
 * back from a checkpoint plus those the pool has seen since this run began (the pool may have
 * served other runs before).
 */
export class RejectionTallies implements RunTallies {
  private readonly base = noRejections();
  private readonly atStart: InversionRejections;

  constructor(private readonly pool: Pick<ModelPool, 'rejections'>) {
    this.atStart = { ...pool.rejections };
  }

  read(): Record<string, number> {
    return { ...this.counts };
  }

  /** The counts of the whole run so far. */
  get counts(): InversionRejections {
    const now = this.pool.rejections;
    const counts = noRejections();
    for (const reason of REJECTION_REASONS) counts[reason] = this.base[reason] + now[reason] - this.atStart[reason];
    return counts;
  }

  restore(saved: Readonly<Record<string, number>>): void {
    for (const reason of REJECTION_REASONS) {
      const count = saved[reason] ?? 0;
      if (!Number.isInteger(count) || count < 0) throw new InputError(`checkpoint tallies: ${reason}: ${expectedFound('a whole count', count)}`);
      this.base[reason] = count;
    }
  }
}
