import { interestNear } from "../interest/near.js";
import { NodeTable } from "../interest/node-table.js";
import { FAR, type Scores } from "../interest/scores.js";
import type { Tree } from "../model/tree.js";
import { type ChangeMeasures, parentSlots } from "./measure-changes.js";

/** Interest for a diff: changed nodes score as foci do, but only the user's foci are forced. */
export interface DiffInterest extends Scores {
  /** 1 for every changed node and every ancestor of one. */
  readonly onChangePath: Uint8Array;
}

/**
 * Furnas degree of interest (see `interest`) with every changed node added to the user's foci as a
 * soft focus: same formula, so a change and its ancestors score as a focus path does. Only the root
 * and the user's focus paths are forced, so a diff with more changes than the budget still fits.
 * `api`: API(x), worked out when asked (`importanceOf`).
 *
 * Scored as `interestNear` scores (near.ts, docs/interest.md), with the same operations on the same
 * values, so the same doubles: the nodes on the way to a focus (the change paths `measureChanges`
 * listed in pre-order, and the user's focus paths) up front, by one pass up the list (each node's
 * focus term M, the best over the foci below it, and its distance down to the nearest) and one down
 * (the best ancestor term, the distance through the parent, the interest); any other node x from its
 * nearest listed ancestor f: interest(x) = API(x) − depth(x) + best(f). The list and each one's parent
 * position are the change measures' own, so nothing is hashed per change and no node outside the list
 * is read but those the fit asks about.
 */
export function diffInterest(
  tree: Tree,
  api: (x: number) => number,
  foci: Int32Array,
  kind: Uint8Array,
  changes: ChangeMeasures,
): DiffInterest {
  const { parent, depth } = tree;
  // The summary's forced set for the user's foci alone: the root and every focus path.
  const forced = new Set<number>([0]);
  for (const f of foci) for (let a = f; a > 0 && !forced.has(a); a = parent[a]) forced.add(a);
  const forcedNodes = Int32Array.from(forced).sort();
  const { onChangePath } = changes;
  const user = new Set<number>(foci);
  // Off the change paths, the user's focus paths (their nodes in `forced`, the root aside).
  const offPath = [...forced].filter((x) => onChangePath[x] === 0);
  if (changes.onPath.length === 0 && foci.length === 0) {
    const none = interestNear(tree, api, foci);
    return { ...none, isForced: (x) => forced.has(x), forcedNodes, onChangePath };
  }
  const listed = offPath.length === 0;
  const nodes = listed ? changes.onPath : merged(changes.onPath, offPath);
  const up = listed ? changes.up : parentSlots(nodes, parent);
  const inList = listed
    ? (x: number) => onChangePath[x] === 1
    : (x: number) => onChangePath[x] === 1 || forced.has(x);
  const m = nodes.length;
  // Each pass over the list is a function of its own: the engine compiles a loop that runs once while
  // it runs, and again for the code after it in the same function.
  const { term, dist } = termsUp(nodes, up, depth, api, (y) => kind[y] !== 0 || user.has(y));
  const { best, value } = bestDown(nodes, up, depth, api, term, dist);
  const slotOf = (x: number): number => {
    let lo = 0;
    let hi = m - 1;
    while (lo <= hi) {
      const mid = (lo + hi) >>> 1;
      const v = nodes[mid];
      if (v === x) return mid;
      if (v < x) lo = mid + 1;
      else hi = mid - 1;
    }
    return -1;
  };
  // Each other node asked about: the slot of its nearest listed ancestor, found once.
  const near = new NodeTable();
  const anchor = (x: number): number => {
    let k = near.get(x);
    if (k !== -1) return k;
    let a = parent[x];
    while (!inList(a)) a = parent[a];
    k = slotOf(a);
    near.set(x, k);
    return k;
  };
  return {
    interestOf(x) {
      return inList(x) ? value[slotOf(x)] : api(x) - depth[x] + best[anchor(x)];
    },
    distanceOf(x) {
      if (inList(x)) return dist[slotOf(x)];
      const f = anchor(x);
      return dist[f] + depth[x] - depth[nodes[f]];
    },
    isForced: (x) => forced.has(x),
    forcedNodes,
    onChangePath,
  };
}

/**
 * Up the list (children before parents): M(a) = max over foci y below a of [−depth(y) − API(y)], and
 * the distance down to the nearest of them.
 */
function termsUp(
  nodes: Int32Array,
  up: Int32Array,
  depth: Int32Array,
  api: (x: number) => number,
  isFocus: (y: number) => boolean,
): { term: Float64Array; dist: Int32Array } {
  const m = nodes.length;
  const term = new Float64Array(m).fill(Number.NEGATIVE_INFINITY);
  const dist = new Int32Array(m).fill(FAR);
  for (let s = m - 1; s >= 0; s--) {
    const y = nodes[s];
    if (isFocus(y)) {
      const t = -depth[y] - api(y);
      if (t > term[s]) term[s] = t;
      dist[s] = 0;
    }
    const u = up[s];
    if (y === 0) continue;
    if (term[s] > term[u]) term[u] = term[s];
    if (dist[s] + 1 < dist[u]) dist[u] = dist[s] + 1;
  }
  return { term, dist };
}

/**
 * Down the list (parents first): the best ancestor term, the distance through the parent (into `dist`),
 * the interest.
 */
function bestDown(
  nodes: Int32Array,
  up: Int32Array,
  depth: Int32Array,
  api: (x: number) => number,
  term: Float64Array,
  dist: Int32Array,
): { best: Float64Array; value: Float64Array } {
  const m = nodes.length;
  const best = new Float64Array(m);
  const value = new Float64Array(m);
  for (let s = 0; s < m; s++) {
    const x = nodes[s];
    if (x === 0) {
      best[s] = term[s];
      value[s] = api(0) + best[s];
      continue;
    }
    const u = up[s];
    best[s] = Math.max(2 * depth[x] + term[s], best[u]);
    value[s] = api(x) - depth[x] + best[s];
    if (dist[u] + 1 < dist[s]) dist[s] = dist[u] + 1;
  }
  return { best, value };
}

/** Two lists of distinct nodes, none in both, as one in ascending order. */
function merged(a: Int32Array, b: number[]): Int32Array {
  const out = new Int32Array(a.length + b.length);
  out.set(a);
  out.set(b, a.length);
  return out.sort();
}
