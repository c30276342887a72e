import type { Tree } from "./tree.js";

/** Subtree aggregates of every node, including the node itself. */
export interface Measures {
  /** Slots in the subtree (>= 1): in pre-order the subtree of i is [i, i + count[i]). */
  readonly count: Int32Array;
  /**
   * Nodes in the subtree as the input has them, each counted once: the full entries among its slots (a
   * graph's reference slot counts 0) plus the elided descendants (Tree.elided). The very array `count`
   * on a tree with nothing elided. What a reader is shown, and what orders nodes.
   */
  readonly nodes: Int32Array | Float64Array;
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
  return { count, nodes: subtreeNodes(tree, count), size, leaves, height, children };
}

/**
 * Nodes per subtree as the input has them (a reverse pass, as above): each slot that is a node's full
 * entry counts 1 (a graph's reference 0), and a node's elided descendants count too.
 */
function subtreeNodes(tree: Tree, count: Int32Array): Int32Array | Float64Array {
  const { elided, referenceTo: ref, parent } = tree;
  if (elided === undefined && ref === undefined) return count;
  const n = tree.length;
  const nodes = elided === undefined ? new Int32Array(n) : new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    nodes[i] += (ref === undefined || ref[i] === -1 ? 1 : 0) + (elided === undefined ? 0 : elided[i]);
    if (parent[i] >= 0) nodes[parent[i]] += nodes[i];
  }
  return nodes;
}

/** Children of `i` in input order, using the pre-order layout. */
export function* childrenOf(count: Int32Array, i: number): Generator<number> {
  const end = i + count[i];
  for (let c = i + 1; c < end; c += count[c]) yield c;
}
