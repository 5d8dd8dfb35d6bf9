import { pseudoPeripheralNode } from './pseudoPeripheralNode.js';
import { rootedLevelStructure } from './rootedLevelStructure.js';
import type { SymmetricAdjacency } from './symmetricAdjacency.js';

/**
 * One step of nested dissection from the graph alone (after George & Liu 1981, chapter 8,
 * subroutine FNDSEP; chapter and name from memory): for the nodes[from .. to - 1], given a mask that is 0 on every node, the
 * rooted level structure of a pseudo-peripheral node, cut at the level holding the median
 * node: the levels before it form A, the level itself the separator S (an edge of a level
 * structure joins only neighbouring levels), the levels after it B. A set that is not
 * connected is instead split into whole components, A taking components until it holds half
 * the nodes (leaving B at least one), with no separator. Writes label[v] = stamp (A), stamp + 1 (B) or stamp + 2 (S);
 * returns false, labelling nothing, for a connected set whose structure has fewer than three
 * levels (nothing to separate). `mask` is 0 again on return; levelNodes and levelStart are
 * work arrays of n and n + 1 entries.
 */
export function levelBisection(
  graph: SymmetricAdjacency, nodes: Int32Array, from: number, to: number, mask: Uint8Array,
  levelNodes: Int32Array, levelStart: Int32Array, label: Int32Array, stamp: number,
): boolean {
  setMask(nodes, from, to, mask, 1);
  const size = to - from;
  const levels = rootedLevelStructure(graph, nodes[from], mask, levelNodes, levelStart);
  let split = true;
  if (levelStart[levels] < size) splitComponents(graph, nodes, from, to, mask, levelNodes, levelStart, label, stamp);
  else split = splitLevels(graph, nodes[from], mask, levelNodes, levelStart, label, stamp);
  setMask(nodes, from, to, mask, 0);
  return split;
}

function setMask(nodes: Int32Array, from: number, to: number, mask: Uint8Array, value: number): void {
  for (let t = from; t < to; t++) mask[nodes[t]] = value;
}

/** Whole components into A until it holds half the nodes, the rest into B (at least one component each). */
function splitComponents(
  graph: SymmetricAdjacency, nodes: Int32Array, from: number, to: number, mask: Uint8Array,
  levelNodes: Int32Array, levelStart: Int32Array, label: Int32Array, stamp: number,
): void {
  const half = (to - from) >> 1;
  let inA = 0;
  for (let t = from; t < to; t++) {
    const v = nodes[t];
    if (mask[v] === 0) continue;
    if (inA >= half) {
      label[v] = stamp + 1;
      continue;
    }
    const levels = rootedLevelStructure(graph, v, mask, levelNodes, levelStart);
    const componentSize = levelStart[levels];
    const toA = inA + componentSize < to - from;
    labelAndUnmask(levelNodes, 0, componentSize, mask, label, toA ? stamp : stamp + 1);
    if (toA) inA += componentSize;
  }
}

/** A connected set: levels before the median node's level into A, that level into S, the rest into B. */
function splitLevels(
  graph: SymmetricAdjacency, start: number, mask: Uint8Array, levelNodes: Int32Array, levelStart: Int32Array, label: Int32Array, stamp: number,
): boolean {
  const root = pseudoPeripheralNode(graph, start, mask, levelNodes, levelStart);
  const levels = rootedLevelStructure(graph, root, mask, levelNodes, levelStart);
  if (levels < 3) return false;
  const half = levelStart[levels] >> 1;
  let cut = 1;
  while (cut < levels - 2 && levelStart[cut + 1] <= half) cut++;
  labelLevels(levelNodes, 0, levelStart[cut], label, stamp);
  labelLevels(levelNodes, levelStart[cut], levelStart[cut + 1], label, stamp + 2);
  labelLevels(levelNodes, levelStart[cut + 1], levelStart[levels], label, stamp + 1);
  return true;
}

function labelLevels(levelNodes: Int32Array, from: number, to: number, label: Int32Array, value: number): void {
  for (let t = from; t < to; t++) label[levelNodes[t]] = value;
}

function labelAndUnmask(levelNodes: Int32Array, from: number, to: number, mask: Uint8Array, label: Int32Array, value: number): void {
  for (let t = from; t < to; t++) {
    label[levelNodes[t]] = value;
    mask[levelNodes[t]] = 0;
  }
}
