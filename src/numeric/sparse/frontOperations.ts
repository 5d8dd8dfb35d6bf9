// The numeric operations on one dense front of MultifrontalCholesky (Duff & Reid 1983, ACM
// Trans. Math. Software 9, 302): assembling A's entries, extend-adding a child's update matrix,
// pushing its own update matrix to the stack, and copying and clearing fronts.

export function assembleEntries(front: Float64Array, value: Float64Array, entrySource: Int32Array, entryTarget: Int32Array, from: number, to: number): void {
  for (let t = from; t < to; t++) front[entryTarget[t]] += value[entrySource[t]];
}

export function copyRange(from: Float64Array, fromOffset: number, to: Float64Array, toOffset: number, length: number): void {
  for (let t = 0; t < length; t++) to[toOffset + t] = from[fromOffset + t];
}

/** Copies the lower triangle of the front's trailing m x m block to the stack at `top` (m x m, column-major). */
export function pushUpdate(front: Float64Array, frontSize: number, width: number, m: number, stack: Float64Array, top: number): void {
  for (let j = 0; j < m; j++) {
    const source = (width + j) * frontSize + width;
    const target = top + j * m;
    for (let i = j; i < m; i++) stack[target + i] = front[source + i];
  }
}

/**
 * Adds a child's m x m update matrix (lower triangle, column-major at update[at ..] with leading
 * dimension ld) into the front at its relative positions: the extend-add of Duff & Reid 1983.
 */
export function extendAdd(
  front: Float64Array, frontSize: number, update: Float64Array, at: number, ld: number, m: number, relative: Int32Array, from: number,
): void {
  for (let j = 0; j < m; j++) {
    const column = relative[from + j] * frontSize;
    const source = at + j * ld;
    for (let i = j; i < m; i++) front[column + relative[from + i]] += update[source + i];
  }
}

/** Zeroes the lower triangle (diagonal included) of the size x size column-major front. */
export function zeroLower(front: Float64Array, size: number): void {
  for (let j = 0; j < size; j++) front.fill(0, j * size + j, (j + 1) * size);
}
