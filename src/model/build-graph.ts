import { EspalierError, quoted, say } from "../errors.js";
import { checkSizes } from "./check-sizes.js";
import { type GraphNeighbours, rememberNeighbours, upRuns } from "./graph-neighbours.js";
import type { GraphNodes } from "./graph-nodes.js";
import type { LinkedNodes } from "./linked-nodes.js";
import { lendToMeasure, rememberZeroSizes } from "./measure.js";
import { NamePool, type Names } from "./names.js";
import type { Tree } from "./tree.js";

/**
 * A graph as a {@link Tree}: a spanning tree in which every node has its full entry once, under one
 * parent, and every other edge into it is a one-line reference slot (`referenceTo`) under the edge's
 * parent. The rules, all deterministic:
 * - Edges that close a cycle: a depth-first walk from the roots (nodes no edge enters, in input order;
 *   then, while some node is unreached, the first unreached node in input order) meets each edge once;
 *   an edge to a node still on the walk's path closes a cycle and is always a reference.
 * - The other edges form an acyclic graph. Each node's full entry goes under its deepest parent: the
 *   one with the longest path from a top-level node (the most specific container; ties: the parent
 *   whose edge comes first in the input). A node's depth is then that longest path, so depth grows by
 *   exactly one from a node's full-entry parent to it.
 * - Top-level nodes are those with no parent left; several get one synthetic root, as in a tree.
 * - Slots are numbered in pre-order, children (entries and references) in input order of their edges.
 * On a graph that is a tree, the result is the tree {@link buildTree} gives for the same nodes and links.
 */
