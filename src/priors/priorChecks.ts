import { InputError, expectedFound } from '../errors.js';

/** Where a prior came from, so a mistake can be reported against the config key. */
export interface PriorPlace {
  readonly key?: string;
}

export function priorError(name: string, problem: string, place: PriorPlace): InputError {
  return new InputError(`prior of parameter "${name}": ${problem}`, place);
}

/** Reads one numeric field of a prior specification, insisting that it is a finite number. */
export function finiteField(
  name: string, spec: object, field: string, place: PriorPlace,
): number {
  const value = (spec as Record<string, unknown>)[field];
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw priorError(name, `${field}: ${expectedFound('a finite number', value)}`, place);
  }
  return value;
}

/** Insists on lower < upper, both finite. */
export function orderedBounds(
  name: string, spec: object, place: PriorPlace,
): { lower: number; upper: number } {
  const lower = finiteField(name, spec, 'lower', place);
  const upper = finiteField(name, spec, 'upper', place);
  if (!(lower < upper)) {
    throw priorError(name, `expected lower < upper, found lower = ${lower}, upper = ${upper}`, place);
  }
  return { lower, upper };
}

/** Insists on a strictly positive finite width. */
export function positiveSigma(name: string, spec: object, place: PriorPlace): number {
  const sigma = finiteField(name, spec, 'sigma', place);
  if (!(sigma > 0)) {
    throw priorError(name, `sigma: ${expectedFound('a number > 0', sigma)}`, place);
  }
  return sigma;
}
