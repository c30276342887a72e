import type { Tree } from "../model/tree.js";
import { KIND } from "./changes.js";
import type { Matching } from "./match.js";

/**
 * The combined tree's nodes in pre-order: where each comes from (`newIndex`: the node in the new
 * version or -1; `oldIndex`: the node in the old version or -1), its shape (parent, depth, own size;
 * a removed node's own size is 0: it holds nothing now) and its kind of change (see `KIND`), with the
 * changed nodes listed in ascending order.
 */
export interface Spliced {
  newIndex: Int32Array;
  oldIndex: Int32Array;
  parent: Int32Array;
  depth: Int32Array;
  ownSize: Float64Array;
  kind: Uint8Array;
  changed: Int32Array;
}

/** What {@link splice} writes as it lays the nodes out: the arrays, and the changed nodes so far. */
interface Layout extends Spliced {
  changes: number;
}

/**
 * The new version with every removed node at its old place (see `combine`). Its pre-order is the new
 * version's, with each removed node whose old parent is still there (a *top* removed node, under that
 * parent's new counterpart m) put in with the removed nodes below it (old pre-order, past any subtree
 * that is still there: it lives elsewhere now) right after the nearest earlier old sibling that is still
 * a child of m, after that sibling's whole subtree (first among m's children when there is none). So
 * the new nodes between two such places are a run of the new pre-order, copied as one block: where
 * each comes from, the new version's depths (a new node's depth is the same in both trees) and own
 * sizes, and its parents shifted by the removed nodes put in before them. At one place, the removed
 * nodes of a deeper m (a later node in pre-order) come first, and those of one m in old order.
 * The places are found and sorted (O(t log t) for t top removed nodes; the usual input is nearly in
 * order already), so the work over every node is a few copies of runs, not a step per subtree; each
 * new node's kind (`kindOfPair`, see `kindOf`) is found in the same step as its parent, and every
 * removed node's written as it is laid. `removed`: how many old nodes have no counterpart (at least 1);
 * `ranges`: old nodes outside of which none lies (`UnmatchedOld`), when the matcher listed them.
 */
export function splice(
  oldTree: Tree,
  oldCount: Int32Array,
  newTree: Tree,
  newCount: Int32Array,
  matching: Matching,
  removed: number,
  kindOfPair: (n: number, o: number) => number,
  ranges?: readonly number[] | null,
): Spliced {
  const { oldToNew, newToOld } = matching;
  const total = newTree.length + removed;
  const everyOld = [1, oldToNew.length];
  const places = topRemoved(oldTree, oldCount, newTree, newCount, oldToNew, removed, ranges ?? everyOld);
  const order = inPlaceOrder(places);
  // The changed list is made as long as the tree (memory no one writes costs nothing) so that it never
  // grows in a loop, and copied to its length at the end.
  const out: Layout = {
    newIndex: new Int32Array(total),
    oldIndex: new Int32Array(total),
    parent: new Int32Array(total),
    depth: new Int32Array(total),
    ownSize: new Float64Array(total),
    kind: new Uint8Array(total),
    changed: new Int32Array(total),
    changes: 0,
  };
  const runs = new Runs(places.count + 1);
  // Scratch for the removed nodes' parents while one group is laid out (a path from its top node).
  const pathOld = new Int32Array(removed);
  const pathAt = new Int32Array(removed);
  let shift = 0;
  let from = 0;
  for (let e = 0; e < order.length; ) {
    const point = places.point[order[e]];
    copyRun(out, newTree, newToOld, kindOfPair, runs, from, point, shift);
    let k = point + shift;
    for (; e < order.length && places.point[order[e]] === point; e++) {
      const i = order[e];
      const m = places.under[i];
      k = layGroup(out, oldTree, oldCount, oldToNew, places.top[i], k, m + runs.shiftAt(m), pathOld, pathAt);
    }
    shift = k - point;
    from = point;
  }
  copyRun(out, newTree, newToOld, kindOfPair, runs, from, newTree.length, shift);
  const { newIndex, oldIndex, parent, depth, ownSize, kind, changed, changes } = out;
  return { newIndex, oldIndex, parent, depth, ownSize, kind, changed: changed.slice(0, changes) };
}

/** Top removed nodes (see {@link splice}), each with its place: before new node `point` (or at the end). */
interface Places {
  count: number;
  /** The top removed old node. */
  top: Int32Array;
  /** The new node (its old parent's counterpart) it goes under. */
  under: Int32Array;
  /** The new node it goes before, in the new pre-order (the new version's length: at the end). */
  point: Int32Array;
}

/**
 * The top removed nodes and their places, in old order under each new parent: the old children of each
 * old node that lost some are read once, in order, keeping the last one whose counterpart is a child of
 * that node's counterpart (the anchor). The removed nodes are looked for in `ranges` of old nodes
 * (start, end, ... ascending; see `UnmatchedOld`).
 */
function topRemoved(
  oldTree: Tree,
  oldCount: Int32Array,
  newTree: Tree,
  newCount: Int32Array,
  oldToNew: Int32Array,
  removed: number,
  ranges: readonly number[],
): Places {
  const places: Places = {
    count: 0,
    top: new Int32Array(removed),
    under: new Int32Array(removed),
    point: new Int32Array(removed),
  };
  const oldParent = oldTree.parent;
  // Old parents whose children were read (by their counterpart): each is read once.
  const read = new Uint8Array(newTree.length);
  for (let g = 0; g < ranges.length; g += 2) {
    for (let r = ranges[g]; r < ranges[g + 1]; r++) {
      if (oldToNew[r] >= 0) continue;
      const o = oldParent[r];
      const m = oldToNew[o];
      if (m < 0 || read[m] === 1) continue;
      read[m] = 1;
      placeChildren(places, o, m, oldCount, oldToNew, newTree.parent, newCount);
    }
  }
  return places;
}

