import type { Tree } from "../model/tree.js";
import { NodeTable } from "./node-table.js";
import { FAR, type Scores } from "./scores.js";

/**
 * The same degree of interest as {@link interest} (doi.ts; Furnas 1986 with the per-focus shift),
 * computed only where it is asked. Up front it scores the forced nodes (the foci and their ancestors):
 * O(sum of the foci's depths). Any other node x has no focus below it, so the best ancestor term of
 * doi.ts is its nearest forced ancestor f's, and
 *   interest(x) = API(x) - depth(x) + best(f),   distance(x) = distance(f) + depth(x) - depth(f),
 * the very operations the whole-tree pass does, so both give the same doubles. The fit asks only about
 * children of nodes it shows (best-first from the root and the foci), so a new focus on a million-node
 * tree scores a few thousand nodes and allocates nothing the size of the tree. `api`: API of every node,
 * as an array (`importance`) or worked out when asked (`importanceOf`); both give the same doubles.
 */
export function interestNear(
  tree: Tree,
  api: Float64Array | ((x: number) => number),
  foci: Int32Array,
): Scores {
  const { parent, depth } = tree;
  const apiOf = typeof api === "function" ? api : (x: number) => api[x];
  if (foci.length === 0) {
    const top = apiOf(0);
    return {
      forcedNodes: Int32Array.of(0),
      interestOf: (x) => apiOf(x) - top,
      distanceOf: () => FAR,
      isForced: (x) => x === 0,
    };
  }
  // Upward from each focus, as in doi.ts: the focus term M and the distance down to a focus of every
  // forced node, kept by slot (slot.get(node)); a walk stops where an earlier one left better values.
  const slot = new NodeTable(64);
  let nodes = new Int32Array(64);
  let term = new Float64Array(64);
  let dist = new Int32Array(64);
  let used = 0;
  for (const y of foci) {
    const t = -depth[y] - apiOf(y);
    for (let a = y, d = 0; a !== -1; a = parent[a], d++) {
      let k = slot.get(a);
      if (k === -1) {
        if (used === nodes.length) {
          nodes = grown(nodes, new Int32Array(used * 2));
          term = grown(term, new Float64Array(used * 2));
          dist = grown(dist, new Int32Array(used * 2));
        }
        k = used++;
        slot.set(a, k);
        nodes[k] = a;
        term[k] = Number.NEGATIVE_INFINITY;
        dist[k] = FAR;
      } else if (t <= term[k] && d >= dist[k]) break;
      if (t > term[k]) term[k] = t;
      if (d < dist[k]) dist[k] = d;
    }
  }
  // Downward over the forced nodes in pre-order (parents first): best ancestor term, distance through
  // the parent, and the interest itself.
  const forcedNodes = nodes.slice(0, used).sort();
  const best = new Float64Array(used);
  const value = new Float64Array(used);
  for (const x of forcedNodes) {
    const k = slot.get(x);
    if (x === 0) {
      best[k] = term[k];
      value[k] = apiOf(0) + best[k];
      continue;
    }
    const pk = slot.get(parent[x]);
    best[k] = Math.max(2 * depth[x] + term[k], best[pk]);
    value[k] = apiOf(x) - depth[x] + best[k];
    if (dist[pk] + 1 < dist[k]) dist[k] = dist[pk] + 1;
  }
  // Each other node asked about: the slot of its nearest forced ancestor, found once.
  const near = new NodeTable();
  const anchor = (x: number): number => {
    let k = near.get(x);
    if (k !== -1) return k;
    for (let a = parent[x]; ; a = parent[a]) {
      k = slot.get(a);
      if (k === -1) k = near.get(a);
      if (k !== -1) break;
    }
    near.set(x, k);
    return k;
  };
  return {
    forcedNodes,
    interestOf(x) {
      const k = slot.get(x);
      return k !== -1 ? value[k] : apiOf(x) - depth[x] + best[anchor(x)];
    },
    distanceOf(x) {
      const k = slot.get(x);
      if (k !== -1) return dist[k];
      const f = anchor(x);
      return dist[f] + depth[x] - depth[nodes[f]];
    },
    isForced: (x) => slot.get(x) !== -1,
  };
}

function grown<T extends Int32Array | Float64Array>(from: T, to: T): T {
  to.set(from);
  return to;
}
