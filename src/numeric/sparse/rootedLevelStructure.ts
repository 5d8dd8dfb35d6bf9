import type { SymmetricAdjacency } from './symmetricAdjacency.js';

/**
 * The rooted level structure of the component of `root` among nodes with mask[v] !== 0
 * (George & Liu 1981, chapter 4, subroutine ROOTLS): breadth-first levels, level l being
 * nodes[levelStart[l] .. levelStart[l + 1] - 1]. Returns the number of levels; the component
 * size is levelStart[levels]. `mask` is as it was on return; nodes and levelStart need room
 * for the component (n and n + 1 entries suffice).
 */
export function rootedLevelStructure(
  graph: SymmetricAdjacency, root: number, mask: Uint8Array, nodes: Int32Array, levelStart: Int32Array,
): number {
  const levels = breadthFirstLevels(graph, root, mask, nodes, levelStart);
  unmark(nodes, levelStart[levels], mask);
  return levels;
}

/** Breadth-first search from root, clearing mask on the nodes it reaches. */
function breadthFirstLevels(
  graph: SymmetricAdjacency, root: number, mask: Uint8Array, nodes: Int32Array, levelStart: Int32Array,
): number {
  const { start, neighbour } = graph;
  mask[root] = 0;
  nodes[0] = root;
  let levels = 0;
  let begin = 0;
  let end = 1;
  while (begin < end) {
    levelStart[levels++] = begin;
    const levelEnd = end;
    for (let t = begin; t < levelEnd; t++) {
      const v = nodes[t];
      for (let p = start[v]; p < start[v + 1]; p++) {
        const w = neighbour[p];
        if (mask[w] === 0) continue;
        mask[w] = 0;
        nodes[end++] = w;
      }
    }
    begin = levelEnd;
  }
  levelStart[levels] = end;
  return levels;
}

function unmark(nodes: Int32Array, count: number, mask: Uint8Array): void {
  for (let t = 0; t < count; t++) mask[nodes[t]] = 1;
}
