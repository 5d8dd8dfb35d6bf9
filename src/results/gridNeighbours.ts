/** Which pixels count as neighbours on the grid: the 4 sharing an edge, or the 8 sharing an edge or a corner. */
export type NeighbourScheme = 'rook' | 'queen';

/**
 * The used pixels of a grid and their neighbours among the used pixels (binary, symmetric weights):
 * used pixel k sits at grid index pixels[k] (column + columns * row); its neighbours are
 * list[start[k] .. start[k + 1]), as indices k of used pixels.
 */
export interface GridNeighbours {
  readonly count: number;
  readonly pixels: Int32Array;
  readonly start: Int32Array;
  readonly list: Int32Array;
  /** S0 = sum of all weights = the number of ordered neighbour pairs. */
  readonly weightSum: number;
}

const ROOK: ReadonlyArray<readonly [number, number]> = [[-1, 0], [1, 0], [0, -1], [0, 1]];
const QUEEN: ReadonlyArray<readonly [number, number]> = [...ROOK, [-1, -1], [1, -1], [-1, 1], [1, 1]];

// Contiguity on a regular lattice, rook and queen cases (Cliff & Ord 1981, Spatial Processes, sec. 1.5).
export function gridNeighbours(
  columns: number, rows: number, used: ArrayLike<number | boolean>, scheme: NeighbourScheme,
): GridNeighbours {
  const steps = scheme === 'rook' ? ROOK : QUEEN;
  const order = new Int32Array(columns * rows).fill(-1);
  const pixels: number[] = [];
  for (let g = 0; g < columns * rows; g++) {
    if (used[g]) {
      order[g] = pixels.length;
      pixels.push(g);
    }
  }
  const start = new Int32Array(pixels.length + 1);
  const list: number[] = [];
  for (let k = 0; k < pixels.length; k++) {
    const column = pixels[k] % columns, row = (pixels[k] - column) / columns;
    for (const [dc, dr] of steps) {
      const c = column + dc, r = row + dr;
      if (c < 0 || c >= columns || r < 0 || r >= rows) continue;
      const neighbour = order[c + columns * r];
      if (neighbour >= 0) list.push(neighbour);
    }
    start[k + 1] = list.length;
  }
  return { count: pixels.length, pixels: Int32Array.from(pixels), start, list: Int32Array.from(list), weightSum: list.length };
}
