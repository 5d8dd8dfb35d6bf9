/** Settings of a Nelder-Mead minimisation. */
export interface NelderMeadOptions {
  /** Initial simplex: the start plus `step[k]` along each axis k. */
  readonly step: ArrayLike<number>;
  /** Stop when the simplex's function values span less than this (absolute). */
  readonly valueTolerance: number;
  /** ... and every vertex lies within this of the best along every axis (absolute). */
  readonly pointTolerance: number;
  readonly maxEvaluations: number;
}

export interface NelderMeadResult {
  readonly point: Float64Array;
  readonly value: number;
  readonly evaluations: number;
  readonly converged: boolean;
}

/**
 * Minimises f by the downhill simplex method of Nelder & Mead (1965, Computer Journal 7, 308)
 * with the standard coefficients reflection 1, expansion 2, contraction 1/2, shrink 1/2 and the
 * accept/contract rules as stated by Lagarias, Reeds, Wright & Wright (1998, SIAM J. Optim. 9,
 * 112). f may return +Infinity (e.g. outside a prior's support); such points are never accepted
 * over finite ones. Buffers are allocated once per call, none per step.
 */
export function nelderMead(f: (x: Float64Array) => number, start: ArrayLike<number>, options: NelderMeadOptions): NelderMeadResult {
  const n = start.length;
  const vertices = Array.from({ length: n + 1 }, () => Float64Array.from(start));
  for (let k = 0; k < n; k++) vertices[k + 1][k] += options.step[k];
  const values = new Float64Array(n + 1);
  let evaluations = 0;
  const evaluate = (x: Float64Array): number => {
    evaluations++;
    const v = f(x);
    return Number.isNaN(v) ? Number.POSITIVE_INFINITY : v;
  };
  for (let k = 0; k <= n; k++) values[k] = evaluate(vertices[k]);
  const order = Array.from({ length: n + 1 }, (_, k) => k);
  const centroid = new Float64Array(n);
  const reflected = new Float64Array(n);
  const trial = new Float64Array(n);
  const along = (out: Float64Array, from: Float64Array, towards: Float64Array, t: number): void => {
    for (let k = 0; k < n; k++) out[k] = from[k] + t * (towards[k] - from[k]);
  };
  let converged = false;
  while (evaluations < options.maxEvaluations) {
    order.sort((a, b) => values[a] - values[b]);
    const best = order[0];
    const worst = order[n];
    const secondWorst = order[n - 1];
    if (values[worst] - values[best] < options.valueTolerance) {
      let spread = 0;
      for (let v = 0; v <= n; v++) for (let k = 0; k < n; k++) spread = Math.max(spread, Math.abs(vertices[v][k] - vertices[best][k]));
      if (spread < options.pointTolerance) { converged = true; break; }
    }
    centroid.fill(0);
    for (let v = 0; v < n; v++) {
      const vertex = vertices[order[v]];
      for (let k = 0; k < n; k++) centroid[k] += vertex[k] / n;
    }
    along(reflected, centroid, vertices[worst], -1);
    const fr = evaluate(reflected);
    if (fr < values[best]) {
      along(trial, centroid, vertices[worst], -2);
      const fe = evaluate(trial);
      if (fe < fr) { vertices[worst].set(trial); values[worst] = fe; } else { vertices[worst].set(reflected); values[worst] = fr; }
      continue;
    }
    if (fr < values[secondWorst]) { vertices[worst].set(reflected); values[worst] = fr; continue; }
    // Contraction: outside when the reflected point beats the worst, inside otherwise.
    const outside = fr < values[worst];
    along(trial, centroid, outside ? reflected : vertices[worst], 0.5);
    const fc = evaluate(trial);
    if (outside ? fc <= fr : fc < values[worst]) { vertices[worst].set(trial); values[worst] = fc; continue; }
    // Shrink every vertex half-way towards the best.
    for (let v = 1; v <= n; v++) {
      const vertex = vertices[order[v]];
      along(vertex, vertices[best], vertex, 0.5);
      values[order[v]] = evaluate(vertex);
    }
  }
  let best = 0;
  for (let v = 1; v <= n; v++) if (values[v] < values[best]) best = v;
  return { point: Float64Array.from(vertices[best]), value: values[best], evaluations, converged };
}
