/** The values of one parameter (column `index`) from row-major points with rows of `dim`. */
export function parameterColumn(points: ArrayLike<number>, dim: number, index: number): Float64Array {
  const count = Math.floor(points.length / dim);
  const column = new Float64Array(count);
  for (let row = 0, at = index; row < count; row++, at += dim) column[row] = points[at];
  return column;
}
