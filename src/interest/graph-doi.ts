import type { ReferenceIndex } from "../model/reference-index.js";
import type { Tree } from "../model/tree.js";
import { fromArrays, type Interest } from "./doi.js";

const FAR = 0x7fffffff;

/**
 * Degree of interest on a graph (a tree with references, model/build-graph.ts): Furnas's
 * DOI(x | y) = API(x) - D(x, y) with D the shortest-path distance in the graph, its edges taken both
 * ways, as Furnas (CHI '86, section "General fisheye views") defines it for any structure with a
 * distance, and as graph DOI work uses it (van Ham and Perer, IEEE TVCG 15(6), 2009). Several foci:
 * interest(x) = API(x) - min over foci y of [D(x, y) + API(y)], the tree formula of doi.ts; a reference
 * scores at its own place (its API) and its node's distance. Found by one breadth-first search from
 * all foci at once, each starting at its offset API(y) (two merged queues whose keys never decrease),
 * and one plain breadth-first search for the distance to the nearest focus.
 *
 * Order guarantees (interest/order.ts): a node's full entry never scores above its parent's, because
 * API drops by at least one per level and D by at most one along an edge; ties between them are broken
 * by `distance`, which grows by at least one from a parent that is not forced to a child. A focus with
 * several parents: each reference to it, with the path above it, scores at least 0 and carries a rank
 * (nearest a root first), so its parents show before other context, nearest first.
 */
export function graphInterest(
  tree: Tree,
  api: Float64Array,
  foci: Int32Array,
  refs: ReferenceIndex,
): Interest {
  const n = tree.length;
  const { parent, depth } = tree;
  const to = tree.referenceTo!;
  const value = new Float64Array(n);
  const distance = new Int32Array(n).fill(FAR);
  const forced = new Uint8Array(n);
  const rank = new Int32Array(n).fill(FAR);
  forced[0] = 1;
  if (foci.length === 0) {
    for (let i = 0; i < n; i++) value[i] = api[i] - api[0];
    return { ...fromArrays(value, distance, forced, Int32Array.of(0)), rank };
  }

  // Breadth-first over the neighbour lists (model/reference-index.ts): plain loops, no call per edge.
  const { around, neighbours } = refs;
  // Key K(x) = min over foci of D(x, y) + API(y), settled in increasing order: the foci, sorted by their
  // offset, and the queue of nodes reached (keys never decrease in it) are merged.
  const sources = Int32Array.from(foci).sort((a, b) => api[a] - api[b] || a - b);
  const key = new Float64Array(n).fill(Number.POSITIVE_INFINITY);
  const settled = new Uint8Array(n);
  const queue = new Int32Array(n);
  const queued = new Float64Array(n).fill(Number.POSITIVE_INFINITY);
  let head = 0;
  let tail = 0;
  let next = 0;
  while (next < sources.length || head < tail) {
    let x: number;
    let k: number;
    if (head < tail && (next === sources.length || queued[queue[head]] <= api[sources[next]])) {
      x = queue[head++];
      k = queued[x];
    } else {
      x = sources[next++];
      k = api[x];
    }
    if (settled[x] === 1) continue;
    settled[x] = 1;
    key[x] = k;
    const reach = k + 1;
    for (let j = around[x], end = around[x + 1]; j < end; j++) {
      const w = neighbours[j];
      if (settled[w] === 0 && reach < queued[w]) {
        queued[w] = reach;
        queue[tail++] = w;
      }
    }
  }

  // Edges to the nearest focus.
  const raw = new Int32Array(n).fill(FAR);
  head = 0;
  tail = 0;
  for (const y of foci) {
    if (raw[y] === 0) continue;
    raw[y] = 0;
    queue[tail++] = y;
  }
  while (head < tail) {
    const x = queue[head++];
    const d = raw[x] + 1;
    for (let j = around[x], end = around[x + 1]; j < end; j++) {
      const w = neighbours[j];
      if (raw[w] === FAR) {
        raw[w] = d;
        queue[tail++] = w;
      }
    }
  }

  // Forced: the root, the foci and the ancestors of their full entries.
  const forcedNodes: number[] = [0];
  for (const y of foci) {
    for (let a = y; a !== -1 && forced[a] === 0; a = parent[a]) {
      forced[a] = 1;
      forcedNodes.push(a);
    }
  }

  // The references to a focus, nearest a root first, and the paths above them: ranked, at least 0.
  const parentRefs: number[] = [];
  for (const y of foci) for (let j = refs.start[y]; j < refs.start[y + 1]; j++) parentRefs.push(refs.refs[j]);
  parentRefs.sort((a, b) => depth[a] - depth[b] || a - b);
  parentRefs.forEach((s, r) => {
    for (let a = s; a !== -1 && rank[a] === FAR; a = parent[a]) rank[a] = r;
  });

  // Values in pre-order; a reference takes its node's key. The tie-break distance of a node that is not
  // forced is at least its parent's plus one, so a parent comes first among equal values.
  for (let i = 0; i < n; i++) {
    const node = to[i] === -1 ? i : to[i];
    let v = api[i] - key[node];
    if (rank[i] !== FAR && v < 0) v = 0;
    value[i] = v;
    let d = raw[node];
    const p = parent[i];
    if (forced[i] === 0 && p >= 0 && d <= distance[p]) d = distance[p] + 1;
    distance[i] = d;
  }
  return { ...fromArrays(value, distance, forced, Int32Array.from(forcedNodes).sort()), rank };
}
