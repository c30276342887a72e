import type { Tree } from "./tree.js";

/** A graph's references grouped by the node they stand for. */
export interface ReferenceIndex {
  /** References to slot t are `refs[start[t] .. start[t + 1])`, in pre-order. */
  readonly start: Int32Array;
  readonly refs: Int32Array;
}

/** The references of a graph's tree grouped by the full entry they stand for; null on a tree. */
export function referenceIndex(tree: Tree): ReferenceIndex | null {
  const to = tree.referenceTo;
  if (to === undefined) return null;
  const n = tree.length;
  const start = new Int32Array(n + 1);
  for (let s = 0; s < n; s++) if (to[s] !== -1) start[to[s] + 1]++;
  for (let t = 0; t < n; t++) start[t + 1] += start[t];
  const refs = new Int32Array(start[n]);
  const fill = start.slice(0, n);
  for (let s = 0; s < n; s++) if (to[s] !== -1) refs[fill[to[s]]++] = s;
  return { start, refs };
}
