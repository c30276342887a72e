import type { Tree } from "../model/tree.js";

/** Interest of every node, and each node's distance in edges to the nearest focus (for tie-breaks). */
export interface Interest {
  readonly value: Float64Array;
  /** Edges to the nearest focus; 0x7fffffff when there is no focus. */
  readonly distance: Int32Array;
  /** 1 for the root, every focus and every ancestor of a focus: the nodes always shown. */
  readonly forced: Uint8Array;
}

const FAR = 0x7fffffff;

/**
 * Degree of interest after Furnas (1986), DOI(x | y) = API(x) - D(x, y), with D the tree distance in
 * edges. Several foci: each focus's DOI is shifted by -API(y) so every focus and its ancestors score 0,
 * then the maximum is taken: interest(x) = max_y [API(x) - D(x, y) - API(y)].
 *
 * Linear in the tree for any number of foci: with D(x,y) = depth x + depth y - 2 depth lca(x,y),
 * interest(x) = API(x) - depth(x) + max over ancestors a of x of [2 depth(a) + M(a)], where
 * M(a) = max over foci y below a of (-depth(y) - API(y)); the max is reached at a = lca(x, y).
 * Without foci, interest(x) = API(x) - API(root).
 */
export function interest(tree: Tree, api: Float64Array, foci: Int32Array): Interest {
  const n = tree.length;
  const { parent, depth } = tree;
  const value = new Float64Array(n);
  const distance = new Int32Array(n).fill(FAR);
  const forced = new Uint8Array(n);
  forced[0] = 1;
  if (foci.length === 0) {
    for (let i = 0; i < n; i++) value[i] = api[i] - api[0];
    return { value, distance, forced };
  }
  const M = new Float64Array(n).fill(Number.NEGATIVE_INFINITY);
  for (const y of foci) {
    M[y] = -depth[y] - api[y];
    distance[y] = 0;
    forced[y] = 1;
  }
  // Upward pass (reverse pre-order): best focus term below each node, distance down to a focus.
  for (let i = n - 1; i > 0; i--) {
    const p = parent[i];
    if (M[i] > M[p]) M[p] = M[i];
    if (distance[i] !== FAR && distance[i] + 1 < distance[p]) distance[p] = distance[i] + 1;
    if (forced[i]) forced[p] = 1;
  }
  // Downward pass: best ancestor term, distance to a focus through the parent.
  const best = new Float64Array(n);
  best[0] = M[0];
  value[0] = api[0] + best[0];
  for (let i = 1; i < n; i++) {
    const p = parent[i];
    const own = 2 * depth[i] + M[i];
    best[i] = own > best[p] ? own : best[p];
    value[i] = api[i] - depth[i] + best[i];
    if (distance[p] + 1 < distance[i]) distance[i] = distance[p] + 1;
  }
  return { value, distance, forced };
}
