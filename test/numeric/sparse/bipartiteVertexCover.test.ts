import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { BipartiteVertexCover } from '../../../src/numeric/sparse/bipartiteVertexCover.js';
import { uniformStream } from './sparseTestMatrices.js';

interface MatchingCase {
  name: string;
  left: number;
  right: number;
  edges: [number, number][];
  matching: number;
}

// Random bipartite graphs and scipy's maximum matching size, from fixtures/make_matching_fixtures.py.
const matchingCases = (JSON.parse(readFileSync(new URL('./fixtures/matching.json', import.meta.url), 'utf8')) as { cases: MatchingCase[] }).cases;

/** Compressed rows of the left vertices' neighbours. */
function compressed(left: number, edges: [number, number][]): { start: Int32Array; neighbour: Int32Array } {
  const start = new Int32Array(left + 1);
  for (const [u] of edges) start[u + 1]++;
  for (let u = 0; u < left; u++) start[u + 1] += start[u];
  const next = start.slice(0, left);
  const neighbour = new Int32Array(edges.length);
  for (const [u, v] of edges) neighbour[next[u]++] = v;
  return { start, neighbour };
}

function coverOf(left: number, right: number, edges: [number, number][], solver = new BipartiteVertexCover()): { size: number; inCover: Uint8Array } {
  const { start, neighbour } = compressed(left, edges);
  const inCover = new Uint8Array(left + right);
  return { size: solver.cover(left, right, start, neighbour, inCover), inCover };
}

function covers(left: number, edges: [number, number][], inCover: Uint8Array): boolean {
  return edges.every(([u, v]) => inCover[u] === 1 || inCover[left + v] === 1);
}

/** The least size of a vertex cover, by trying every subset (the definition; small graphs only). */
function bruteForceCover(left: number, right: number, edges: [number, number][]): number {
  let best = left + right;
  for (let subset = 0; subset < 1 << (left + right); subset++) {
    const size = subset.toString(2).split('').filter((b) => b === '1').length;
    if (size >= best) continue;
    if (edges.every(([u, v]) => (subset >> u) & 1 || (subset >> (left + v)) & 1)) best = size;
  }
  return best;
}

describe('BipartiteVertexCover', () => {
  it('finds a cover as small as the smallest found by trying every subset, on small random graphs', () => {
    const u = uniformStream(61);
    for (let round = 0; round < 40; round++) {
      const left = 1 + Math.floor(6 * u());
      const right = 1 + Math.floor(6 * u());
      const p = 0.15 + 0.6 * u();
      const edges: [number, number][] = [];
      for (let a = 0; a < left; a++) for (let b = 0; b < right; b++) if (u() < p) edges.push([a, b]);
      const { size, inCover } = coverOf(left, right, edges);
      expect(covers(left, edges, inCover), `round ${round}`).toBe(true);
      expect(inCover.reduce((s, v) => s + v, 0), `round ${round}`).toBe(size);
      expect(size, `round ${round}`).toBe(bruteForceCover(left, right, edges));
    }
  });

  it("covers every edge with as many vertices as scipy's maximum matching (König's theorem), one instance reused", () => {
    const solver = new BipartiteVertexCover();
    for (const c of matchingCases) {
      const { size, inCover } = coverOf(c.left, c.right, c.edges, solver);
      expect(covers(c.left, c.edges, inCover), c.name).toBe(true);
      expect(inCover.reduce((s, v) => s + v, 0), c.name).toBe(size);
      expect(size, c.name).toBe(c.matching);
    }
  });
});
