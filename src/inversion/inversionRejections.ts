import type { RejectionCountsRecord } from '../records/modelRecord.js';

/**
 * Why a pixelated-source likelihood was minus infinity, counted by reason over a run: the mesh
 * could not be built (too few, non-finite or collinear vertices, or a degenerate grid); the
 * posterior precision A was not positive definite (regularisation too weak for the data's null
 * space, or rounding); the regularisation matrix was not (should not happen: the boundary ties it
 * down). Counted alongside, though the call goes on: `triangleFallbacks`, rays weighed by their
 * holding triangle where the natural-neighbour ring was flat, folded or too crowded (a source
 * plane that folds over the mesh). The record's shape, writable, every count present.
 */
export type InversionRejections = { -readonly [reason in keyof RejectionCountsRecord]-?: number };

export function noRejections(): InversionRejections {
  return { mesh: 0, notPositiveDefinite: 0, regularisation: 0, triangleFallbacks: 0 };
}

/** The counters, in the order records and reports list them (the three reasons of a rejection first). */
export const REJECTION_REASONS = ['mesh', 'notPositiveDefinite', 'regularisation', 'triangleFallbacks'] as const satisfies ReadonlyArray<keyof InversionRejections>;

/** Adds `more` to `into`, reason by reason. */
export function addRejections(into: InversionRejections, more: Readonly<InversionRejections>): void {
  for (const reason of REJECTION_REASONS) into[reason] += more[reason];
}
