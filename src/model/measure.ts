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

/**
 * Memory a caller lends {@link measure} for its arrays instead of new memory (dear on a big tree: see
 * docs/performance.md): arrays whose contents nobody reads any more, each used from its start when it
 * holds at least the tree's length (else a new array is made), and written in full before it is read.
 */
export interface MeasureMemory {
  count?: Int32Array;
  size?: Float64Array;
  children?: Int32Array;
  /** For {@link Measures.nodes} when it is an array of its own (a graph's). */
  nodes?: Int32Array;
}

/** Memory lent by a tree's builder for its first measures (see {@link lendToMeasure}). */
const lentByBuilder = new WeakMap<Tree, MeasureMemory>();

/**
 * Lends `memory` (see {@link MeasureMemory}; no other array of `tree` may share it) to the first
 * {@link measure} of `tree` that is given no memory of its own: a builder's working arrays, read no more
 * once the tree is made, spare the measures that much fresh memory. Given once.
 */
export function lendToMeasure(tree: Tree, memory: MeasureMemory): void {
  lentByBuilder.set(tree, memory);
}

/**
 * One reverse pass over the pre-order arrays: every child is folded into its parent. `leaves` and
 * `height`, which no summary or diff reads, are made by a pass of their own when first read. `given`:
 * see {@link MeasureMemory}; without it, what the tree's builder lent, if anything
 * ({@link lendToMeasure}).
 */
export function measure(tree: Tree, given?: MeasureMemory): Measures {
  let lent = given;
  if (lent === undefined) {
    lent = lentByBuilder.get(tree) ?? {};
    lentByBuilder.delete(tree);
  }
  const n = tree.length;
  const { parent, ownSize } = tree;
  const count = fitted(lent.count, n, Int32Array, 1);
  // Without a size anywhere every subtree's is 0: the array is left as it was made (or cleared).
  const sizes = !zeroSizes.has(tree);
  const size = fitted(lent.size, n, Float64Array, 0);
  if (sizes) size.set(ownSize.subarray(0, n));
  const children = fitted(lent.children, n, Int32Array, 0);
  const ref = tree.referenceTo;
  // Nodes per subtree where they differ from the slots: each slot that is a node's full entry counts 1
  // (a graph's reference 0), and a node's elided descendants count too (see subtreeNodes).
  const nodes = ref !== undefined && tree.elided === undefined ? fitted(lent.nodes, n, Int32Array, 0) : null;
  for (let i = n - 1; i > 0; i--) {
    const p = parent[i];
    if (nodes !== null) {
      if (ref![i] === -1) nodes[i]++;
      if (p >= 0) nodes[p] += nodes[i];
    }
    if (p < 0) continue;
    count[p] += count[i];
    children[p]++;
    if (sizes) size[p] += size[i];
  }
  if (nodes !== null && n > 0 && ref![0] === -1) nodes[0]++;
  let leaves: Int32Array | undefined;
  let height: Int32Array | undefined;
  return {
    count,
    nodes: nodes ?? subtreeNodes(tree, count),
    size,
    get leaves() {
      leaves ??= leavesOf(parent, count);
      return leaves;
    },
    get height() {
      height ??= heightOf(parent);
      return height;
    },
    children,
  };
}

/**
 * `n` numbers, each `value`: the first `n` of `lent`, overwritten, when it has that many; else a new
 * array (new memory is zeros already: filled only for another value, so pages no one writes stay
 * untouched).
 */
function fitted<A extends Int32Array | Float64Array>(
  lent: A | undefined,
  n: number,
  make: new (n: number) => A,
  value: number,
): A {
  if (lent !== undefined && lent.length >= n) return lent.subarray(0, n).fill(value) as A;
  const made = new make(n);
  return value === 0 ? made : (made.fill(value) as A);
}

/** Trees whose own sizes are all 0, as their builder knows (see {@link rememberZeroSizes}). */
const zeroSizes = new WeakSet<Tree>();

/**
 * Notes that every own size of `tree` is 0 (a graph whose input has no sizes: model/build-graph.ts),
 * so {@link measure} neither copies them nor adds them up: on a graph of millions of slots, that is
 * two arrays' worth of memory touched for nothing.
 */
export function rememberZeroSizes(tree: Tree): void {
  zeroSizes.add(tree);
}

/** Leaves in every subtree (a reverse pass, as above). */
function leavesOf(parent: Int32Array, count: Int32Array): Int32Array {
  const leaves = new Int32Array(count.length);
  for (let i = count.length - 1; i >= 0; i--) {
    if (count[i] === 1) leaves[i] = 1;
    if (parent[i] >= 0) leaves[parent[i]] += leaves[i];
  }
  return leaves;
}

/** Edges on the longest downward path of every node (a reverse pass, as above). */
function heightOf(parent: Int32Array): Int32Array {
  const height = new Int32Array(parent.length);
  for (let i = parent.length - 1; i > 0; i--) {
    const p = parent[i];
    if (p >= 0 && height[i] + 1 > height[p]) height[p] = height[i] + 1;
  }
  return height;
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
