import type { Tree } from "./tree.js";

/**
 * The graph a tree with references stands for, node by node, for searches over it (graph interest):
 * each node has a number (any numbering: a graph built from edges keeps its own, see
 * model/build-graph.ts; otherwise the pre-order of the full entries), and its neighbours (the edges
 * taken both ways: its parent, the nodes of its child slots, the parents of the references to it) are
 * one run of a flat array, in any order, possibly with repeats. A search then reads one run per node and one array the size of the nodes,
 * instead of walking child slots and references scattered over the tree's slots, which are several
 * times as many as the nodes in a graph with many shared nodes.
 */
export interface GraphNeighbours {
  /** Nodes (full entries, the root espalier adds included). */
  readonly nodes: number;
  /** Node number of each slot: its own for a full entry, its entry's for a reference. */
  readonly nodeOf: Int32Array;
  /** The neighbours of node k are `adjacent[start[k] .. start[k + 1])`, by node number. */
  readonly start: Int32Array;
  readonly adjacent: Int32Array;
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
  const start = new Int32Array(nodes + 1);
  for (let s = 0; s < n; s++) {
    const p = parent[s];
    if (p < 0) continue;
    start[nodeOf[p] + 1]++;
    start[nodeOf[s] + 1]++;
  }
  for (let k = 0; k < nodes; k++) start[k + 1] += start[k];
  const adjacent = new Int32Array(start[nodes]);
  const fill = start.slice(0, nodes);
  for (let s = 0; s < n; s++) {
    const p = parent[s];
    if (p < 0) continue;
    const a = nodeOf[p];
    const b = nodeOf[s];
    adjacent[fill[a]++] = b;
    adjacent[fill[b]++] = a;
  }
  return { nodes, nodeOf, start, adjacent };
}
