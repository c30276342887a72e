import type { Tree } from "./tree.js";

/** Subtree aggregates of every node, including the node itself. */
export interface Measures {
  /** Slots in the subtree (>= 1). In pre-order the subtree of i is [i, i + count[i]). */
  readonly count: Int32Array;
  /**
   * Distinct nodes in the subtree: slots that are full entries, references left out (0 for a reference).
   * The same array as `count` on a tree.
   */
  readonly nodes: Int32Array;
  /** Sum of own sizes over the subtree. */
  readonly size: Float64Array;
  /** Leaves in the subtree. */
  readonly leaves: Int32Array;
  /** Edges on the longest downward path (a leaf has height 0). */
  readonly height: Int32Array;
  /** Children of the node (not all descendants). */
  readonly children: Int32Array;
}

/** One reverse pass over the pre-order arrays: every child is folded into its parent. */
export function measure(tree: Tree): Measures {
  const n = tree.length;
  const { parent, ownSize } = tree;
  const count = new Int32Array(n).fill(1);
  const size = new Float64Array(ownSize);
  const leaves = new Int32Array(n);
  const height = new Int32Array(n);
  const children = new Int32Array(n);
  for (let i = n - 1; i >= 0; i--) {
    if (count[i] === 1) leaves[i] = 1;
    const p = parent[i];
    if (p < 0) continue;
    count[p] += count[i];
    children[p]++;
    size[p] += size[i];
    leaves[p] += leaves[i];
    if (height[i] + 1 > height[p]) height[p] = height[i] + 1;
  }
  return { count, nodes: distinctNodes(tree, count), size, leaves, height, children };
}

/** Full entries per subtree: a reference slot counts 0, every other slot 1. */
function distinctNodes(tree: Tree, count: Int32Array): Int32Array {
  const ref = tree.referenceTo;
  if (ref === undefined) return count;
  const n = tree.length;
  const nodes = new Int32Array(n);
  for (let i = n - 1; i >= 0; i--) {
    if (ref[i] === -1) nodes[i]++;
    const p = tree.parent[i];
    if (p >= 0) nodes[p] += nodes[i];
  }
  return nodes;
}

/** Children of `i` in input order, using the pre-order layout. */
export function* childrenOf(count: Int32Array, i: number): Generator<number> {
  const end = i + count[i];
  for (let c = i + 1; c < end; c += count[c]) yield c;
}