export function buildGraphTree(graph: GraphNodes, file?: string): Tree {
  const n = graph.origin.length;
  const name = poolOf(graph.name);
  const ids = poolOf(graph.ids);
  checkSizes({ ...graph, name, ids, parentOf: new Int32Array(0) } as LinkedNodes & { name: Names }, file);
  const E = graph.edgeCount;
  const { edgeFrom, edgeTo } = graph;
  let spare = graph.takeSpare?.();

  // Out-edges of each node in input order (a stable counting sort by parent): position j holds edge
  // out[j] and its child outTo[j], so the walks below read a node's children from one run of one
  // array. Whether a node has a parent is counted on the way. When each edge comes from a later line
  // than the one before (an edge list: one edge a line) and no repeat is refused, out[j] holds the
  // edge's line from the start: lines then order edges as their numbers do, and the pass that looks
  // the lines up at random later is spared.
  const { edgeOrigin } = graph;
  let byLine = graph.repeatedEdges !== "error";
  for (let e = 1; e < E && byLine; e++) if (edgeOrigin[e] <= edgeOrigin[e - 1]) byLine = false;
  const outStart = new Int32Array(n + 1);
  for (let e = 0; e < E; e++) outStart[edgeFrom[e] + 1]++;
  for (let i = 0; i < n; i++) outStart[i + 1] += outStart[i];
  const out = new Int32Array(E);
  const outTo = new Int32Array(E);
  // The build's arrays of a number a node, read no more once it is done, are cut from one block, which
  // is then lent to the tree's measures (lendToMeasure, model/measure.ts): three arrays of a number a
  // slot, where a graph has several times as many slots as nodes. Long enough for them however many
  // slots there are (at most one a node, one an edge and the added root); memory no one writes stays
  // untouched, so the block touches as many pages as the larger of its two uses, not their sum.
  const block = new Int32Array(Math.max(NODE_ARRAYS * n, 3 * (n + 1 + E)));
  let blockUsed = 0;
  const nodeArray = (): Int32Array => {
    blockUsed += n;
    return block.subarray(blockUsed - n, blockUsed);
  };
  const inDegree = nodeArray();
  const fill = nodeArray();
  fill.set(outStart.subarray(0, n));
  for (let e = 0; e < E; e++) {
    const j = fill[edgeFrom[e]]++;
    const v = edgeTo[e];
    out[j] = byLine ? edgeOrigin[e] : e;
    outTo[j] = v;
    inDegree[v]++;
  }
  if (graph.repeatedEdges === "error") refuseRepeats(graph, outStart, out, outTo, file);

  // What each position's edge is: a repeat of an earlier edge from the same parent to the same child
  // (read once: the first is the edge), whether it closes a cycle, and at last whether it is the edge
  // of its child's full entry.
  const kind = new Uint8Array(E);

  // Depth-first walk (iterative): back edges close cycles; the finishing order, reversed, is a
  // topological order of the remaining edges. A repeated edge walks as its first does (its child is
  // reached by then), so repeats are told apart later.
  const state = new Uint8Array(n); // 0 unreached, 1 on the walk's path, 2 done
  const cursor = nodeArray();
  const finished = nodeArray();
  let finishedCount = 0;
  const stack = nodeArray();
  const walkFrom = (r: number) => {
    let top = 0;
    stack[0] = r;
    state[r] = 1;
    cursor[r] = outStart[r];
    while (top >= 0) {
      const u = stack[top];
      const j = cursor[u];
      if (j === outStart[u + 1]) {
        state[u] = 2;
        finished[finishedCount++] = u;
        top--;
        continue;
      }
      cursor[u] = j + 1;
      const v = outTo[j];
      const seen = state[v];
      if (seen === 1) kind[j] = BACK;
      else if (seen === 0) {
        state[v] = 1;
        cursor[v] = outStart[v];
        stack[++top] = v;
      }
    }
  };
  for (let r = 0; r < n; r++) if (inDegree[r] === 0) walkFrom(r);
  for (let r = 0; r < n; r++) if (state[r] === 0) walkFrom(r);

  // Longest path from a top-level node, in topological order; the full entry goes under the deepest
  // parent (first edge in the input among equals). Per node, side by side: the position of its
  // full entry's edge (-1 none yet), its layer, and the last parent (+ 1) whose edges marked it, which
  // tells a repeated edge (a parent's edges are looked at together).
  const rec = new Int32Array(3 * n);
  for (let v = 0; v < n; v++) rec[3 * v] = -1;
  let live = 0;
  for (let k = n - 1; k >= 0; k--) {
    const u = finished[k];
    const next = rec[3 * u + 1] + 1;
    for (let j = outStart[u], end = outStart[u + 1]; j < end; j++) {
      const v = outTo[j];
      const r = 3 * v;
      if (rec[r + 2] === u + 1) {
        kind[j] = REPEAT;
        continue;
      }
      rec[r + 2] = u + 1;
      live++;
      if (kind[j] === BACK) continue;
      const home = rec[r];
      if (home === -1 || next > rec[r + 1] || (next === rec[r + 1] && out[j] < out[home])) {
        rec[r + 1] = next;
        rec[r] = j;
      }
    }
  }

  // Each node's full-entry edge, marked where the layout reads its edges anyway.
  let tops = 0;
  for (let i = 0; i < n; i++) {
    const home = rec[3 * i];
    if (home === -1) tops++;
    else kind[home] = HOME;
  }
  const synthetic = tops !== 1;
  const slots = n + (synthetic ? 1 : 0) + (live - (n - tops));
  // Without a reference no table of parents is made: the spare memory goes now, before the layout's.
  const hasReferences = slots > n + (synthetic ? 1 : 0);
  if (!hasReferences) spare = undefined;
  // From here on each position's line, in place of its edge's number: the layout gives a reference
  // its edge's line from the position it is at, without a second lookup.
  if (!byLine) for (let j = 0; j < E; j++) out[j] = edgeOrigin[out[j]];
  const outLine = out;

  // Pre-order layout: entries and references of each node in input order of their edges. A reference's
  // referenceTo holds its node until every entry has its slot, then the slot of that node's entry.
  // The loader's edge arrays are read no more: where they are long enough, three of the slot arrays
  // are made in their memory (every slot is written below), sparing that much fresh memory.
  const taken = new Set<ArrayBufferLike>([graph.origin.buffer, graph.ownSize.buffer]);
  // With references, the spare memory holds their targets, then the neighbour table (as far as it goes).
  const spareNumbers = carved(spare, taken);
  const parent = new Int32Array(slots);
  const depth = reused(graph.edgeTo, slots, taken);
  const from = reused(graph.edgeFrom, slots, taken); // node whose name (and id, fields) a slot shows; -1 synthetic root
  const referenceTo = hasReferences ? spareNumbers(slots).fill(-1) : new Int32Array(0);
  const ownSize = new Float64Array(slots);
  const origin = reused(edgeOrigin, slots, taken);
  const slotOf = nodeArray().fill(-1);
  const nodeSize = graph.ownSize;
  const nodeOrigin = graph.origin;
  // Sizes are copied to the entries only when some node has one (ownSize starts at 0).
  let sized = false;
  for (let i = 0; i < n && !sized; i++) if (nodeSize[i] !== 0) sized = true;
  let next = 0;
  const base = synthetic ? 1 : 0;
  if (synthetic) {
    parent[0] = -1;
    depth[0] = 0;
    from[0] = -1;
    origin[0] = 0;
    next = 1;
  }
  const place = (node: number, p: number): number => {
    const s = next++;
    parent[s] = p;
    depth[s] = p === -1 ? 0 : depth[p] + 1;
    from[s] = node;
    if (sized) ownSize[s] = nodeSize[node];
    origin[s] = nodeOrigin[node];
    slotOf[node] = s;
    cursor[node] = outStart[node];
    return s;
  };
  const slotStack = nodeArray();
  for (let r = 0; r < n; r++) {
    if (rec[3 * r] !== -1) continue;
    let top = 0;
    slotStack[0] = place(r, synthetic ? 0 : -1);
    stack[0] = r;
    while (top >= 0) {
      const u = stack[top];
      const j = cursor[u];
      if (j === outStart[u + 1]) {
        top--;
        continue;
      }
      cursor[u] = j + 1;
      if (kind[j] === REPEAT) continue;
      const v = outTo[j];
      const pu = slotStack[top];
      if (kind[j] === HOME) {
        slotStack[++top] = place(v, pu);
        stack[top] = v;
      } else {
        const s = next++;
        parent[s] = pu;
        depth[s] = depth[pu] + 1;
        from[s] = v;
        referenceTo[s] = v;
        origin[s] = outLine[j];
      }
    }
  }
  if (next !== slots) throw new Error(`graph layout placed ${next} of ${slots} slots`);
  if (hasReferences)
    for (let s = base; s < slots; s++) if (referenceTo[s] !== -1) referenceTo[s] = slotOf[referenceTo[s]];
  const fields = new Map<string, string[]>();
  for (const [key, values] of graph.fields) {
    const column: string[] = new Array(slots);
    for (let s = 0; s < slots; s++) column[s] = from[s] === -1 ? "" : (values[from[s]] ?? "");
    fields.set(key, column);
  }
  const topNodes = new Int32Array(synthetic && hasReferences ? tops : 0);
  if (topNodes.length > 0) for (let i = 0, t = 0; i < n; i++) if (rec[3 * i] === -1) topNodes[t++] = i;
  // The names' places, in the memory of two more arrays read no more (when long enough).
  const names = name.reordered(from, graph.rootName, {
    start: reusedU32(outLine, slots, taken),
    size: reusedU32(rec, slots, taken),
  });
  const tree: Tree = {
    length: slots,
    parent,
    depth,
    name: names,
    ownSize,
    hasSizes: graph.hasSizes,
    // An edge list's names are its ids (one pool): one reordered pool serves both, unless a synthetic
    // root needs a name ("" is its id).
    ids: graph.ids === graph.name && !synthetic ? names : ids.reordered(from, ""),
    origin,
    originIsRow: graph.originIsRow,
    fields,
    syntheticRoot: synthetic,
    reading: {
      shape: "graph",
      sizeUnit: graph.sizeUnit,
      ...(graph.notes && graph.notes.length > 0 ? { notes: graph.notes } : {}),
      ...(graph.startAt === undefined ? {} : { startAt: graph.startAt }),
      ...(graph.otherFields === undefined ? {} : { otherFields: graph.otherFields }),
      ...(graph.otherFieldsLeft === undefined ? {} : { otherFieldsLeft: graph.otherFieldsLeft }),
    },
    ...(hasReferences ? { referenceTo } : {}),
  };
  if (!sized) rememberZeroSizes(tree);
  if (hasReferences) {
    // The graph interest's neighbour table, from the edges at hand (see graph-neighbours.ts): nodes by
    // their own numbers, so a slot's node is the node it shows (the added root: n).
    if (synthetic) from[0] = n;
    rememberNeighbours(tree, neighbourTable(outStart, outTo, inDegree, topNodes, from, spareNumbers));
  }
  lendToMeasure(tree, {
    count: block.subarray(0, slots),
    children: block.subarray(slots, 2 * slots),
    nodes: block.subarray(2 * slots, 3 * slots),
  });
  return tree;
}

