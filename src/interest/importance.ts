import type { Measures } from "../model/measure.js";
import type { Tree } from "../model/tree.js";

/** Choices of a-priori importance (API). Each drops by at least 1 per level, as {@link interest} needs. */
export const importances = ["depth", "size"] as const;
export type Importance = (typeof importances)[number];

/**
 * A-priori importance of every node (Furnas 1986, "Generalized fisheye views", the API term).
 * - depth: API(x) = -depth(x), Furnas's choice for trees.
 * - size:  API(x) = -depth(x) + log2((size(x) + 1) / (size(root) + 1)): a node holding a small share of
 *   the total drops further. Subtree sizes never grow from parent to child (sizes are >= 0), so API
 *   still drops by at least 1 per level.
 * `lent`: memory whose contents nobody reads any more, used (its first `tree.length` numbers, each
 * written here) instead of a new array when it is that long (new memory is dear on a big tree).
 */
export function importance(
  tree: Tree,
  measures: Measures,
  kind: Importance,
  lent?: Float64Array,
): Float64Array {
  const n = tree.length;
  const api = lent !== undefined && lent.length >= n ? lent.subarray(0, n) : new Float64Array(n);
  const { depth } = tree;
  if (kind === "depth") {
    for (let i = 0; i < n; i++) api[i] = 0 - depth[i];
    return api;
  }
  const { size } = measures;
  const rootLog = Math.log2(Math.max(0, size[0]) + 1);
  for (let i = 0; i < n; i++) api[i] = -depth[i] + Math.log2(Math.max(0, size[i]) + 1) - rootLog;
  return api;
}

/**
 * API(x) of the importance by depth, worked out when asked rather than kept for every node: the same
 * value as {@link importance}'s array holds. A graph's interest reads it for the few slots its fit
 * looks at (interest/graph-doi.ts), where an array would be one number per slot, a reference included.
 */
export function depthImportance(tree: Tree): (x: number) => number {
  const { depth } = tree;
  return (x) => 0 - depth[x];
}

/**
 * API(x) of either importance, worked out when asked: the same value (the same double) as
 * {@link importance}'s array holds, by the same expression. A diff's interest reads it only for the nodes
 * near its changes and the ones its fit looks at, where the array would be a number for every node of
 * the combined tree, memory touched for the first time (dear on a big tree: docs/performance.md).
 */
export function importanceOf(tree: Tree, measures: Measures, kind: Importance): (x: number) => number {
  if (kind === "depth") return depthImportance(tree);
  const { depth } = tree;
  const { size } = measures;
  const rootLog = Math.log2(Math.max(0, size[0]) + 1);
  return (x) => -depth[x] + Math.log2(Math.max(0, size[x]) + 1) - rootLog;
}
