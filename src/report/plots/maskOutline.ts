/**
 * The boundary of the used pixels of a mask (1 = used) as unit segments along pixel edges, in
 * pixel-corner coordinates: corner (i, j) is the lower-left corner of pixel (i, j), so the image
 * spans 0..columns across and 0..rows up. Flat list x0, y0, x1, y1 per segment.
 */
export function maskOutline(mask: ArrayLike<number>, columns: number, rows: number): number[] {
  const used = (i: number, j: number): boolean => i >= 0 && j >= 0 && i < columns && j < rows && mask[i + columns * j] !== 0;
  const segments: number[] = [];
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < columns; i++) {
      if (!used(i, j)) continue;
      if (!used(i - 1, j)) segments.push(i, j, i, j + 1);
      if (!used(i + 1, j)) segments.push(i + 1, j, i + 1, j + 1);
      if (!used(i, j - 1)) segments.push(i, j, i + 1, j);
      if (!used(i, j + 1)) segments.push(i, j + 1, i + 1, j + 1);
    }
  }
  return segments;
}
