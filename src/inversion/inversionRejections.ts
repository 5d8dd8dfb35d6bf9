import type { RejectionCountsRecord } from '../records/modelRecord.js';

/**
 * Why a pixelated-source likelihood was minus infinity, counted by reason over a run: the mesh
 * could not be built (too few, non-finite or collinear vertices, or a degenerate grid); the
 * posterior precision A was not positive definite (regularisation too weak for the data's null
 * space, or rounding); the regularisation matrix was not (should not happen: the boundary ties it
 * down). The record's shape, writable.
 */
export type InversionRejections = { -readonly [reason in keyof RejectionCountsRecord]: number };

export function noRejections(): InversionRejections {
  return { mesh: 0, notPositiveDefinite: 0, regularisation: 0 };
}

/** The reasons, in the order records and reports list them. */
export const REJECTION_REASONS = ['mesh', 'notPositiveDefinite', 'regularisation'] as const satisfies ReadonlyArray<keyof InversionRejections>;

/** Adds `more` to `into`, reason by reason. */
export function addRejections(into: InversionRejections, more: Readonly<InversionRejections>): void {
  for (const reason of REJECTION_REASONS) into[reason] += more[reason];
}
