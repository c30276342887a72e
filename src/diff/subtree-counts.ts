import type { Tree } from "../model/tree.js";

/**
 * Nodes in every subtree, the node itself included: the `count` of `measure` alone, for the two versions
 * of a diff, which need nothing else of them (one typed array instead of four). Written into `zeroed`
 * when given (memory holding zeros, at least the tree's length; see `prepareDiff`), else into a new
 * array. One reverse pass: a node's children all come after it in pre-order, so when it is reached its
 * entry holds their counts' sum, and the node adds itself.
 */
export function subtreeCounts(tree: Tree, zeroed?: Int32Array): Int32Array {
  const n = tree.length;
  const { parent } = tree;
  const count = zeroed === undefined ? new Int32Array(n) : zeroed.subarray(0, n);
  for (let i = n - 1; i > 0; i--) {
    const c = count[i] + 1;
    count[i] = c;
    count[parent[i]] += c;
  }
  if (n > 0) count[0] += 1;
  return count;
}
