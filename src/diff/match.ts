import { bytesCompare, isEmptyName, type Names, sameName } from "../model/names.js";
import type { Tree } from "../model/tree.js";

/** How the nodes of two versions correspond. Roots always correspond to each other. */
export interface Matching {
  /** "id" when both versions link rows by id, else "path". */
  readonly by: "id" | "path";
  /** The new node matching each old node, or -1 (the old node was removed). */
  readonly oldToNew: Int32Array;
  /** The old node matching each new node, or -1 (the new node was added). */
  readonly newToOld: Int32Array;
}

/**
 * Pairs the nodes of two versions: by row id when both versions have ids, otherwise by path. Matching
 * by path pairs the k-th child named X of matched parents on both sides (the `~~k` of printed paths),
 * so a node whose path changed (moved or renamed) is one node removed and another added. `room`: the
 * numbers of memory under each of the two arrays, when more than its length (see {@link numbers}).
 */
export function matchTrees(
  oldTree: Tree,
  oldCount: Int32Array,
  newTree: Tree,
  newCount: Int32Array,
  room = 0,
): Matching {
  const oldToNew = numbers(oldTree.length, room).fill(-1);
  const newToOld = numbers(newTree.length, room).fill(-1);
  oldToNew[0] = 0;
  newToOld[0] = 0;
  if (oldTree.ids && newTree.ids) {
    matchById(oldTree.ids, oldCount, newTree.ids, newCount, oldToNew, newToOld);
    return { by: "id", oldToNew, newToOld };
  }
  matchByPath(oldTree, oldCount, newTree, newCount, oldToNew, newToOld);
  return { by: "path", oldToNew, newToOld };
}

/**
 * `length` numbers over memory of at least `room` numbers: pages past `length` are never touched here,
 * so they cost nothing until a later stage is lent them (see `prepareDiff`).
 */
function numbers(length: number, room: number): Int32Array {
  return new Int32Array(new ArrayBuffer(Math.max(length, room) * 4), 0, length);
}

/**
 * Pairs equal ids. Most rows keep their place between versions, so a first pass walks both pre-orders
 * side by side and pairs equal ids in place, stepping over whole subtrees that were removed, added or
 * moved; only the rows it leaves over go through a hash map. Every pair has equal ids either way.
 * Each pass is a function of its own, with one loop: the engine compiles a loop that runs once while it
 * runs, and a loop followed by more work in the same function is compiled again for that work, the
 * largest part of this stage's processor time at 1M rows (docs/performance.md, eleventh session).
 */
function matchById(
  oldIds: Names,
  oldCount: Int32Array,
  newIds: Names,
  newCount: Int32Array,
  oldToNew: Int32Array,
  newToOld: Int32Array,
) {
  pairInPlace(oldIds, oldCount, newIds, newCount, oldToNew, newToOld);
  const byId = unpairedIds(oldIds, oldToNew);
  if (byId.size > 0) pairByMap(byId, newIds, oldToNew, newToOld);
}

/** The side-by-side walk of {@link matchById}. */
function pairInPlace(
  oldIds: Names,
  oldCount: Int32Array,
  newIds: Names,
  newCount: Int32Array,
  oldToNew: Int32Array,
  newToOld: Int32Array,
): void {
  const nOld = oldIds.length;
  const nNew = newIds.length;
  const equalBytes = bytesCompare(oldIds, newIds);
  let o = 1;
  let n = 1;
  while (o < nOld && n < nNew) {
    if (!equalBytes(o, n) && (isEmptyName(newIds, n) || !sameName(oldIds, o, newIds, n))) {
      const skipOld = ahead(oldIds, oldCount, o, newIds, n);
      if (skipOld > 0) {
        o = skipOld;
        continue;
      }
      const skipNew = ahead(newIds, newCount, n, oldIds, o);
      if (skipNew > 0) {
        n = skipNew;
        continue;
      }
    } else {
      oldToNew[o] = n;
      newToOld[n] = o;
    }
    o++;
    n++;
  }
}

/** Old rows the walk left unpaired, by id (the first row of an id), as {@link matchById} looks them up. */
function unpairedIds(oldIds: Names, oldToNew: Int32Array): Map<string, number> {
  const byId = new Map<string, number>();
  for (let k = 1; k < oldIds.length; k++) {
    if (oldToNew[k] !== -1 || isEmptyName(oldIds, k)) continue;
    const key = oldIds.get(k);
    if (!byId.has(key)) byId.set(key, k);
  }
  return byId;
}

/** New rows the walk left unpaired, paired with the unpaired old row of their id. */
function pairByMap(
  byId: Map<string, number>,
  newIds: Names,
  oldToNew: Int32Array,
  newToOld: Int32Array,
): void {
  for (let k = 1; k < newIds.length; k++) {
    if (newToOld[k] !== -1 || isEmptyName(newIds, k)) continue;
    const m = byId.get(newIds.get(k));
    if (m === undefined || oldToNew[m] !== -1) continue;
    oldToNew[m] = k;
    newToOld[k] = m;
  }
}

/**
 * A position just past a few whole subtrees, or one node, from `at` whose id is id `j` of `other`;
 * else 0.
 */
function ahead(ids: Names, count: Int32Array, at: number, other: Names, j: number): number {
  if (isEmptyName(other, j)) return 0;
  if (at + 1 < ids.length && sameName(ids, at + 1, other, j)) return at + 1;
  let p = at;
  for (let k = 0; k < 4; k++) {
    p += count[p];
    if (p >= ids.length) return 0;
    if (sameName(ids, p, other, j)) return p;
  }
  return 0;
}

/** Top-down in the new tree's pre-order: a node's parent is matched (or not) before the node. */
function matchByPath(
  oldTree: Tree,
  oldCount: Int32Array,
  newTree: Tree,
  newCount: Int32Array,
  oldToNew: Int32Array,
  newToOld: Int32Array,
) {
  const oldName = oldTree.name;
  const newName = newTree.name;
  const equalBytes = bytesCompare(oldName, newName);
  for (let n = 0; n < newTree.length; n++) {
    const o = newToOld[n];
    if (o < 0) {
      n += newCount[n] - 1; // nothing under an unmatched node can match by path
      continue;
    }
    const oEnd = o + oldCount[o];
    const nEnd = n + newCount[n];
    // Usual case: the same names in the same order, paired position by position.
    let oc = o + 1;
    let nc = n + 1;
    while (oc < oEnd && nc < nEnd && (equalBytes(oc, nc) || sameName(oldName, oc, newName, nc))) {
      oldToNew[oc] = nc;
      newToOld[nc] = oc;
      oc += oldCount[oc];
      nc += newCount[nc];
    }
    if (oc >= oEnd || nc >= nEnd) continue;
    // Otherwise the k-th remaining old child of a name pairs with the k-th remaining new child of it.
    const waiting = new Map<string, { next: number; list: number[] }>();
    for (let c = oc; c < oEnd; c += oldCount[c]) {
      const name = oldName.get(c);
      const queue = waiting.get(name);
      if (queue) queue.list.push(c);
      else waiting.set(name, { next: 0, list: [c] });
    }
    for (let c = nc; c < nEnd; c += newCount[c]) {
      const queue = waiting.get(newName.get(c));
      if (!queue || queue.next === queue.list.length) continue;
      const m = queue.list[queue.next++];
      oldToNew[m] = c;
      newToOld[c] = m;
    }
  }
}
