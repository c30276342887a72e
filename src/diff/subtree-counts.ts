import type { Tree } from "../model/tree.js";

/**
 * Nodes in every subtree, the node included: the `count` of `measure` alone, for the two versions of
 * a diff, which need nothing else of them (one typed array instead of four).
 */
export function subtreeCounts(tree: Tree): Int32Array {
  const { parent } = tree;
  const count = new Int32Array(tree.length).fill(1);
  for (let i = tree.length - 1; i > 0; i--) count[parent[i]] += count[i];
  return count;
}
