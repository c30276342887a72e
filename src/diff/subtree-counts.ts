import type { Tree } from "../model/tree.js";

/**
 * Nodes in every subtree, the node included: the `count` of `measure` alone, for the two versions of
 * a diff, which need nothing else of them (one typed array instead of four). `room` (at least the
 * tree's length) sizes the memory under the array: pages past the tree's length are never touched
 * here, so they cost nothing until a later stage is lent them (see `prepareDiff`).
 */
export function subtreeCounts(tree: Tree, room: number = tree.length): Int32Array {
  const { parent } = tree;
  const count = new Int32Array(new ArrayBuffer(Math.max(room, tree.length) * 4), 0, tree.length).fill(1);
  for (let i = tree.length - 1; i > 0; i--) count[parent[i]] += count[i];
  return count;
}
