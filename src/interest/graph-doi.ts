import { type GraphNeighbours, graphNeighbours } from "../model/graph-neighbours.js";
import type { Measures } from "../model/measure.js";
import type { ReferenceIndex } from "../model/reference-index.js";
import type { Tree } from "../model/tree.js";
import { interestNear } from "./near.js";
import { FAR, type Scores } from "./scores.js";

/** {@link Scores} of a graph: every member of the contract, and the rank of the parents of a focus. */
export interface GraphScores extends Scores {
  readonly rank: Int32Array;
}

/**
 * Degree of interest on a graph (a tree with references, model/build-graph.ts): Furnas's
 * DOI(x | y) = API(x) - D(x, y) with D the shortest-path distance in the graph, its edges taken both
 * ways, as Furnas (CHI '86, section "General fisheye views") defines it for any structure with a
 * distance, and as graph DOI work uses it (van Ham and Perer, IEEE TVCG 15(6), 2009). Several foci:
 * interest(x) = API(x) - min over foci y of [D(x, y) + API(y)], the tree formula of doi.ts; a reference
 * scores at its own place (its API) and its node's distance. Found by one breadth-first search from
 * all foci at once, each starting at its offset API(y) (two merged queues whose keys never decrease),
 * and, unless every focus has the same API, one plain breadth-first search for the distance to the
 * nearest focus. Both walk the graph node by node ({@link GraphNeighbours}, made once per prepared
 * tree: a node's neighbours are its parent, the nodes of its child slots and the parents of the
 * references to it), keeping one key per node, not per slot. The interest of a slot is then read when
 * the fit asks for it; the slots' distances too, kept as they are asked.
 *
 * Order guarantees (interest/order.ts): a node's full entry never scores above its parent's, because
 * API drops by at least one per level and D by at most one along an edge; ties between them are broken
 * by `distance`, which grows by at least one from a parent that is not forced to a child. A focus with
 * several parents: each reference to it, with the path above it, scores at least 0 and carries a rank
 * (nearest a root first), so its parents show before other context, nearest first.
 */
export function graphInterest(
  tree: Tree,
  _measures: Measures,
  api: Float64Array,
  foci: Int32Array,
  refs: ReferenceIndex,
  neighbours: GraphNeighbours = graphNeighbours(tree),
): GraphScores {
  const n = tree.length;
  const { parent, depth } = tree;
  const rank = new Int32Array(n).fill(FAR);
  // No focus: the same scores as a tree's, API(x) − API(root) (near.ts), every rank FAR.
  if (foci.length === 0) return { ...interestNear(tree, api, foci), rank };
  const { nodes, nodeOf, start, adjacent } = neighbours;

  // Key K(v) = min over foci of D(v, y) + API(y), settled in increasing order: the foci, sorted by their
  // offset, and the queue of nodes reached (keys never decrease in it) are merged. Nodes by number.
  const sources = Int32Array.from(foci).sort((a, b) => api[a] - api[b] || a - b);
  // key[v]: the best offset reaching node v so far; final once v is settled.
  const key = new Float64Array(nodes).fill(Number.POSITIVE_INFINITY);
  const settled = new Uint8Array(nodes);
  const queue = new Int32Array(nodes);
  let head = 0;
  let tail = 0;
  let next = 0;
  while (next < sources.length || head < tail) {
    let v: number;
    if (head < tail && (next === sources.length || key[queue[head]] <= api[sources[next]])) v = queue[head++];
    else {
      const y = sources[next++];
      v = nodeOf[y];
      if (api[y] < key[v]) key[v] = api[y];
    }
    if (settled[v] === 1) continue;
    settled[v] = 1;
    const reach = key[v] + 1;
    for (let j = start[v], end = start[v + 1]; j < end; j++) {
      const w = adjacent[j];
      if (reach < key[w]) {
        key[w] = reach;
        queue[tail++] = w;
      }
    }
  }

  // Edges to the nearest focus. When every focus has the same API c, K(v) = D(v, nearest focus) + c, so
  // the distance is K(v) - c (rounded: K was summed in doubles, and the true value is a whole number).
  // Otherwise a plain breadth-first search over the same neighbours.
  const offset = api[sources[0]];
  const raw = api[sources[sources.length - 1]] === offset ? null : plainDistances(neighbours, foci, queue);
  const edges = (slot: number): number =>
    raw === null ? Math.round(key[nodeOf[slot]] - offset) : raw[nodeOf[slot]];

  // Forced: the root, the foci and the ancestors of their full entries.
  const forced = new Uint8Array(n);
  forced[0] = 1;
  const forcedNodes: number[] = [0];
  for (const y of foci) {
    for (let a = y; a !== -1 && forced[a] === 0; a = parent[a]) {
      forced[a] = 1;
      forcedNodes.push(a);
    }
  }

  // The references to a focus, nearest a root first, and the paths above them: ranked, at least 0.
  const { start: refStart, refs: refSlots } = refs;
  const parentRefs: number[] = [];
  for (const y of foci) for (let j = refStart[y]; j < refStart[y + 1]; j++) parentRefs.push(refSlots[j]);
  parentRefs.sort((a, b) => depth[a] - depth[b] || a - b);
  parentRefs.forEach((s, r) => {
    for (let a = s; a !== -1 && rank[a] === FAR; a = parent[a]) rank[a] = r;
  });

  // A slot's distance, found when asked and kept (0 unknown, else distance + 1). The tie-break
  // distance of a slot that is not forced is at least its parent's plus one, so a parent comes first
  // among equal values.
  const known = new Int32Array(n);
  const path: number[] = [];
  const distanceOf = (x: number): number => {
    if (known[x] !== 0) return known[x] - 1;
    // Up to a slot whose distance is known, forced, or the root; then down again.
    let a = x;
    while (known[a] === 0 && forced[a] === 0 && parent[a] >= 0) {
      path.push(a);
      a = parent[a];
    }
    let d = known[a] !== 0 ? known[a] - 1 : edges(a);
    known[a] = d + 1;
    while (path.length > 0) {
      const s = path.pop()!;
      const own = edges(s);
      d = own <= d ? d + 1 : own;
      known[s] = d + 1;
    }
    return d;
  };
  return {
    forcedNodes: Int32Array.from(forcedNodes).sort(),
    interestOf(x) {
      const v = api[x] - key[nodeOf[x]];
      return rank[x] !== FAR && v < 0 ? 0 : v;
    },
    distanceOf,
    isForced: (x) => forced[x] === 1,
    rank,
  };
}

/** Edges from every node to the nearest focus: a breadth-first search (`queue`: a node long, scratch). */
function plainDistances(neighbours: GraphNeighbours, foci: Int32Array, queue: Int32Array): Int32Array {
  const { nodes, nodeOf, start, adjacent } = neighbours;
  const raw = new Int32Array(nodes).fill(FAR);
  let head = 0;
  let tail = 0;
  for (const y of foci) {
    const v = nodeOf[y];
    if (raw[v] === 0) continue;
    raw[v] = 0;
    queue[tail++] = v;
  }
  while (head < tail) {
    const v = queue[head++];
    const d = raw[v] + 1;
    for (let j = start[v], end = start[v + 1]; j < end; j++) {
      const w = adjacent[j];
      if (raw[w] === FAR) {
        raw[w] = d;
        queue[tail++] = w;
      }
    }
  }
  return raw;
}
