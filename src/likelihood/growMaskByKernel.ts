/**
 * The pixels whose light can reach a used pixel through a kernel of the given (odd) size:
 * the mask dilated by the kernel's half-widths (a square structuring element).
 */
export function growMaskByKernel(
  mask: Uint8Array, columns: number, rows: number, kernelColumns: number, kernelRows: number,
): Uint8Array {
  const halfX = (kernelColumns - 1) / 2;
  const halfY = (kernelRows - 1) / 2;
  const rowsGrown = new Uint8Array(mask.length);
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < columns; i++) {
      if (mask[j * columns + i] === 0) continue;
      const from = Math.max(0, i - halfX);
      const to = Math.min(columns - 1, i + halfX);
      for (let a = from; a <= to; a++) rowsGrown[j * columns + a] = 1;
    }
  }
  const grown = new Uint8Array(mask.length);
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < columns; i++) {
      if (rowsGrown[j * columns + i] === 0) continue;
      const from = Math.max(0, j - halfY);
      const to = Math.min(rows - 1, j + halfY);
      for (let b = from; b <= to; b++) grown[b * columns + i] = 1;
    }
  }
  return grown;
}
