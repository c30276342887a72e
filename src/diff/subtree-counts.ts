import type { Tree } from "../model/tree.js";

/**
 * Nodes in every subtree, the node itself included: the `count` of `measure` alone, for the two versions
 * of a diff, which need nothing else of them (one typed array instead of four). Written into `memory`
 * when given (at least the tree's length, any contents; see `prepareDiff`), else into a new array.
 * Every entry is set to 1 first, front to back, then one reverse pass: a node's children all come after
 * it in pre-order, so when it is reached its entry holds 1 plus their counts, and it is added to its
 * parent's. Writing every entry before any is read matters on a big tree: a page of fresh memory read
 * first and written later is faulted in twice (once read as zeros, once copied on the write), which cost
 * about 1,000 extra page faults for each version's counts at 1M nodes (docs/performance.md).
 */
export function subtreeCounts(tree: Tree, memory?: Int32Array): Int32Array {
  const n = tree.length;
  const { parent } = tree;
  const count = (memory === undefined ? new Int32Array(n) : memory.subarray(0, n)).fill(1);
  for (let i = n - 1; i > 0; i--) count[parent[i]] += count[i];
  return count;
}
