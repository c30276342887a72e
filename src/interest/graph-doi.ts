import { type GraphNeighbours, graphNeighbours } from "../model/graph-neighbours.js";
import type { Measures } from "../model/measure.js";
import type { ReferenceIndex, referencesTo } from "../model/reference-index.js";
import type { Tree } from "../model/tree.js";
import { interestNear } from "./near.js";
import { NodeTable } from "./node-table.js";
import { FAR, type Scores } from "./scores.js";

/** {@link Scores} of a graph: every member of the contract, and the rank of the parents of a focus. */
export interface GraphScores extends Scores {
  rankOf(x: number): number;
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
 * (nearest a root first), so its parents show before other context, nearest first. `refs`: the
 * references to the foci ({@link referencesTo}).
 */
export function graphInterest(
  tree: Tree,
  _measures: Measures,
  api: Float64Array | ((x: number) => number),
  foci: Int32Array,
  refs: ReferenceIndex,
  neighbours: GraphNeighbours = graphNeighbours(tree),
): GraphScores {
  const { parent, depth } = tree;
  // The rank of the slots on the path to a parent of a focus (FAR elsewhere) and the distances found so
  // far are kept for a few of the slots, in tables of those slots (node-table.ts), and whether a slot is
  // forced or ranked as one bit a slot: on a graph of millions of slots, an array of a number a slot,
  // read or written at the slots the fit asks about, touches most of its pages, and fresh memory is
  // dear (docs/performance.md).
  const n = tree.length;
  const forcedBits = new Int32Array((n + 31) >>> 5);
  const rankedBits = new Int32Array((n + 31) >>> 5);
  const isSet = (bits: Int32Array, x: number): boolean => (bits[x >>> 5] & (1 << (x & 31))) !== 0;
  const ranks = new NodeTable();
  const rankOf = (x: number): number => (isSet(rankedBits, x) ? ranks.get(x) : FAR);
  // No focus: the same scores as a tree's, API(x) − API(root) (near.ts), every rank FAR.
  if (foci.length === 0) {
    const all = typeof api === "function" ? Float64Array.from(depth, (_, x) => api(x)) : api;
    return { ...interestNear(tree, all, foci), rankOf };
  }
  // API(x): `api` is an array, or worked out when asked (importance/depthImportance).
  const apiOf = typeof api === "function" ? api : (x: number) => api[x];
  const { nodes, nodeOf } = neighbours;

  // Key K(v) = min over foci of D(v, y) + API(y). The foci, sorted by their offset API(y).
  const sources = Int32Array.from(foci).sort((a, b) => apiOf(a) - apiOf(b) || a - b);
  const offsets = Float64Array.from(sources, (y) => apiOf(y));
  const queue = new Int32Array(nodes);
  // Whole offsets small enough that every key fits a 32-bit level: the level search, its keys read
  // through `levelKey` (UNREACHED is +Infinity); else the merged search's keys as they are.
  const whole = offsets.every((o) => Number.isInteger(o) && Math.abs(o) <= MAX_OFFSET) && nodes <= MAX_OFFSET;
  const levels = whole ? levelSearch(neighbours, sources, offsets, queue) : null;
  const merged = whole ? null : mergedSearch(neighbours, sources, offsets, queue);
  const keyOf = levels !== null ? (v: number) => levelKey(levels[v]) : (v: number) => merged![v];

  // Edges to the nearest focus. When every focus has the same API c, K(v) = D(v, nearest focus) + c, so
  // the distance is K(v) - c (rounded: K was summed in doubles, and the true value is a whole number).
  // Otherwise a plain breadth-first search over the same neighbours (every focus at level 0), its
  // unreached nodes FAR.
  const offset = offsets[0];
  const raw =
    offsets[offsets.length - 1] === offset
      ? null
      : levelSearch(neighbours, sources, new Float64Array(sources.length), queue);
  const edges = (slot: number): number => {
    if (raw === null) return Math.round(keyOf(nodeOf[slot]) - offset);
    const d = raw[nodeOf[slot]];
    return d === UNREACHED ? FAR : d;
  };

  // Forced: the root, the foci and the ancestors of their full entries.
  forcedBits[0] = 1;
  const forcedNodes: number[] = [0];
  for (const y of foci) {
    for (let a = y; a !== -1 && !isSet(forcedBits, a); a = parent[a]) {
      forcedBits[a >>> 5] |= 1 << (a & 31);
      forcedNodes.push(a);
    }
  }

  // The references to a focus, nearest a root first, and the paths above them: ranked, at least 0.
  const parentRefs: number[] = [];
  for (const y of foci) for (const r of refs.of(y)) parentRefs.push(r);
  parentRefs.sort((a, b) => depth[a] - depth[b] || a - b);
  parentRefs.forEach((s, r) => {
    for (let a = s; a !== -1 && !isSet(rankedBits, a); a = parent[a]) {
      rankedBits[a >>> 5] |= 1 << (a & 31);
      ranks.set(a, r);
    }
  });

  // A slot's distance, found when asked and kept (-1: unknown). The tie-break distance of a slot that
  // is not forced is at least its parent's plus one, so a parent comes first among equal values. Every
  // node is reached when there is a focus (the added root joins the top-level nodes), so a distance is
  // a whole number below the count of nodes.
  const known = new NodeTable();
  const path: number[] = [];
  const distanceOf = (x: number): number => {
    const asked = known.get(x);
    if (asked !== -1) return asked;
    // Up to a slot whose distance is known, forced, or the root; then down again.
    let a = x;
    let d = asked;
    while (!isSet(forcedBits, a) && parent[a] >= 0) {
      path.push(a);
      a = parent[a];
      d = known.get(a);
      if (d !== -1) break;
    }
    if (d === -1) {
      d = edges(a);
      known.set(a, d);
    }
    while (path.length > 0) {
      const s = path.pop()!;
      const own = edges(s);
      d = own <= d ? d + 1 : own;
      known.set(s, d);
    }
    return d;
  };
  return {
    forcedNodes: Int32Array.from(forcedNodes).sort(),
    interestOf(x) {
      const v = apiOf(x) - keyOf(nodeOf[x]);
      return v < 0 && isSet(rankedBits, x) ? 0 : v;
    },
    distanceOf,
    isForced: (x) => isSet(forcedBits, x),
    rankOf,
  };
}

/** A level no source reaches, in {@link levelSearch}'s levels. */
const UNREACHED = 0x7fffffff;
/** The largest offset (and node count) for which every level fits below UNREACHED. */
const MAX_OFFSET = 2 ** 29;

/** A key of {@link levelSearch}'s levels as a number (+Infinity where no source reaches). */
function levelKey(level: number): number {
  return level === UNREACHED ? Number.POSITIVE_INFINITY : level;
}

/**
 * The least of (offset of a source + edges from it) for every node, UNREACHED where no source
 * reaches, as 32-bit levels (the offsets and node count are at most MAX_OFFSET, so every level fits): a
 * breadth-first search from all the sources (slots of full entries, sorted by offset), each entering
 * when the search reaches its offset, which must be a whole number. Level by level: a level whose
 * frontier has more edges than a fourteenth of those of the nodes not yet reached is found the other
 * way round, every node not reached looking for a neighbour in the frontier and stopping at the first
 * (Beamer, Asanović and Patterson, "Direction-optimizing breadth-first search", SC '12, with their
 * α = 14, and their bitmaps: such a level reads the frontier and the nodes reached as one bit per node,
 * small enough to stay in the processor's cache); both give each node the first level it is reached
 * at. `queue`: a node long.
 *
 * Every loop over nodes or edges is a function of its own, this one keeping only the loop over
 * levels (a dozen on the bench graph): the engine then compiles each loop once, with what it has seen
 * of that loop, where one function holding them all was compiled again for each loop that became hot
 * and thrown away at each branch its compiled code had not seen run (a bottom-up level after top-down
 * ones). Compiling runs on a thread of its own, but it is CPU time of the command all the same: the
 * two searches of a bench graph summary took 0.40 s of CPU in a fresh process before, 0.26 s this way
 * (docs/performance.md).
 */
function levelSearch(
  neighbours: GraphNeighbours,
  sources: Int32Array,
  offsets: Float64Array,
  queue: Int32Array,
): Int32Array {
  const { nodes, nodeOf, downStart, down, upStart, up } = neighbours;
  const level = new Int32Array(nodes).fill(UNREACHED);
  // One bit per node: reached (at any level so far), and in the frontier (a bottom-up level's only).
  const words = (nodes + 31) >>> 5;
  const reached = new Int32Array(words);
  let frontier: Int32Array | null = null;
  let head = 0;
  let tail = 0;
  let next = 0;
  let unreachedEdges = down.length + up.length;
  for (let d = offsets[0]; ; d++) {
    // The frontier: the nodes reached at level d, and the sources entering at d not reached before.
    while (next < sources.length && offsets[next] === d) {
      const v = nodeOf[sources[next++]];
      if (level[v] <= d) continue;
      level[v] = d;
      reached[v >>> 5] |= 1 << (v & 31);
      queue[tail++] = v;
    }
    if (head === tail) {
      if (next === sources.length) return level;
      d = offsets[next] - 1;
      continue;
    }
    const frontierEdges = edgesOf(queue, head, tail, downStart, upStart);
    unreachedEdges -= frontierEdges;
    const levelEnd = tail;
    if (frontierEdges * 14 > unreachedEdges) {
      frontier ??= new Int32Array(words);
      setBits(frontier, queue, head, levelEnd);
      tail = bottomUpLevel(neighbours, words, reached, frontier, level, d + 1, queue, tail);
      clearWords(frontier, queue, head, levelEnd);
      setBits(reached, queue, levelEnd, tail);
    } else {
      tail = topDownLevel(neighbours, reached, level, d + 1, queue, head, levelEnd, tail);
    }
    head = levelEnd;
  }
}

/** The edges of the nodes `queue[from, to)`, both ways. */
function edgesOf(
  queue: Int32Array,
  from: number,
  to: number,
  downStart: Int32Array,
  upStart: Int32Array,
): number {
  let edges = 0;
  for (let k = from; k < to; k++) {
    const v = queue[k];
    edges += downStart[v + 1] - downStart[v] + upStart[v + 1] - upStart[v];
  }
  return edges;
}

/** Sets the bits of the nodes `queue[from, to)`. */
function setBits(bits: Int32Array, queue: Int32Array, from: number, to: number): void {
  for (let k = from; k < to; k++) bits[queue[k] >>> 5] |= 1 << (queue[k] & 31);
}

/** Clears the words that hold the bits of the nodes `queue[from, to)` (no other bit is set in them). */
function clearWords(bits: Int32Array, queue: Int32Array, from: number, to: number): void {
  for (let k = from; k < to; k++) bits[queue[k] >>> 5] = 0;
}

/**
 * A bottom-up level of {@link levelSearch}: every node not `reached` with a neighbour in `frontier` gets
 * `reach` and joins the queue at `tail` (its bit in `reached` is set by the caller, after the level, so
 * that a node found at this level is not taken for a frontier node). Returns the new tail.
 */
function bottomUpLevel(
  neighbours: GraphNeighbours,
  words: number,
  reached: Int32Array,
  frontier: Int32Array,
  level: Int32Array,
  reach: number,
  queue: Int32Array,
  tail: number,
): number {
  const { nodes, downStart, down, upStart, up } = neighbours;
  for (let w = 0; w < words; w++) {
    const done = reached[w];
    if (done === -1) continue;
    const first = w << 5;
    const last = Math.min(first + 32, nodes);
    for (let v = first; v < last; v++) {
      if ((done & (1 << (v & 31))) !== 0) continue;
      let found = false;
      for (let j = upStart[v], end = upStart[v + 1]; j < end && !found; j++)
        found = (frontier[up[j] >>> 5] & (1 << (up[j] & 31))) !== 0;
      for (let j = downStart[v], end = downStart[v + 1]; j < end && !found; j++)
        found = (frontier[down[j] >>> 5] & (1 << (down[j] & 31))) !== 0;
      if (found) {
        level[v] = reach;
        queue[tail++] = v;
      }
    }
  }
  return tail;
}

/**
 * A top-down level of {@link levelSearch}: the neighbours of the frontier `queue[head, levelEnd)` not
 * reached yet get `reach`, their bit in `reached`, and join the queue at `tail`. Returns the new tail.
 */
function topDownLevel(
  neighbours: GraphNeighbours,
  reached: Int32Array,
  level: Int32Array,
  reach: number,
  queue: Int32Array,
  head: number,
  levelEnd: number,
  tail: number,
): number {
  const { downStart, down, upStart, up } = neighbours;
  for (let k = head; k < levelEnd; k++) {
    const v = queue[k];
    for (let j = downStart[v], end = downStart[v + 1]; j < end; j++) {
      const w = down[j];
      if (level[w] > reach) {
        level[w] = reach;
        reached[w >>> 5] |= 1 << (w & 31);
        queue[tail++] = w;
      }
    }
    for (let j = upStart[v], end = upStart[v + 1]; j < end; j++) {
      const w = up[j];
      if (level[w] > reach) {
        level[w] = reach;
        reached[w >>> 5] |= 1 << (w & 31);
        queue[tail++] = w;
      }
    }
  }
  return tail;
}

/**
 * What {@link levelSearch} finds, for offsets of any value: nodes settled in increasing order of key,
 * the sources (sorted by offset) and the queue of nodes reached (keys never decrease in it) merged.
 */
function mergedSearch(
  neighbours: GraphNeighbours,
  sources: Int32Array,
  offsets: Float64Array,
  queue: Int32Array,
): Float64Array {
  const { nodes, nodeOf, downStart, down, upStart, up } = neighbours;
  // key[v]: the best offset reaching node v so far; final once v is settled.
  const key = new Float64Array(nodes).fill(Number.POSITIVE_INFINITY);
  const settled = new Uint8Array(nodes);
  let head = 0;
  let tail = 0;
  let next = 0;
  while (next < sources.length || head < tail) {
    let v: number;
    if (head < tail && (next === sources.length || key[queue[head]] <= offsets[next])) v = queue[head++];
    else {
      v = nodeOf[sources[next]];
      if (offsets[next] < key[v]) key[v] = offsets[next];
      next++;
    }
    if (settled[v] === 1) continue;
    settled[v] = 1;
    const reach = key[v] + 1;
    for (let j = downStart[v], end = downStart[v + 1]; j < end; j++) {
      const w = down[j];
      if (reach < key[w]) {
        key[w] = reach;
        queue[tail++] = w;
      }
    }
    for (let j = upStart[v], end = upStart[v + 1]; j < end; j++) {
      const w = up[j];
      if (reach < key[w]) {
        key[w] = reach;
        queue[tail++] = w;
      }
    }
  }
  return key;
}
