/**
 * Why a Delaunay triangulation could not be built, or `ok`. Small integer codes, so that a
 * likelihood that returns minus infinity can count its reasons in an Int32Array indexed by code.
 */
export const TriangulationStatus = Object.freeze({
  /** Built: every vertex belongs to at least one triangle of positive area. */
  ok: 0,
  /** Fewer than three vertices. */
  tooFewPoints: 1,
  /** A vertex coordinate is NaN or infinite. */
  nonFinitePoint: 2,
  /** All vertices on one line (or all coincident): no triangle has positive area. */
  collinear: 3,
  /** Some vertex coincides with another (to 2^-52, delaunator's test) and is in no triangle. */
  duplicatePoints: 4,
  /** A triangle of zero area, or of the wrong orientation, came out (not seen from delaunator so far). */
  flatTriangle: 5,
});

/** One of the codes of `TriangulationStatus`. */
export type TriangulationStatusCode = (typeof TriangulationStatus)[keyof typeof TriangulationStatus];

/** Names of the codes, indexed by code, for messages and counters' labels. */
export const triangulationStatusNames: readonly string[] = Object.freeze(
  Object.entries(TriangulationStatus).sort((a, b) => a[1] - b[1]).map(([name]) => name),
);
