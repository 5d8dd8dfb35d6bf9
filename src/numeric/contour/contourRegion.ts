/** Values on a regular grid: value (ix, iy) at values[iy * xCount + ix], sitting at (xCentres[ix], yCentres[iy]). */
export interface GridValues {
  readonly xCentres: ArrayLike<number>;
  readonly yCentres: ArrayLike<number>;
  readonly values: ArrayLike<number>;
}

/**
 * The super-level set {value >= level} of gridded values, as closed loops of (x, y) points in the
 * grid's coordinates (flat: x0, y0, x1, y1, ...). Each loop runs with the region on its left, so
 * outer boundaries turn counter-clockwise and holes clockwise; filled with the even-odd or the
 * non-zero rule they give the same region. The grid is padded with a ring one cell wide holding
 * `outside` (default 0, right for densities), so every loop of a level above `outside` closes.
 */
export interface ContourRegion {
  readonly level: number;
  readonly loops: Float64Array[];
}

/** Centres of the bins between consecutive edges. */
export function binCentres(edges: ArrayLike<number>): Float64Array {
  const centres = new Float64Array(edges.length - 1);
  for (let k = 0; k < centres.length; k++) centres[k] = 0.5 * (edges[k] + edges[k + 1]);
  return centres;
}

// Marching squares (Lorensen & Cline 1987 in 2-D) with each square clipped by Sutherland & Hodgman
// (1974) against value >= level, values linear along square edges; saddles join the two high corners.
export function contourRegion(grid: GridValues, level: number, outside = 0): ContourRegion {
  const nx = grid.xCentres.length;
  const ny = grid.yCentres.length;
  if (grid.values.length !== nx * ny) throw new Error(`contour grid: expected ${nx * ny} values, found ${grid.values.length}`);
  if (!Number.isFinite(level) || !(level > outside) || nx < 2 || ny < 2) return { level, loops: [] };
  // Padded grid: index p = 0..nx+1 along x, q = 0..ny+1 along y; the ring holds `outside`.
  const px = nx + 2;
  const py = ny + 2;
  const xs = paddedCentres(grid.xCentres);
  const ys = paddedCentres(grid.yCentres);
  const value = (p: number, q: number): number =>
    p === 0 || q === 0 || p === px - 1 || q === py - 1 ? outside : grid.values[(q - 1) * nx + (p - 1)];

  // Crossing ids: horizontal edge (p, q)-(p+1, q) is 2 * (q * px + p), vertical edge (p, q)-(p, q+1) is that + 1.
  const crossingPoint = new Map<number, readonly [number, number]>();
  const next = new Map<number, number>();
  const crossing = (p0: number, q0: number, p1: number, q1: number): number => {
    // Canonical order (lower corner first) so both squares sharing an edge compute the same point.
    const horizontal = q0 === q1;
    const [pa, qa, pb, qb] = p0 + q0 <= p1 + q1 ? [p0, q0, p1, q1] : [p1, q1, p0, q0];
    const id = 2 * (qa * px + pa) + (horizontal ? 0 : 1);
    if (!crossingPoint.has(id)) {
      const va = value(pa, qa);
      const f = (level - va) / (value(pb, qb) - va);
      crossingPoint.set(id, [xs[pa] + f * (xs[pb] - xs[pa]), ys[qa] + f * (ys[qb] - ys[qa])]);
    }
    return id;
  };

  const cornerP = [0, 1, 1, 0];
  const cornerQ = [0, 0, 1, 1];
  for (let q = 0; q < py - 1; q++) {
    for (let p = 0; p < px - 1; p++) {
      // Walk the square counter-clockwise; an edge leaving the region starts a boundary segment
      // that ends where the walk next enters it (the region stays on the segment's left).
      let exitId = -1;
      let firstEnterId = -1;
      let pendingExit = -1;
      for (let c = 0; c < 4; c++) {
        const p0 = p + cornerP[c];
        const q0 = q + cornerQ[c];
        const p1 = p + cornerP[(c + 1) % 4];
        const q1 = q + cornerQ[(c + 1) % 4];
        const in0 = value(p0, q0) >= level;
        const in1 = value(p1, q1) >= level;
        if (in0 && !in1) {
          exitId = crossing(p0, q0, p1, q1);
          pendingExit = exitId;
        } else if (!in0 && in1) {
          const enterId = crossing(p0, q0, p1, q1);
          if (pendingExit >= 0) {
            next.set(pendingExit, enterId);
            pendingExit = -1;
          } else firstEnterId = enterId;
        }
      }
      if (pendingExit >= 0 && firstEnterId >= 0) next.set(pendingExit, firstEnterId);
    }
  }

  const loops: Float64Array[] = [];
  const visited = new Set<number>();
  for (const start of next.keys()) {
    if (visited.has(start)) continue;
    const points: number[] = [];
    let id = start;
    while (!visited.has(id)) {
      visited.add(id);
      const [x, y] = crossingPoint.get(id)!;
      points.push(x, y);
      const following = next.get(id);
      if (following === undefined) break;
      id = following;
    }
    loops.push(Float64Array.from(points));
  }
  return { level, loops };
}

function paddedCentres(centres: ArrayLike<number>): Float64Array {
  const n = centres.length;
  const padded = new Float64Array(n + 2);
  for (let k = 0; k < n; k++) padded[k + 1] = centres[k];
  padded[0] = 2 * centres[0] - centres[1];
  padded[n + 1] = 2 * centres[n - 1] - centres[n - 2];
  return padded;
}
