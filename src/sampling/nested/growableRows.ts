/** A table of rows of fixed width in one Float64Array that doubles its capacity as rows are added. */
export class GrowableRows {
  readonly width: number;
  private data: Float64Array;
  private rows = 0;

  constructor(width: number, initialRows = 256) {
    this.width = width;
    this.data = new Float64Array(Math.max(1, width) * Math.max(1, initialRows));
  }

  get count(): number {
    return this.rows;
  }

  /** Appends values[offset .. offset + width). */
  push(values: ArrayLike<number>, offset = 0): void {
    this.reserve(this.rows + 1);
    const start = this.rows * this.width;
    for (let i = 0; i < this.width; i++) this.data[start + i] = values[offset + i];
    this.rows++;
  }

  pushValue(value: number): void {
    this.reserve(this.rows + 1);
    this.data[this.rows * this.width] = value;
    this.rows++;
  }

  get(row: number, column = 0): number {
    return this.data[row * this.width + column];
  }

  /** The first `count` rows as a view (valid until the next push). */
  view(): Float64Array {
    return this.data.subarray(0, this.rows * this.width);
  }

  /** Drops the first `rows` rows, keeping the rest in order. */
  dropFirst(rows: number): void {
    const keep = this.rows - rows;
    this.data.copyWithin(0, rows * this.width, this.rows * this.width);
    this.rows = keep;
  }

  clear(): void {
    this.rows = 0;
  }

  private reserve(rows: number): void {
    if (rows * this.width <= this.data.length) return;
    let capacity = this.data.length;
    while (capacity < rows * this.width) capacity *= 2;
    const grown = new Float64Array(capacity);
    grown.set(this.data.subarray(0, this.rows * this.width));
    this.data = grown;
  }
}
