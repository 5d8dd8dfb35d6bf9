import { rootedLevelStructure } from './rootedLevelStructure.js';
import type { SymmetricAdjacency } from './symmetricAdjacency.js';

/**
 * A pseudo-peripheral node of the component of `start` among nodes with mask[v] !== 0, found by
 * the algorithm of Gibbs, Poole & Stockmeyer (1976) as modified by George & Liu (1979, ACM
 * Trans. Math. Software 5, 284; George & Liu 1981, chapter 4, subroutine FNROOT): from a root,
 * move to a least-degree node of the last level of its rooted level structure while that makes
 * the structure deeper. On return nodes/levelStart hold the level structure of the node
 * returned; `mask` is unchanged.
 */
export function pseudoPeripheralNode(
  graph: SymmetricAdjacency, start: number, mask: Uint8Array, nodes: Int32Array, levelStart: Int32Array,
): number {
  let root = start;
  let levels = rootedLevelStructure(graph, root, mask, nodes, levelStart);
  const componentSize = levelStart[levels];
  while (levels > 1 && levels < componentSize) {
    const candidate = leastDegreeNode(graph, nodes, levelStart[levels - 1], componentSize);
    const candidateLevels = rootedLevelStructure(graph, candidate, mask, nodes, levelStart);
    root = candidate;
    if (candidateLevels <= levels) break;
    levels = candidateLevels;
  }
  return root;
}

/** The first node of least degree among nodes[from .. to - 1]. */
function leastDegreeNode(graph: SymmetricAdjacency, nodes: Int32Array, from: number, to: number): number {
  const { start } = graph;
  let best = nodes[from];
  let bestDegree = start[best + 1] - start[best];
  for (let t = from + 1; t < to; t++) {
    const v = nodes[t];
    const degree = start[v + 1] - start[v];
    if (degree < bestDegree) {
      best = v;
      bestDegree = degree;
    }
  }
  return best;
}
