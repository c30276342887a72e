import { EspalierError } from "../errors.js";
import type { Names } from "../model/names.js";
import type { Tree } from "../model/tree.js";
import { alignRoots, underRoot } from "./align-roots.js";
import { KIND } from "./changes.js";
import type { Combined } from "./combine.js";
import { type Matching, matchTrees } from "./match.js";

/** Whether two versions are compared as graphs: either has references (several parents, cycles). */
export function isGraphDiff(oldTree: Tree, newTree: Tree): boolean {
  return oldTree.referenceTo !== undefined || newTree.referenceTo !== undefined;
}

/**
 * Both versions under the same kind of root. Roots always match, so a graph whose top node changed
 * (another id) is put, in both versions, under a synthetic root: the two tops are then nodes like any
 * other, matched by id.
 */
export function alignGraphRoots(oldTree: Tree, newTree: Tree): [Tree, Tree] {
  if (!oldTree.syntheticRoot && !newTree.syntheticRoot && oldTree.ids?.get(0) !== newTree.ids?.get(0))
    return [underRoot(oldTree, "(root)"), underRoot(newTree, "(root)")];
  return alignRoots(oldTree, newTree);
}

/** The edges of a graph version: "parent id \0 child id" for every slot under a node, to its slot. */
type Edges = Map<string, number>;

/** Node ids with every reference slot reading "": id matching then pairs full entries only. */
class EntryIds implements Names {
  constructor(
    private readonly ids: Names,
    private readonly ref: Int32Array | undefined,
  ) {}

  get length(): number {
    return this.ids.length;
  }

  get(i: number): string {
    return this.ref !== undefined && this.ref[i] !== -1 ? "" : this.ids.get(i);
  }
}

/**
 * Matches two graph versions: each node's full entry by its id (as tables are matched), then each
 * reference whose edge (parent id, child id) is in the new version too, to the new slot of that edge,
 * so it is not shown as removed. Needs ids on both sides (edge lists, adjacency maps and graph tables
 * have them).
 */
export function matchGraphs(
  oldTree: Tree,
  oldCount: Int32Array,
  newTree: Tree,
  newCount: Int32Array,
): { matching: Matching; oldEdges: Edges; newEdges: Edges } {
  if (!oldTree.ids || !newTree.ids) {
    // One version has ids (a graph) and the other none (a tree, or YAML nodes whose paths serve as ids
    // only when both versions are such: see prepareDiff).
    throw new EspalierError(
      "USAGE",
      "a graph is compared by node ids: give both versions as graphs (edge lists, adjacency maps or tables with --graph)",
    );
  }
  const matching = matchTrees(
    { ...oldTree, ids: new EntryIds(oldTree.ids, oldTree.referenceTo) },
    oldCount,
    { ...newTree, ids: new EntryIds(newTree.ids, newTree.referenceTo) },
    newCount,
  );
  const oldEdges = edgesOf(oldTree);
  const newEdges = edgesOf(newTree);
  const ref = oldTree.referenceTo;
  if (ref !== undefined) {
    for (const [key, o] of oldEdges) {
      if (ref[o] === -1) continue;
      const m = newEdges.get(key);
      if (m !== undefined) matching.oldToNew[o] = m;
    }
  }
  return { matching, oldEdges, newEdges };
}

/**
 * Kinds of change by edges, and the references of the combined tree. Per slot of the combined tree:
 * - a reference of the new version: `linked` when its edge is new, `renamed` when the edge was there
 *   under another name (a YAML alias under a renamed key), else unchanged;
 * - a reference of the old version whose edge is gone (shown at its old place): `unlinked`;
 * - a node's full entry, the node in both versions, under another parent than before: `moved` when
 *   its new parent's edge is new and its old parent's is gone (as in a tree), `linked` when only the
 *   new edge is new (it gained a parent), `unlinked` when only the old edge is gone (it lost a
 *   parent; the entry shows under a parent it already had), else only renamed or resized (the same
 *   parents, another one chosen for the full entry);
 * - added and removed nodes as in a tree. References count no node, so old nodes + added − removed is
 *   still the new node count; `linked` and `unlinked` count edges.
 */
