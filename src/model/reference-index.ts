import type { Measures } from "./measure.js";
import type { Tree } from "./tree.js";

/** A graph's references by the node they stand for, and the graph's edges as lists of neighbours. */
export interface ReferenceIndex {
  /** References to slot t are `refs[start[t] .. start[t + 1])`, in pre-order. */
  readonly start: Int32Array;
  readonly refs: Int32Array;
  /**
   * Neighbours of the full entry x in the graph, every edge taken both ways:
   * `neighbours[around[x] .. around[x + 1])` (its parent, its entries' and references' nodes, and the
   * parents of the references to it). Empty for a reference slot.
   */
  readonly around: Int32Array;
  readonly neighbours: Int32Array;
}

/** The references of a graph's tree grouped by the full entry they stand for; null on a tree. */
export function referenceIndex(tree: Tree, measures: Measures): ReferenceIndex | null {
  const to = tree.referenceTo;
  if (to === undefined) return null;
  const n = tree.length;
  const { parent } = tree;
  const start = new Int32Array(n + 1);
  for (let s = 0; s < n; s++) if (to[s] !== -1) start[to[s] + 1]++;
  for (let t = 0; t < n; t++) start[t + 1] += start[t];
  const refs = new Int32Array(start[n]);
  const fill = start.slice(0, n);
  for (let s = 0; s < n; s++) if (to[s] !== -1) refs[fill[to[s]]++] = s;

  // Degree of each full entry: its parent, each child slot, each reference to it.
  const around = new Int32Array(n + 1);
  for (let s = 1; s < n; s++) {
    const p = parent[s];
    around[p + 1]++; // p's child slot s (an entry, or the node a reference stands for)
    if (to[s] === -1)
      around[s + 1]++; // s's parent
    else around[to[s] + 1]++; // the node of reference s: the reference's parent
  }
  for (let x = 0; x < n; x++) around[x + 1] += around[x];
  const neighbours = new Int32Array(around[n]);
  const at = around.slice(0, n);
  const { count } = measures;
  for (let x = 0; x < n; x++) {
    if (to[x] !== -1) continue;
    if (parent[x] >= 0) neighbours[at[x]++] = parent[x];
    for (let c = x + 1, end = x + count[x]; c < end; c += count[c])
      neighbours[at[x]++] = to[c] === -1 ? c : to[c];
    for (let k = start[x]; k < start[x + 1]; k++) neighbours[at[x]++] = parent[refs[k]];
  }
  return { start, refs, around, neighbours };
}
