import type { Tree } from "./tree.js";

/**
 * The graph a tree with references stands for, node by node, for searches over it (graph interest):
 * each node has a number (any numbering: a graph built from edges keeps its own, see
 * model/build-graph.ts; otherwise the pre-order of the full entries), and its neighbours (the edges
 * taken both ways) are two runs of flat arrays: the nodes it is a parent of (`down`), then the nodes
 * that are its parents (`up`), in any order, possibly with repeats. A search then reads two runs per
 * node and one array the size of the nodes, instead of walking child slots and references scattered
 * over the tree's slots, which are several times as many as the nodes in a graph with many shared
 * nodes. Two runs rather than one merged: a graph built from edges has its `down` runs already (its
 * edges sorted by parent), so only the `up` runs are made.
 */
export interface GraphNeighbours {
  /** Nodes (full entries, the root espalier adds included). */
  readonly nodes: number;
  /** Node number of each slot: its own for a full entry, its entry's for a reference. */
  readonly nodeOf: Int32Array;
  /** The nodes node k is a parent of: `down[downStart[k] .. downStart[k + 1])`, by node number. */
  readonly downStart: Int32Array;
  readonly down: Int32Array;
  /** The parents of node k: `up[upStart[k] .. upStart[k + 1])`, by node number. */
  readonly upStart: Int32Array;
  readonly up: Int32Array;
}

/** Tables made with the tree they belong to (model/build-graph.ts), by tree. */
const known = new WeakMap<Tree, GraphNeighbours>();

/**
 * Keeps `table` as the neighbour table of `tree`, which was made from the same edges (a tree is not
 * changed once made; a tree derived from it is another object, whose table is made from its slots).
 */
export function rememberNeighbours(tree: Tree, table: GraphNeighbours): void {
  known.set(tree, table);
}

/** The neighbours of every node of `tree`, a tree with references (see {@link GraphNeighbours}). */
export function graphNeighbours(tree: Tree): GraphNeighbours {
  const table = known.get(tree);
  if (table !== undefined) return table;
  return neighboursFromSlots(tree);
}

/**
 * The `up` runs of the graph whose `down` runs are given: node v's parents are the nodes u whose run
 * holds v, in increasing order of u (a repeated edge repeats its parent). `upStart`, when given, holds
 * the places already (how many runs hold each node, summed): it is counted otherwise. `numbers` gives
 * the arrays of `up` and of the places being filled (new arrays, or memory read no more whatever it
 * holds: every number is written before it is read).
 */
export function upRuns(
  nodes: number,
  downStart: Int32Array,
  down: Int32Array,
  upStart?: Int32Array,
  numbers: (length: number) => Int32Array = (length) => new Int32Array(length),
): { upStart: Int32Array; up: Int32Array } {
  const edges = downStart[nodes];
  if (upStart === undefined) {
    upStart = new Int32Array(nodes + 1);
    for (let j = 0; j < edges; j++) upStart[down[j] + 1]++;
    for (let k = 0; k < nodes; k++) upStart[k + 1] += upStart[k];
  }
  // Every place of `up` is written once below; `fill` is written whole first.
  const up = numbers(edges);
  const fill = numbers(nodes);
  fill.set(upStart.subarray(0, nodes));
  for (let u = 0; u < nodes; u++)
    for (let j = downStart[u], end = downStart[u + 1]; j < end; j++) up[fill[down[j]]++] = u;
  return { upStart, up };
}

/** The table made from the tree's slots: nodes numbered in pre-order of their full entries. */
export function neighboursFromSlots(tree: Tree): GraphNeighbours {
  const n = tree.length;
  const { parent } = tree;
  const to = tree.referenceTo;
  const nodeOf = new Int32Array(n);
  let nodes = 0;
  for (let s = 0; s < n; s++) if (to === undefined || to[s] === -1) nodeOf[s] = nodes++;
  if (to !== undefined) for (let s = 0; s < n; s++) if (to[s] !== -1) nodeOf[s] = nodeOf[to[s]];
  // Every slot but the root is one edge: from its parent's node to its own node. Counted, then placed.
  const downStart = new Int32Array(nodes + 1);
  for (let s = 0; s < n; s++) {
    const p = parent[s];
    if (p >= 0) downStart[nodeOf[p] + 1]++;
  }
  for (let k = 0; k < nodes; k++) downStart[k + 1] += downStart[k];
  const down = new Int32Array(downStart[nodes]);
  const fill = downStart.slice(0, nodes);
  for (let s = 0; s < n; s++) {
    const p = parent[s];
    if (p >= 0) down[fill[nodeOf[p]]++] = nodeOf[s];
  }
  return { nodes, nodeOf, downStart, down, ...upRuns(nodes, downStart, down) };
}
