import type { Tree } from "../model/tree.js";
import { FAR, type Scores } from "./scores.js";

/**
 * Interest of every node, and each node's distance in edges to the nearest focus (for tie-breaks), as
 * whole-tree arrays; the {@link Scores} readers read them.
 */
export interface Interest extends Scores {
  readonly value: Float64Array;
  /** Edges to the nearest focus; 0x7fffffff when there is no focus. */
  readonly distance: Int32Array;
  /** 1 for the root, every focus and every ancestor of a focus: the nodes always shown. */
  readonly forced: Uint8Array;
}

/** Whole-tree arrays with the {@link Scores} readers over them. */
export function fromArrays(
  value: Float64Array,
  distance: Int32Array,
  forced: Uint8Array,
  forcedNodes: Int32Array,
): Interest {
  return {
    value,
    distance,
    forced,
    forcedNodes,
    interestOf: (x) => value[x],
    distanceOf: (x) => distance[x],
    isForced: (x) => forced[x] === 1,
  };
}

/**
 * Degree of interest after Furnas (1986), DOI(x | y) = API(x) - D(x, y), with D the tree distance in
 * edges. Several foci: each focus's DOI is shifted by -API(y) so every focus and its ancestors score 0,
 * then the maximum is taken: interest(x) = max_y [API(x) - D(x, y) - API(y)].
 *
 * Linear in the tree for any number of foci: with D(x,y) = depth x + depth y - 2 depth lca(x,y),
 * interest(x) = API(x) - depth(x) + max over ancestors a of x of [2 depth(a) + M(a)], where
 * M(a) = max over foci y below a of (-depth(y) - API(y)); the max is reached at a = lca(x, y).
 * Without foci, interest(x) = API(x) - API(root).
 * Every node is scored; a summary scores only what its fit looks at (see interestNear in near.ts).
 */
export function interest(tree: Tree, api: Float64Array, foci: Int32Array, scratch?: Float64Array): Interest {
  const n = tree.length;
  const { parent, depth } = tree;
  const value = new Float64Array(n);
  const distance = new Int32Array(n).fill(FAR);
  const forced = new Uint8Array(n);
  forced[0] = 1;
  if (foci.length === 0) {
    for (let i = 0; i < n; i++) value[i] = api[i] - api[0];
    return fromArrays(value, distance, forced, Int32Array.of(0));
  }
  // `scratch` (n long, any content) saves allocating M on every call; it is overwritten.
  const M =
    scratch && scratch.length >= n
      ? scratch.fill(Number.NEGATIVE_INFINITY, 0, n)
      : new Float64Array(n).fill(Number.NEGATIVE_INFINITY);
  // Upward: only the foci and their ancestors get a focus term M or a distance down to a focus, so each
  // focus's path to the root is walked, not the whole tree (the same values as a reverse pre-order pass).
  // A walk stops at an ancestor an earlier walk left with a term and a distance at least as good: from
  // there up, that walk already wrote values this one cannot improve.
  const forcedNodes: number[] = [0];
  for (const y of foci) {
    const term = -depth[y] - api[y];
    for (let a = y, d = 0; a !== -1; a = parent[a], d++) {
      if (term <= M[a] && d >= distance[a]) break;
      if (term > M[a]) M[a] = term;
      if (d < distance[a]) distance[a] = d;
      if (forced[a] === 0) forcedNodes.push(a);
      forced[a] = 1;
    }
  }
  // Downward pass: best ancestor term, distance to a focus through the parent. The best term replaces M
  // in place: M[i] is read once, before its own best is written, and parents come before children.
  const best = M;
  value[0] = api[0] + best[0];
  for (let i = 1; i < n; i++) {
    const p = parent[i];
    const own = 2 * depth[i] + M[i];
    best[i] = Math.max(own, best[p]);
    value[i] = api[i] - depth[i] + best[i];
    if (distance[p] + 1 < distance[i]) distance[i] = distance[p] + 1;
  }
  return fromArrays(value, distance, forced, Int32Array.from(forcedNodes).sort());
}
