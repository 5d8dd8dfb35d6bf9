// The numeric operations on one dense front of MultifrontalCholesky (Duff & Reid 1983, ACM
// Trans. Math. Software 9, 302): assembling A's entries, extend-adding a child's update matrix,
// pushing its own update matrix to the stack, and clearing fronts.

export function assembleEntries(front: Float64Array, value: Float64Array, entrySource: Int32Array, entryTarget: Int32Array, from: number, to: number): void {
  for (let t = from; t < to; t++) front[entryTarget[t]] += value[entrySource[t]];
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
 * The child's rows fall into runs of consecutive front positions (runEnd[from + i]: one past the
 * last row of the run holding row i, relativeRuns), each added as one contiguous stretch; every
 * entry gets the same single addition as row by row, so the front is the same to the bit.
 */
export function extendAdd(
  front: Float64Array, frontSize: number, update: Float64Array, at: number, ld: number, m: number,
  relative: Int32Array, runEnd: Int32Array, from: number,
): void {
  for (let j = 0; j < m; j++) {
    const column = relative[from + j] * frontSize;
    const source = at + j * ld;
    for (let i = j; i < m;) {
      const end = runEnd[from + i] - from;
      addStretch(front, column + relative[from + i] - i, update, source, i, end);
      i = end;
    }
  }
}

/** front[shift + k] += update[source + k] for k = first .. end - 1. */
function addStretch(front: Float64Array, shift: number, update: Float64Array, source: number, first: number, end: number): void {
  for (let k = first; k < end; k++) front[shift + k] += update[source + k];
}

/**
 * For each t in from .. to - 1, one past the last t' of the run of consecutive positions
 * relative[t], relative[t] + 1, ... that holds t (the runs extendAdd adds whole).
 */
export function relativeRuns(relative: Int32Array, runEnd: Int32Array, from: number, to: number): void {
  let end = to;
  for (let t = to - 1; t >= from; t--) {
    if (t + 1 < to && relative[t + 1] !== relative[t] + 1) end = t + 1;
    runEnd[t] = end;
  }
}

/** Zeroes the lower triangle (diagonal included) of the size x size column-major front. */
export function zeroLower(front: Float64Array, size: number): void {
  for (let j = 0; j < size; j++) front.fill(0, j * size + j, (j + 1) * size);
}
