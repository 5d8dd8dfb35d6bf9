/**
 * source.json, written beside the best-fit images of a model with a pixelated source: the source
 * reconstructed at the best fit (posterior mean of the cells given the best-fit lens) and its
 * posterior standard deviation, on the mesh of that evaluation.
 */
export interface SourceFile {
  readonly mesh: 'regular' | 'adaptive';
  readonly regularisation: string;
  /** Cell (node) positions in the source plane, arcsec. */
  readonly cellXArcsec: readonly number[];
  readonly cellYArcsec: readonly number[];
  /** Surface brightness of each cell (counts/s/arcsec^2) and its posterior standard deviation. */
  readonly values: readonly number[];
  readonly standardDeviations: readonly number[];
  /** Adaptive mesh: the Delaunay triangles, three cell indices each. */
  readonly triangles: readonly number[] | null;
  /** Regular mesh: cells per side (cell b * side + a is column a, row b). */
  readonly side: number | null;
  /** Rays of that evaluation that fell outside the mesh (they see no source). */
  readonly raysOutside: number;
  /**
   * Adaptive mesh with a bright share: how many cells sit on the bright pixels' lattice, and the
   * data-to-noise ratio above which a pixel was bright (absent otherwise).
   */
  readonly brightCells?: { readonly count: number; readonly signalToNoise: number };
}