/**
 * The neighbour table ({@link GraphNeighbours}) of a graph's nodes by their own numbers, the root
 * espalier adds (when `tops`, the top-level nodes under it, are given) being node n: the `down` runs
 * are the out-edges sorted by parent (a repeated edge gives a repeated neighbour, which changes no
 * distance), with the added root's run (its top-level nodes) after them; the `up` runs are made from
 * them, placed by `inDegree` (edges into each node).
 */
function neighbourTable(
  outStart: Int32Array,
  outTo: Int32Array,
  inDegree: Int32Array,
  tops: Int32Array,
  nodeOf: Int32Array,
  numbers: (length: number) => Int32Array,
): GraphNeighbours {
  const n = outStart.length - 1;
  const E = outStart[n];
  let downStart = outStart;
  let down = outTo.length === E ? outTo : outTo.subarray(0, E);
  let nodes = n;
  if (tops.length > 0) {
    nodes = n + 1;
    downStart = new Int32Array(n + 2);
    downStart.set(outStart);
    downStart[n + 1] = E + tops.length;
    down = new Int32Array(E + tops.length);
    down.set(outTo.subarray(0, E));
    down.set(tops, E);
  }
  const upStart = numbers(nodes + 1);
  upStart[0] = 0;
  for (let v = 0; v < n; v++) upStart[v + 1] = inDegree[v];
  if (nodes > n) upStart[nodes] = 0;
  for (let t = 0; t < tops.length; t++) upStart[tops[t] + 1]++;
  for (let k = 0; k < nodes; k++) upStart[k + 1] += upStart[k];
  return { nodes, nodeOf, downStart, down, ...upRuns(nodes, downStart, down, upStart, numbers) };
}

