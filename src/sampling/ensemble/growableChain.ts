/**
 * The stored ensemble chain (rows of walkers x dim positions and walkers log densities), grown by
 * doubling so a long maxSteps does not reserve memory it may never use.
 */
export class GrowableChain {
  readonly rowWidth: number;
  readonly walkers: number;
  rows = 0;
  private positions: Float64Array;
  private logDensities: Float64Array;

  constructor(walkers: number, dim: number, initialRows = 256) {
    this.walkers = walkers;
    this.rowWidth = walkers * dim;
    this.positions = new Float64Array(initialRows * this.rowWidth);
    this.logDensities = new Float64Array(initialRows * walkers);
  }

  append(positions: Float64Array, logDensities: Float64Array): void {
    if ((this.rows + 1) * this.walkers > this.logDensities.length) this.grow();
    this.positions.set(positions.subarray(0, this.rowWidth), this.rows * this.rowWidth);
    this.logDensities.set(logDensities.subarray(0, this.walkers), this.rows * this.walkers);
    this.rows++;
  }

  /** Views of the filled part (valid until the next append). */
  positionRows(): Float64Array {
    return this.positions.subarray(0, this.rows * this.rowWidth);
  }

  logDensityRows(): Float64Array {
    return this.logDensities.subarray(0, this.rows * this.walkers);
  }

  /** Replaces the content with saved rows (from a checkpoint). */
  restore(positions: Float64Array, logDensities: Float64Array): void {
    const rows = logDensities.length / this.walkers;
    while (this.logDensities.length < rows * this.walkers) this.grow();
    this.positions.set(positions);
    this.logDensities.set(logDensities);
    this.rows = rows;
  }

  private grow(): void {
    const positions = new Float64Array(Math.max(1, 2 * this.positions.length / this.rowWidth) * this.rowWidth);
    positions.set(this.positions);
    this.positions = positions;
    const logDensities = new Float64Array(positions.length / this.rowWidth * this.walkers);
    logDensities.set(this.logDensities);
    this.logDensities = logDensities;
  }
}
