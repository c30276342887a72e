import { EspalierError, quoted, say } from "../errors.js";
import { checkSizes } from "./check-sizes.js";
import type { GraphNodes } from "./graph-nodes.js";
import type { LinkedNodes } from "./linked-nodes.js";
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

  // Out-edges of each node in input order (a stable counting sort by parent).
  const outStart = new Int32Array(n + 1);
  for (let e = 0; e < E; e++) outStart[edgeFrom[e] + 1]++;
  for (let i = 0; i < n; i++) outStart[i + 1] += outStart[i];
  const out = new Int32Array(E);
  const fill = outStart.slice(0, n);
  for (let e = 0; e < E; e++) out[fill[edgeFrom[e]]++] = e;

  // Repeated edges (same parent and child) count once; `live` marks the first of each.
  const live = new Uint8Array(E);
  const mark = new Int32Array(n);
  const inDegree = new Int32Array(n);
  for (let u = 0; u < n; u++) {
    for (let k = outStart[u]; k < outStart[u + 1]; k++) {
      const e = out[k];
      const v = edgeTo[e];
      if (mark[v] === u + 1) {
        if (graph.repeatedEdges === "error") throw repeatedEdge(graph, e, file);
        continue;
      }
      mark[v] = u + 1;
      live[e] = 1;
      inDegree[v]++;
    }
  }

  // Depth-first walk (iterative): back edges close cycles; the finishing order, reversed, is a
  // topological order of the remaining edges.
  const state = new Uint8Array(n); // 0 unreached, 1 on the walk's path, 2 done
  const cursor = new Int32Array(n);
  const finished = new Int32Array(n);
  let finishedCount = 0;
  const stack = new Int32Array(n);
  const back = new Uint8Array(E);
  const walkFrom = (r: number) => {
    let top = 0;
    stack[0] = r;
    state[r] = 1;
    cursor[r] = outStart[r];
    while (top >= 0) {
      const u = stack[top];
      if (cursor[u] === outStart[u + 1]) {
        state[u] = 2;
        finished[finishedCount++] = u;
        top--;
        continue;
      }
      const e = out[cursor[u]++];
      if (live[e] === 0) continue;
      const v = edgeTo[e];
      if (state[v] === 1) back[e] = 1;
      else if (state[v] === 0) {
        state[v] = 1;
        cursor[v] = outStart[v];
        stack[++top] = v;
      }
    }
  };
  for (let r = 0; r < n; r++) if (inDegree[r] === 0) walkFrom(r);
  for (let r = 0; r < n; r++) if (state[r] === 0) walkFrom(r);

  // Longest path from a top-level node, in topological order; the full entry goes under the deepest
  // parent (first edge in the input among equals).
  const layer = new Int32Array(n);
  const homeEdge = new Int32Array(n).fill(-1);
  for (let k = n - 1; k >= 0; k--) {
    const u = finished[k];
    const next = layer[u] + 1;
    for (let j = outStart[u]; j < outStart[u + 1]; j++) {
      const e = out[j];
      if (live[e] === 0 || back[e] === 1) continue;
      const v = edgeTo[e];
      if (homeEdge[v] === -1 || next > layer[v] || (next === layer[v] && e < homeEdge[v])) {
        layer[v] = next;
        homeEdge[v] = e;
      }
    }
  }

  let tops = 0;
  for (let i = 0; i < n; i++) if (homeEdge[i] === -1) tops++;
  const synthetic = tops !== 1;
  const slots = n + (synthetic ? 1 : 0) + (liveCount(live) - (n - tops));

  // Pre-order layout: entries and references of each node in input order of their edges. A reference's
  // referenceTo holds its node until every entry has its slot, then the slot of that node's entry.
  const parent = new Int32Array(slots);
  const depth = new Int32Array(slots);
  const from = new Int32Array(slots); // node whose name (and id, fields) a slot shows; -1 synthetic root
  const referenceTo = new Int32Array(slots).fill(-1);
  const ownSize = new Float64Array(slots);
  const origin = new Int32Array(slots);
  const slotOf = new Int32Array(n).fill(-1);
  const nodeSize = graph.ownSize;
  const nodeOrigin = graph.origin;
  const { edgeOrigin } = graph;
  let next = 0;
  const base = synthetic ? 1 : 0;
  if (synthetic) {
    parent[0] = -1;
    from[0] = -1;
    next = 1;
  }
  const place = (node: number, p: number): number => {
    const s = next++;
    parent[s] = p;
    depth[s] = p === -1 ? 0 : depth[p] + 1;
    from[s] = node;
    ownSize[s] = nodeSize[node];
    origin[s] = nodeOrigin[node];
    slotOf[node] = s;
    cursor[node] = outStart[node];
    return s;
  };
  const slotStack = new Int32Array(n);
  for (let r = 0; r < n; r++) {
    if (homeEdge[r] !== -1) continue;
    let top = 0;
    slotStack[0] = place(r, synthetic ? 0 : -1);
    stack[0] = r;
    while (top >= 0) {
      const u = stack[top];
      if (cursor[u] === outStart[u + 1]) {
        top--;
        continue;
      }
      const e = out[cursor[u]++];
      if (live[e] === 0) continue;
      const v = edgeTo[e];
      const pu = slotStack[top];
      if (homeEdge[v] === e) {
        slotStack[++top] = place(v, pu);
        stack[top] = v;
      } else {
        const s = next++;
        parent[s] = pu;
        depth[s] = depth[pu] + 1;
        from[s] = v;
        referenceTo[s] = v;
        origin[s] = edgeOrigin[e];
      }
    }
  }
  if (next !== slots) throw new Error(`graph layout placed ${next} of ${slots} slots`);
  for (let s = base; s < slots; s++) if (referenceTo[s] !== -1) referenceTo[s] = slotOf[referenceTo[s]];
  const fields = new Map<string, string[]>();
  for (const [key, values] of graph.fields) {
    const column: string[] = new Array(slots);
    for (let s = 0; s < slots; s++) column[s] = from[s] === -1 ? "" : (values[from[s]] ?? "");
    fields.set(key, column);
  }
  const hasReferences = slots > n + base;
  const names = name.reordered(from, graph.rootName);
  return {
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
    reading: { shape: "graph", sizeUnit: graph.sizeUnit },
    ...(hasReferences ? { referenceTo } : {}),
  };
}

function liveCount(live: Uint8Array): number {
  let c = 0;
  for (let e = 0; e < live.length; e++) c += live[e];
  return c;
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