export function graphCombined(
  combined: Combined,
  matching: Matching,
  oldEdges: Edges,
  newEdges: Edges,
): Combined {
  const { oldTree, newTree, newIndex, oldIndex, kind, delta, tree } = combined;
  const total = tree.length;
  const oldRef = oldTree.referenceTo;
  const newRef = newTree.referenceTo;
  const newToCombined = new Int32Array(newTree.length).fill(-1);
  const oldToCombined = new Int32Array(oldTree.length).fill(-1);
  for (let k = 0; k < total; k++) {
    if (newIndex[k] >= 0) newToCombined[newIndex[k]] = k;
    else oldToCombined[oldIndex[k]] = k;
  }
  const referenceTo = new Int32Array(total).fill(-1);
  for (let k = 1; k < total; k++) {
    const n = newIndex[k];
    const o = oldIndex[k];
    if (n >= 0 && newRef !== undefined && newRef[n] !== -1) {
      referenceTo[k] = newToCombined[newRef[n]];
      // The same reference under another key (YAML: `ledger-link: *ledger` became `ledger-ref:
      // *ledger`): the line names the node by that key, so the change is a rename, from the old key.
      const before = oldEdges.get(edgeKey(newTree, n)!);
      if (before === undefined) kind[k] = KIND.linked;
      else if (matching.oldToNew[before] === n && oldTree.name.get(before) !== newTree.name.get(n)) {
        kind[k] = KIND.renamed;
        oldIndex[k] = before;
      } else kind[k] = KIND.none;
      delta[k] = 0;
      continue;
    }
    if (n < 0) {
      if (oldRef !== undefined && oldRef[o] !== -1) {
        const t = oldRef[o];
        const m = matching.oldToNew[t];
        referenceTo[k] = m >= 0 ? newToCombined[m] : oldToCombined[t];
        kind[k] = KIND.unlinked;
        delta[k] = 0;
      }
      continue;
    }
    if (o < 0) continue; // added
    const newHome = edgeKey(newTree, n);
    const oldHome = edgeKey(oldTree, o);
    if (newHome === oldHome) continue; // same parent: renamed or resized as in a tree
    const gained = newHome !== null && !oldEdges.has(newHome);
    const lost = oldHome !== null && !newEdges.has(oldHome);
    if (gained && lost) kind[k] = KIND.moved;
    else if (gained) kind[k] = KIND.linked;
    else if (lost) kind[k] = KIND.unlinked;
    else if (newTree.name.get(n) !== oldTree.name.get(o)) kind[k] = KIND.renamed;
    else kind[k] = delta[k] !== 0 ? KIND.resized : KIND.none;
  }
  // `delta` was made (read above) and changed here: it is the one to read.
  return { ...combined, tree: { ...tree, referenceTo }, deltaOf: (k) => delta[k] };
}

/** Node count of a version: its full entries (references are no nodes). */
export function distinctNodes(tree: Tree): number {
  const ref = tree.referenceTo;
  if (ref === undefined) return tree.length;
  let nodes = 0;
  for (let i = 0; i < tree.length; i++) if (ref[i] === -1) nodes++;
  return nodes;
}

/** The edge a slot stands for, "parent id \0 child id"; null for a top-level node (or the root). */
function edgeKey(tree: Tree, s: number): string | null {
  const p = tree.parent[s];
  if (p < 0 || (p === 0 && tree.syntheticRoot)) return null;
  return `${tree.ids!.get(p)}\u0000${tree.ids!.get(s)}`;
}

function edgesOf(tree: Tree): Edges {
  const edges: Edges = new Map();
  for (let s = 1; s < tree.length; s++) {
    const key = edgeKey(tree, s);
    if (key !== null && !edges.has(key)) edges.set(key, s);
  }
  return edges;
}
