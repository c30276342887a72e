import type { Tree } from "../model/tree.js";
import { type ChangeCounts, changeKinds, KIND, noChanges } from "./changes.js";

/** Counts kept per slot: one per kind. */
const K = changeKinds.length;

/**
 * Changes in every subtree of the combined tree, the node itself included. Only nodes on a change path
 * (a changed node or an ancestor of one) have any, so they alone get a slot: a diff of a few changes
 * in a large tree stays small.
 */
export interface ChangeMeasures {
  /** 1 for every changed node and every ancestor of one. */
  readonly onChangePath: Uint8Array;
  /** The nodes on change paths in pre-order: node `onPath[s]` has slot s in `counts` and `net`. */
  readonly onPath: Int32Array;
  /** The slot of each slot's node's parent (-1 for the root's). */
  readonly up: Int32Array;
  /** One count per kind (in the order of `changeKinds`) per slot, at `K * slot`. */
  readonly counts: Int32Array;
  /** Sum of own size changes (new minus old) over the subtree, per slot. */
  readonly net: Float64Array;
}

/**
 * Marks change paths up from each changed node, lists them, then folds every child into its parent.
 * `deltaOf` gives a node's own size change; it is read only for changed nodes (every other node has
 * none). `changed`: the changed nodes, when the caller has them listed (`combineListing`); else they
 * are found by a pass over `kind`. Either way no other pass touches every node.
 */
export function measureChanges(
  tree: Tree,
  kind: Uint8Array,
  deltaOf: (i: number) => number,
  changed: Int32Array = changedNodes(kind),
): ChangeMeasures {
  const { parent } = tree;
  // Each pass is a function of its own with one loop, and no list grows in one: the engine compiles a
  // loop that runs once while it runs, and again when the loop meets code it has not run yet.
  const onChangePath = new Uint8Array(tree.length);
  const onPath = markPaths(changed, parent, tree.depth, onChangePath).sort();
  const up = parentSlots(onPath, parent);
  const { counts, net } = summed(onPath, up, kind, deltaOf, tree.elided);
  return { onChangePath, onPath, up, counts, net };
}

/**
 * Marks the nodes up from each changed node to the first node already marked (each node on a path
 * once) and lists them. The list is made as long as the paths could be at most (no longer than the
 * tree), so that it never grows in the loop, and copied to its length at the end: a list as long as
 * the tree would cost nothing where it is not written, yet counts as memory taken, which brings the
 * next full garbage collection nearer.
 */
function markPaths(
  changed: Int32Array,
  parent: Int32Array,
  depth: Int32Array,
  onChangePath: Uint8Array,
): Int32Array {
  let most = 0;
  for (let c = 0; c < changed.length && most < onChangePath.length; c++) most += depth[changed[c]] + 1;
  const onPath = new Int32Array(Math.min(most, onChangePath.length));
  let m = 0;
  for (let c = 0; c < changed.length; c++) {
    for (let a = changed[c]; a >= 0 && onChangePath[a] === 0; a = parent[a]) {
      onChangePath[a] = 1;
      onPath[m++] = a;
    }
  }
  return onPath.slice(0, m);
}

/**
 * Each slot's counts per kind and net size change, its children's folded in (reverse pre-order). An
 * added or removed node counts the nodes it stands for (1 and its `elided` ones: a saved summary's
 * fold entry), as the lines' node counts do.
 */
function summed(
  onPath: Int32Array,
  up: Int32Array,
  kind: Uint8Array,
  deltaOf: (i: number) => number,
  elided: Float64Array | undefined,
): { counts: Int32Array; net: Float64Array } {
  const m = onPath.length;
  const counts = new Int32Array(m * K);
  const net = new Float64Array(m);
  // In reverse pre-order every child comes before its parent.
  for (let s = m - 1; s >= 0; s--) {
    const i = onPath[s];
    if (kind[i] !== 0) {
      counts[s * K + kind[i] - 1] += elided !== undefined && kind[i] <= KIND.removed ? 1 + elided[i] : 1;
      net[s] += deltaOf(i);
    }
    if (i === 0) continue;
    const t = up[s];
    net[t] += net[s];
    for (let k = 0; k < K; k++) counts[t * K + k] += counts[s * K + k];
  }
  return { counts, net };
}

/** The nodes with a kind, in ascending order. */
function changedNodes(kind: Uint8Array): Int32Array {
  let m = 0;
  for (let i = 0; i < kind.length; i++) if (kind[i] !== 0) m++;
  const out = new Int32Array(m);
  for (let i = 0, s = 0; s < m; i++) if (kind[i] !== 0) out[s++] = i;
  return out;
}

/**
 * For nodes in pre-order that hold the parent of each (but the root) among them: the position of each
 * one's parent in the list (-1 for the root). A node's parent is on the path of listed nodes from the
 * root down to the node before it (kept as a stack), so no position is searched for.
 */
export function parentSlots(nodes: Int32Array, parent: Int32Array): Int32Array {
  const m = nodes.length;
  const up = new Int32Array(m);
  const path = new Int32Array(m);
  let top = -1;
  for (let s = 0; s < m; s++) {
    const i = nodes[s];
    if (i === 0) {
      top = -1;
      up[s] = -1;
    } else {
      while (top >= 0 && nodes[path[top]] !== parent[i]) top--;
      up[s] = path[top];
    }
    path[++top] = s;
  }
  return up;
}

/** The slot of node i among the first `below` entries of `onPath` (sorted), or -1. */
function slotIn(onPath: Int32Array, i: number, below: number): number {
  let lo = 0;
  let hi = below - 1;
  while (lo <= hi) {
    const mid = (lo + hi) >>> 1;
    const v = onPath[mid];
    if (v === i) return mid;
    if (v < i) lo = mid + 1;
    else hi = mid - 1;
  }
  return -1;
}

/** Node i's slot in `counts` and `net`, or -1 off change paths. */
export function slotOf(cm: ChangeMeasures, i: number): number {
  return cm.onChangePath[i] ? slotIn(cm.onPath, i, cm.onPath.length) : -1;
}

/** The changes in node i's subtree, per kind. */
export function changesIn(cm: ChangeMeasures, i: number): ChangeCounts {
  const out = noChanges();
  const s = slotOf(cm, i);
  if (s < 0) return out;
  const b = s * K;
  changeKinds.forEach((kind, k) => {
    out[kind] = cm.counts[b + k];
  });
  return out;
}

/** Number of changed nodes in node i's subtree. */
export function changeTotalIn(cm: ChangeMeasures, i: number): number {
  const s = slotOf(cm, i);
  if (s < 0) return 0;
  let total = 0;
  for (let k = 0; k < K; k++) total += cm.counts[s * K + k];
  return total;
}

/** Net size change over node i's subtree. */
export function netIn(cm: ChangeMeasures, i: number): number {
  const s = slotOf(cm, i);
  return s < 0 ? 0 : cm.net[s];
}
