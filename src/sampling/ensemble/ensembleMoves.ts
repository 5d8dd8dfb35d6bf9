import { InputError, expectedFound } from '../../errors.js';

export type EnsembleMoveKind = 'stretch' | 'differentialEvolution';

/** One move with its share of the steps. */
export interface WeightedMove {
  readonly move: EnsembleMoveKind;
  readonly weight: number;
}

export type EnsembleMoveOption = EnsembleMoveKind | readonly WeightedMove[];

/** Validated move mixture: kinds and cumulative probabilities (last = 1). */
export interface MoveMixture {
  readonly kinds: readonly EnsembleMoveKind[];
  readonly cumulative: Float64Array;
}

const KINDS: readonly EnsembleMoveKind[] = ['stretch', 'differentialEvolution'];

export function moveMixture(option: EnsembleMoveOption | undefined): MoveMixture {
  const list: readonly WeightedMove[] = option === undefined
    ? [{ move: 'stretch', weight: 1 }]
    : typeof option === 'string' ? [{ move: option, weight: 1 }] : option;
  if (!Array.isArray(list) || list.length === 0) {
    throw new InputError(`ensemble move: ${expectedFound('a move name or a non-empty list of weighted moves', option)}`);
  }
  let total = 0;
  for (const [index, entry] of list.entries()) {
    if (!KINDS.includes(entry?.move)) {
      throw new InputError(`ensemble move ${index}: ${expectedFound(`one of ${KINDS.join(', ')}`, entry?.move)}`);
    }
    if (typeof entry.weight !== 'number' || !(entry.weight > 0) || !Number.isFinite(entry.weight)) {
      throw new InputError(`ensemble move ${index} weight: ${expectedFound('a finite number > 0', entry.weight)}`);
    }
    total += entry.weight;
  }
  const cumulative = new Float64Array(list.length);
  let running = 0;
  list.forEach((entry, k) => {
    running += entry.weight;
    cumulative[k] = running / total;
  });
  cumulative[list.length - 1] = 1;
  return { kinds: list.map((entry) => entry.move), cumulative };
}
