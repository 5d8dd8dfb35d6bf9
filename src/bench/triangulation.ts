import { isothermalEllipsoid } from '../lens/isothermalEllipsoid/isothermalEllipsoid.js';
import {
  barycentricWeights,
  DelaunayTriangulation,
  VertexAdjacency,
  vertexAreas,
} from '../numeric/geometry/index.js';
import { wholeNumberOption } from './benchOptions.js';
import { bestMillisecondsPerCall } from './forward.js';

/** Lens of the scenarios: an isothermal ellipsoid (Einstein radius, q, angle, centre, core). */
const LENS = Float64Array.from([1.2, 0.8, 30, 0.03, -0.02, 0]);
/** A second lens, its Einstein radius 0.5 mas larger: rebuilds alternate between the two. */
const NEXT_LENS = Float64Array.from([1.2005, 0.8, 30, 0.03, -0.02, 0]);

/** Traced rays of one lens: source-plane positions of the pixels, and every n-th as vertices. */
interface TracedRays {
  readonly betaX: Float64Array;
  readonly betaY: Float64Array;
  readonly vertexX: Float64Array;
  readonly vertexY: Float64Array;
}

/** A scenario: pixel centres in raster order (row by row), and the vertex stride. */
interface RasterScenario {
  readonly name: string;
  readonly x: Float64Array;
  readonly y: Float64Array;
  readonly stride: number;
}

/**
 * Pixel centres of a side x side raster at `scale` arcsec, row by row, kept where
 * inner <= |theta| <= outer (arcsec).
 */
function raster(side: number, scale: number, inner: number, outer: number): { x: Float64Array; y: Float64Array } {
  const xs: number[] = [];
  const ys: number[] = [];
  for (let j = 0; j < side; j++) {
    for (let i = 0; i < side; i++) {
      const x = (i - (side - 1) / 2) * scale;
      const y = (j - (side - 1) / 2) * scale;
      const r = Math.hypot(x, y);
      if (r >= inner && r <= outer) {
        xs.push(x);
        ys.push(y);
      }
    }
  }
  return { x: Float64Array.from(xs), y: Float64Array.from(ys) };
}

/** beta = theta - alpha(theta) for every pixel, and every stride-th ray as a vertex. */
function trace(scenario: RasterScenario, lens: Float64Array): TracedRays {
  const n = scenario.x.length;
  const betaX = Float64Array.from(scenario.x);
  const betaY = Float64Array.from(scenario.y);
  const alphaX = new Float64Array(n);
  const alphaY = new Float64Array(n);
  isothermalEllipsoid.addDeflection(lens, 0, scenario.x, scenario.y, n, alphaX, alphaY);
  for (let k = 0; k < n; k++) {
    betaX[k] -= alphaX[k];
    betaY[k] -= alphaY[k];
  }
  const vertices = Math.ceil(n / scenario.stride);
  const vertexX = new Float64Array(vertices);
  const vertexY = new Float64Array(vertices);
  for (let v = 0; v < vertices; v++) {
    vertexX[v] = betaX[v * scenario.stride];
    vertexY[v] = betaY[v * scenario.stride];
  }
  return { betaX, betaY, vertexX, vertexY };
}

/**
 * `npm run bench -- triangulation [--repeats N]`: milliseconds per stage of the adaptive source
 * grid (one thread), best of N (default 15) repeats of ~60 ms, one JSON line per scenario:
 * - rebuildMs: DelaunayTriangulation.rebuild of about 1,000 vertices, alternating between the
 *   rays of two lenses of the same point count (Delaunator.update()); freshMs: a new
 *   triangulation object each time, for comparison;
 * - weightsMs: barycentricWeights for about 50,000 rays in raster order;
 * - adjacencyMs, areasMs: VertexAdjacency.rebuild and vertexAreas.
 * Scenarios: fullImage, every pixel of a 224 x 224 raster at 0.03 arcsec (50,176 rays, many
 * outside the vertices' hull), and annulus, the pixels of a 270 x 270 raster at 0.0135 arcsec
 * within 0.6-1.8 arcsec of the centre, which the lens maps about twice over onto the source.
 */
export async function run(args: string[]): Promise<void> {
  const repeats = wholeNumberOption(args, '--repeats', 15);
  const scenarios: RasterScenario[] = [
    { name: 'fullImage', ...raster(224, 0.03, 0, Infinity), stride: 50 },
    { name: 'annulus', ...raster(270, 0.0135, 0.6, 1.8), stride: 50 },
  ];
  for (const scenario of scenarios) {
    const rays = [trace(scenario, LENS), trace(scenario, NEXT_LENS)];
    const queries = scenario.x.length;
    const vertices = rays[0].vertexX.length;
    const triangulation = new DelaunayTriangulation();
    const adjacency = new VertexAdjacency();
    const areas = new Float64Array(vertices);
    const vertexOut = new Int32Array(3 * queries);
    const weightOut = new Float64Array(3 * queries);
    let which = 0;
    const rebuild = bestMillisecondsPerCall(() => {
      which = 1 - which;
      triangulation.rebuild(rays[which].vertexX, rays[which].vertexY);
    }, repeats);
    const fresh = bestMillisecondsPerCall(() => {
      which = 1 - which;
      new DelaunayTriangulation().rebuild(rays[which].vertexX, rays[which].vertexY);
    }, repeats);
    triangulation.rebuild(rays[0].vertexX, rays[0].vertexY);
    let outside = 0;
    const weights = bestMillisecondsPerCall(() => {
      outside = barycentricWeights(triangulation, rays[0].betaX, rays[0].betaY, queries, vertexOut, weightOut);
    }, repeats);
    const adjacencyTime = bestMillisecondsPerCall(() => adjacency.rebuild(triangulation), repeats);
    const areasTime = bestMillisecondsPerCall(() => vertexAreas(triangulation, areas), repeats);
    const ms = (t: { ms: number }): number => Number(t.ms.toFixed(4));
    console.log(JSON.stringify({
      benchmark: 'triangulation',
      scenario: scenario.name,
      vertices,
      triangles: triangulation.triangleCount,
      status: triangulation.status,
      queries,
      outside,
      walkFallbacks: triangulation.walkFallbacks,
      rebuildMs: ms(rebuild),
      freshMs: ms(fresh),
      weightsMs: ms(weights),
      cpuWeightsMs: ms({ ms: weights.cpuMs }),
      adjacencyMs: ms(adjacencyTime),
      areasMs: ms(areasTime),
      rebuildPlusWeightsMs: ms({ ms: rebuild.ms + weights.ms }),
      repeats,
    }));
  }
}
