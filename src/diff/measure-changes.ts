import type { Tree } from "../model/tree.js";

/** Changes in every subtree of the combined tree, the node itself included. */
export interface ChangeMeasures {
  /** Five counts per node (added, removed, moved, renamed, resized) at `5 * node`; see `countsAt`. */
  readonly counts: Int32Array;
  /** Sum of own size changes over the subtree (new minus old). */
  readonly net: Float64Array;
}

/** One reverse pass over the pre-order arrays, like `measure`: every child is folded into its parent. */
export function measureChanges(tree: Tree, kind: Uint8Array, delta: Float64Array): ChangeMeasures {
  const n = tree.length;
  const counts = new Int32Array(n * 5);
  const net = new Float64Array(delta);
  const { parent } = tree;
  const any = new Uint8Array(n); // a change somewhere in the subtree
  for (let i = n - 1; i >= 0; i--) {
    if (kind[i] !== 0) {
      counts[i * 5 + kind[i] - 1]++;
      any[i] = 1;
    }
    const p = parent[i];
    if (p < 0) continue;
    if (net[i] !== 0) net[p] += net[i];
    if (!any[i]) continue;
    any[p] = 1;
    const a = i * 5;
    const b = p * 5;
    for (let k = 0; k < 5; k++) counts[b + k] += counts[a + k];
  }
  return { counts, net };
}