/**
 * Kinds of an edge position (see buildGraphTree): it closes a cycle, repeats an earlier edge, or (once
 * the parents are chosen) is the edge of its child's full entry.
 */
const BACK = 1;
const REPEAT = 2;
const HOME = 3;
/** The build's arrays of a number a node, cut from its block (see buildGraphTree). */
const NODE_ARRAYS = 7;

/** DUPLICATE_ID at the first repeated edge, parent by parent, each parent's edges in input order. */
function refuseRepeats(
  graph: GraphNodes,
  outStart: Int32Array,
  out: Int32Array,
  outTo: Int32Array,
  file: string | undefined,
): void {
  const n = outStart.length - 1;
  const mark = new Int32Array(n);
  for (let u = 0; u < n; u++) {
    for (let j = outStart[u]; j < outStart[u + 1]; j++) {
      const v = outTo[j];
      if (mark[v] === u + 1) throw repeatedEdge(graph, out[j], file);
      mark[v] = u + 1;
    }
  }
}

/**
 * `length` numbers in the memory of `spare`, an array whose contents are read no more, when it is long
 * enough and its memory is not `taken` (lent already, or still read: whatever arrays a loader gave, no
 * memory is lent twice); its first `length` numbers as they are (the caller writes every one). Else a
 * new array.
 */
function reused(spare: Int32Array, length: number, taken: Set<ArrayBufferLike>): Int32Array {
  if (spare.length < length || taken.has(spare.buffer)) return new Int32Array(length);
  taken.add(spare.buffer);
  return spare.subarray(0, length);
}

/**
 * Arrays of numbers cut one after the other from `spare` (memory read no more, as {@link reused} lends
 * it: whatever it holds, the caller writes every number), new ones once it has no room left.
 */
function carved(spare: Int32Array | undefined, taken: Set<ArrayBufferLike>): (length: number) => Int32Array {
  let used = 0;
  const from = spare !== undefined && !taken.has(spare.buffer) ? spare : undefined;
  if (from !== undefined) taken.add(from.buffer);
  return (length) => {
    if (from === undefined || from.length - used < length) return new Int32Array(length);
    used += length;
    return from.subarray(used - length, used);
  };
}

/** {@link reused}, read as unsigned numbers (the same memory). */
function reusedU32(spare: Int32Array, length: number, taken: Set<ArrayBufferLike>): Uint32Array {
  const numbers = reused(spare, length, taken);
  return new Uint32Array(numbers.buffer, numbers.byteOffset, length);
}

function poolOf(names: NamePool | readonly string[]): NamePool {
  return names instanceof NamePool ? names : NamePool.from(names);
}

function repeatedEdge(graph: GraphNodes, e: number, file?: string): EspalierError {
  const at = graph.edgeOrigin[e];
  const ids = graph.ids;
  const id = (i: number) => quoted.id(ids instanceof NamePool ? ids.get(i) : ids[i]);
  const pos = graph.originIsRow ? { file, row: at } : { file, line: at, column: 1 };
  return new EspalierError(
    "DUPLICATE_ID",
    say`${graph.originIsRow ? "row" : "line"} ${at} repeats the link from ${id(graph.edgeFrom[e])} to ${id(graph.edgeTo[e])}`,
    pos,
  );
}
