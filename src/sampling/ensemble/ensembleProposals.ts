import { InputError, expectedFound } from '../../errors.js';

/** The proposals: Goodman & Weare's (2010) stretch move, ter Braak's (2006) differential evolution. */
export type EnsembleProposalKind = 'stretch' | 'differentialEvolution';

/** One proposal with its share of the sweeps. */
export interface WeightedProposal {
  readonly proposal: EnsembleProposalKind;
  readonly weight: number;
}

export type EnsembleProposalOption = EnsembleProposalKind | readonly WeightedProposal[];

/** Validated proposal mixture: kinds and cumulative probabilities (last = 1). */
export interface ProposalMixture {
  readonly kinds: readonly EnsembleProposalKind[];
  readonly cumulative: Float64Array;
}

export const PROPOSAL_KINDS: readonly EnsembleProposalKind[] = ['stretch', 'differentialEvolution'];

export function proposalMixture(option: EnsembleProposalOption | undefined): ProposalMixture {
  const list: readonly WeightedProposal[] = option === undefined
    ? [{ proposal: 'stretch', weight: 1 }]
    : typeof option === 'string' ? [{ proposal: option, weight: 1 }] : option;
  if (!Array.isArray(list) || list.length === 0) {
    throw new InputError(`ensemble proposal: ${expectedFound('a proposal name or a non-empty list of weighted proposals', option)}`);
  }
  let total = 0;
  for (const [index, entry] of list.entries()) {
    if (!PROPOSAL_KINDS.includes(entry?.proposal)) {
      throw new InputError(`ensemble proposal ${index}: ${expectedFound(`one of ${PROPOSAL_KINDS.join(', ')}`, entry?.proposal)}`);
    }
    if (typeof entry.weight !== 'number' || !(entry.weight > 0) || !Number.isFinite(entry.weight)) {
      throw new InputError(`ensemble proposal ${index} weight: ${expectedFound('a finite number > 0', entry.weight)}`);
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
  return { kinds: list.map((entry) => entry.proposal), cumulative };
}
