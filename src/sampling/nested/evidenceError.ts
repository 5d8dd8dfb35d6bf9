import { createRequire } from 'node:module';
import type betaType from '@stdlib/random/base/beta';
import { logAddExp, logOneMinusExpNegative, logSumExp } from '../../numeric/statistics/logSumExp.js';
import { SeededStream } from '../../numeric/random/seededStream.js';

const require = createRequire(import.meta.url);
const beta = require('@stdlib/random/base/beta') as typeof betaType;

/** What the simulated-shrinkage error needs from a finished run. */
export interface ShrinkageRecord {
  /** ln L of the dead points in removal order. */
  readonly deadLnL: ArrayLike<number>;
  /** number of live points at the moment each dead point was removed. */
  readonly deadLiveCount: ArrayLike<number>;
  readonly deadCount: number;
  /** ln L of the final live points (any order). */
  readonly finalLiveLnL: ArrayLike<number>;
  /** initial draws: finite points kept and prior draws made (see lnInitialVolume). */
  readonly initialFinite: number;
  readonly initialDrawn: number;
}

/**
 * Spread of ln Z over simulated shrinkage sequences (Higson, Handley, Hobson & Lasenby 2018,
 * "Sampling errors in nested sampling parameter estimation", Section 3): each simulation redraws
 * every shrinkage ratio t_i ~ Beta(n_i, 1), i.e. ln t_i = ln(U)/n_i, recomputes ln Z with the
 * rectangle rule plus the final live points at X_final / N each, and the standard deviation of those
 * ln Z is returned. The initial finite-volume fraction, when draws were rejected, is redrawn from
 * Beta(n, drawn - n). Uses its own stream seeded by `seed`.
 */
export function simulatedLnZSpread(record: ShrinkageRecord, simulations: number, seed: number): number {
  const stream = SeededStream.fromSeed(seed);
  const lnLiveMean = logSumExp(record.finalLiveLnL) - Math.log(record.finalLiveLnL.length);
  const rejected = record.initialDrawn - record.initialFinite;
  const initialVolume =
    rejected > 0 ? (beta.factory(record.initialFinite, rejected, { seed: 1 + stream.integer(0x7fffffff) }) as () => number) : null;
  const lnZ = new Float64Array(simulations);
  for (let s = 0; s < simulations; s++) {
    let lnX = initialVolume === null ? 0 : Math.log(initialVolume());
    let total = -Infinity;
    for (let i = 0; i < record.deadCount; i++) {
      const shrink = -Math.log(1 - stream.uniform()) / record.deadLiveCount[i];
      total = logAddExp(total, record.deadLnL[i] + lnX + logOneMinusExpNegative(shrink));
      lnX -= shrink;
    }
    lnZ[s] = logAddExp(total, lnX + lnLiveMean);
  }
  let mean = 0;
  for (let s = 0; s < simulations; s++) mean += lnZ[s] / simulations;
  let variance = 0;
  for (let s = 0; s < simulations; s++) variance += (lnZ[s] - mean) ** 2 / (simulations - 1);
  return Math.sqrt(variance);
}
