import type { Tree } from "../model/tree.js";
import { type ChangeCounts, changeKinds, noChanges } from "./changes.js";

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
  /** Each node's slot in `counts` and `net`, or -1 off change paths. */
  readonly slot: Int32Array;
  /** One count per kind (in the order of `changeKinds`) per slot, at `K * slot`. */
  readonly counts: Int32Array;
  /** Sum of own size changes (new minus old) over the subtree, per slot. */
  readonly net: Float64Array;
}

/** Three linear passes: mark change paths, number them, then fold every child into its parent. */
export function measureChanges(tree: Tree, kind: Uint8Array, delta: Float64Array): ChangeMeasures {
  const n = tree.length;
  const { parent } = tree;
  const onChangePath = new Uint8Array(n);
  for (let i = n - 1; i >= 0; i--) {
    if (kind[i] !== 0) onChangePath[i] = 1;
    if (onChangePath[i] && i > 0) onChangePath[parent[i]] = 1;
  }
  const slot = new Int32Array(n).fill(-1);
  let m = 0;
  for (let i = 0; i < n; i++) if (onChangePath[i]) slot[i] = m++;
  const counts = new Int32Array(m * K);
  const net = new Float64Array(m);
  for (let i = n - 1; i >= 0; i--) {
    const s = slot[i];
    if (s < 0) continue;
    if (kind[i] !== 0) counts[s * K + kind[i] - 1]++;
    net[s] += delta[i];
    if (i === 0) continue;
    const t = slot[parent[i]];
    net[t] += net[s];
    for (let k = 0; k < K; k++) counts[t * K + k] += counts[s * K + k];
  }
  return { onChangePath, slot, counts, net };
}

/** The changes in node i's subtree, per kind. */
export function changesIn(cm: ChangeMeasures, i: number): ChangeCounts {
  const out = noChanges();
  const s = cm.slot[i];
  if (s < 0) return out;
  const b = s * K;
  changeKinds.forEach((kind, k) => {
    out[kind] = cm.counts[b + k];
  });
  return out;
}

/** Number of changed nodes in node i's subtree. */
export function changeTotalIn(cm: ChangeMeasures, i: number): number {
  const s = cm.slot[i];
  if (s < 0) return 0;
  let total = 0;
  for (let k = 0; k < K; k++) total += cm.counts[s * K + k];
  return total;
}

/** Net size change over node i's subtree. */
export function netIn(cm: ChangeMeasures, i: number): number {
  const s = cm.slot[i];
  return s < 0 ? 0 : cm.net[s];
}
