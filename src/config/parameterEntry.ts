import { expectedFound } from '../errors.js';
import type { ConfigNode } from './configNode.js';

/** A prior as written in a config; the same shape the sampling library's priors take. */
export type ConfiguredPrior =
  | { readonly kind: 'uniform'; readonly lower: number; readonly upper: number }
  | { readonly kind: 'logUniform'; readonly lower: number; readonly upper: number }
  | { readonly kind: 'normal'; readonly mean: number; readonly sigma: number }
  | { readonly kind: 'truncatedNormal'; readonly mean: number; readonly sigma: number; readonly lower: number; readonly upper: number }
  | { readonly kind: 'periodic'; readonly lower: number; readonly upper: number };

/**
 * One model parameter as written in a config: either a bare number (known, held fixed) or a
 * mapping `{ value: 1.2, prior: { uniform: [1.0, 1.4] } }`. `value` is what `simulate` uses
 * (the truth); `prior` is what a fit samples. `key` is the dotted path for messages.
 */
export interface ParameterEntry {
  readonly key: string;
  readonly value: number | undefined;
  readonly prior: ConfiguredPrior | undefined;
}

const priorArity = {
  uniform: ['lower', 'upper'],
  logUniform: ['lower', 'upper'],
  normal: ['mean', 'sigma'],
  truncatedNormal: ['mean', 'sigma', 'lower', 'upper'],
  periodic: ['lower', 'upper'],
} as const;

type PriorKind = keyof typeof priorArity;
const priorKinds = Object.keys(priorArity) as PriorKind[];

export function readPrior(node: ConfigNode): ConfiguredPrior {
  if (!node.isMapping() || node.keys().length !== 1) {
    node.fail(expectedFound(`a mapping with one key, one of ${priorKinds.join(', ')}, e.g. { uniform: [0.5, 1.0] }`, node.value));
  }
  const kind = node.keys()[0] as PriorKind;
  if (!priorKinds.includes(kind)) {
    node.fail(expectedFound(`a prior kind, one of ${priorKinds.join(', ')}`, kind));
  }
  const argsNode = node.get(kind);
  const names = priorArity[kind];
  const args = argsNode.list();
  if (args.length !== names.length) {
    argsNode.fail(expectedFound(`a list of ${names.length} numbers [${names.join(', ')}]`, argsNode.value));
  }
  const numbers = args.map((a) => a.number());
  const fields: Record<string, number> = {};
  names.forEach((name, i) => { fields[name] = numbers[i]; });
  return { kind, ...fields } as unknown as ConfiguredPrior;
}

export function readParameterEntry(node: ConfigNode): ParameterEntry {
  if (typeof node.value === 'number') {
    return { key: node.key, value: node.number(), prior: undefined };
  }
  if (!node.isMapping()) {
    node.fail(expectedFound('a number or a mapping { value: ..., prior: ... }', node.value));
  }
  const valueNode = node.get('value');
  const value = valueNode.value === undefined ? undefined : valueNode.number();
  const priorNode = node.get('prior');
  const prior = priorNode.value === undefined ? undefined : readPrior(priorNode);
  node.finish();
  if (value === undefined && prior === undefined) node.fail('a parameter needs a value, a prior, or both');
  return { key: node.key, value, prior };
}