/** Appends to `places` the removed old children of o, whose counterpart is m, in old order. */
function placeChildren(
  places: Places,
  o: number,
  m: number,
  oldCount: Int32Array,
  oldToNew: Int32Array,
  newParent: Int32Array,
  newCount: Int32Array,
): void {
  let point = m + 1;
  let t = places.count;
  const end = o + oldCount[o];
  for (let s = o + 1; s < end; s += oldCount[s]) {
    const c = oldToNew[s];
    if (c >= 0) {
      if (newParent[c] === m) point = c + newCount[c];
      continue;
    }
    places.top[t] = s;
    places.under[t] = m;
    places.point[t] = point;
    t++;
  }
  places.count = t;
}

/**
 * The places' indices by point, then the deeper parent first (at one point the parents lie on one path
 * from the root, so the deeper is the later in pre-order), then as listed (old order under one parent).
 * Usually in that order already: checked before sorting.
 */
function inPlaceOrder(places: Places): Int32Array {
  const { count, point, under } = places;
  const order = new Int32Array(count);
  let sorted = true;
  for (let i = 0; i < count; i++) {
    order[i] = i;
    if (i > 0 && (point[i] < point[i - 1] || (point[i] === point[i - 1] && under[i] > under[i - 1])))
      sorted = false;
  }
  if (sorted) return order;
  return Int32Array.from(
    Array.from(order).sort((a, b) => point[a] - point[b] || under[b] - under[a] || a - b),
  );
}

/**
 * The shift of every run of new nodes copied so far (the removed nodes put in before it), by its first
 * node: a new node's place in the combined tree is its own index plus its run's shift.
 */
class Runs {
  private readonly start: Int32Array;
  private readonly shift: Int32Array;
  private length = 0;
  // The last node asked for and its shift: siblings ask for one parent in a row.
  private lastNode = -1;
  private lastShift = 0;

  constructor(capacity: number) {
    this.start = new Int32Array(capacity);
    this.shift = new Int32Array(capacity);
  }

  add(start: number, shift: number): void {
    this.start[this.length] = start;
    this.shift[this.length++] = shift;
  }

  /** The shift of new node `n`, which a run copied before holds. */
  shiftAt(n: number): number {
    if (n === this.lastNode) return this.lastShift;
    let lo = 0;
    let hi = this.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >>> 1;
      if (this.start[mid] <= n) lo = mid;
      else hi = mid - 1;
    }
    this.lastNode = n;
    this.lastShift = this.shift[lo];
    return this.lastShift;
  }
}

/** Blocks shorter than this are copied by a loop; longer ones by the runtime's copy of a range. */
const SHORT_RUN = 64;

/**
 * New nodes [from, to) at their places, `shift` on: where each comes from, parent, depth, own size and
 * kind of change.
 */
function copyRun(
  out: Layout,
  newTree: Tree,
  newToOld: Int32Array,
  kindOfPair: (n: number, o: number) => number,
  runs: Runs,
  from: number,
  to: number,
  shift: number,
): void {
  if (from === to) return;
  runs.add(from, shift);
  const { newIndex, oldIndex, parent, depth, ownSize, kind, changed } = out;
  let changes = out.changes;
  const newParent = newTree.parent;
  if (to - from < SHORT_RUN) {
    for (let j = from; j < to; j++) {
      oldIndex[j + shift] = newToOld[j];
      depth[j + shift] = newTree.depth[j];
      ownSize[j + shift] = newTree.ownSize[j];
    }
  } else {
    oldIndex.set(newToOld.subarray(from, to), from + shift);
    depth.set(newTree.depth.subarray(from, to), from + shift);
    ownSize.set(newTree.ownSize.subarray(from, to), from + shift);
  }
  for (let j = from; j < to; j++) {
    const p = newParent[j];
    const k = j + shift;
    newIndex[k] = j;
    parent[k] = p >= from ? p + shift : p < 0 ? -1 : p + runs.shiftAt(p);
    const c = kindOfPair(j, newToOld[j]);
    if (c === KIND.none) continue;
    kind[k] = c;
    changed[changes++] = k;
  }
  out.changes = changes;
}

/**
 * Top removed node r and the removed nodes below it, in old pre-order past any subtree that is still
 * there, from place k on under the combined node `under`; returns the place after them. Each one's
 * parent was laid before it: the path of laid nodes from r is kept in `pathOld` (old node) and `pathAt`
 * (its place).
 */
function layGroup(
  out: Layout,
  oldTree: Tree,
  oldCount: Int32Array,
  oldToNew: Int32Array,
  r: number,
  at: number,
  under: number,
  pathOld: Int32Array,
  pathAt: Int32Array,
): number {
  const { newIndex, oldIndex, parent, depth, ownSize, kind, changed } = out;
  const oldParent = oldTree.parent;
  let changes = out.changes;
  let k = at;
  let top = -1;
  const end = r + oldCount[r];
  for (let x = r; x < end; ) {
    if (oldToNew[x] >= 0) {
      x += oldCount[x];
      continue;
    }
    let p = under;
    if (x !== r) {
      while (pathOld[top] !== oldParent[x]) top--;
      p = pathAt[top];
    }
    newIndex[k] = -1;
    oldIndex[k] = x;
    parent[k] = p;
    depth[k] = depth[p] + 1;
    ownSize[k] = 0;
    kind[k] = KIND.removed;
    changed[changes++] = k;
    pathOld[++top] = x;
    pathAt[top] = k;
    k++;
    x++;
  }
  out.changes = changes;
  return k;
}
