import { bytesCompare, isEmptyName, NamePool, type Names, sameName } from "../model/names.js";
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
  const left = pairInPlace(oldIds, oldCount, newIds, newCount, oldToNew, newToOld);
  const byId = unpairedIds(oldIds, left.old);
  if (byId.size > 0) pairByMap(byId, newIds, left.new, oldToNew, newToOld);
}

/**
 * The side-by-side walk of {@link matchById}. Returns the rows it left unpaired on each side, as ranges
 * in ascending order (start, end, start, end, ...): the later passes read those, not every row.
 */
function pairInPlace(
  oldIds: Names,
  oldCount: Int32Array,
  newIds: Names,
  newCount: Int32Array,
  oldToNew: Int32Array,
  newToOld: Int32Array,
): { old: number[]; new: number[] } {
  const nOld = oldIds.length;
  const nNew = newIds.length;
  const equalBytes = bytesCompare(oldIds, newIds);
  const oldLeft: number[] = [];
  const newLeft: number[] = [];
  let o = 1;
  let n = 1;
  while (o < nOld && n < nNew) {
    // Rows whose ids have equal bytes, paired by a run of their own: most rows are in such runs.
    const run = equalRun(equalBytes, o, n, Math.min(nOld - o, nNew - n));
    if (run > 0) {
      pairRun(oldToNew, newToOld, o, n, run);
      o += run;
      n += run;
      continue;
    }
    if (isEmptyName(newIds, n) || !sameName(oldIds, o, newIds, n)) {
      const skipOld = ahead(oldIds, oldCount, o, newIds, n);
      if (skipOld > 0) {
        leave(oldLeft, o, skipOld);
        o = skipOld;
        continue;
      }
      const skipNew = ahead(newIds, newCount, n, oldIds, o);
      if (skipNew > 0) {
        leave(newLeft, n, skipNew);
        n = skipNew;
        continue;
      }
      leave(oldLeft, o, o + 1);
      leave(newLeft, n, n + 1);
    } else {
      oldToNew[o] = n;
      newToOld[n] = o;
    }
    o++;
    n++;
  }
  if (o < nOld) leave(oldLeft, o, nOld);
  if (n < nNew) leave(newLeft, n, nNew);
  return { old: oldLeft, new: newLeft };
}

/**
 * How many of the next `limit` row pairs from (o, n) have ids of equal bytes. A small function of its
 * own, as {@link pairRun}: the engine makes a small loop fast soon, where the walk's loop, with all it
 * calls, takes long to compile and runs slowly meanwhile.
 */
function equalRun(
  equalBytes: (i: number, j: number) => boolean,
  o: number,
  n: number,
  limit: number,
): number {
  let k = 0;
  while (k < limit && equalBytes(o + k, n + k)) k++;
  return k;
}

/** Pairs old rows [o, o + length) with new rows [n, n + length), in order. */
function pairRun(oldToNew: Int32Array, newToOld: Int32Array, o: number, n: number, length: number): void {
  for (let k = 0; k < length; k++) {
    oldToNew[o + k] = n + k;
    newToOld[n + k] = o + k;
  }
}

/** Adds rows [from, to) to ranges kept as in {@link pairInPlace}, joined to the last when they touch. */
function leave(ranges: number[], from: number, to: number): void {
  if (ranges.length > 0 && ranges[ranges.length - 1] === from) ranges[ranges.length - 1] = to;
  else ranges.push(from, to);
}

/**
 * Old rows the walk left unpaired (`left`: ranges, see {@link pairInPlace}), by id (the first row of an
 * id), as {@link matchById} looks them up.
 */
function unpairedIds(oldIds: Names, left: number[]): Map<string, number> {
  const byId = new Map<string, number>();
  for (let r = 0; r < left.length; r += 2) {
    for (let k = left[r]; k < left[r + 1]; k++) {
      if (isEmptyName(oldIds, k)) continue;
      const key = oldIds.get(k);
      if (!byId.has(key)) byId.set(key, k);
    }
  }
  return byId;
}

/** New rows the walk left unpaired (`left`: ranges), paired with the unpaired old row of their id. */
function pairByMap(
  byId: Map<string, number>,
  newIds: Names,
  left: number[],
  oldToNew: Int32Array,
  newToOld: Int32Array,
): void {
  for (let r = 0; r < left.length; r += 2) {
    for (let k = left[r]; k < left[r + 1]; k++) {
      if (isEmptyName(newIds, k)) continue;
      const m = byId.get(newIds.get(k));
      if (m === undefined || oldToNew[m] !== -1) continue;
      oldToNew[m] = k;
      newToOld[k] = m;
    }
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

/**
 * Top-down in the new tree's pre-order: a node's parent is matched (or not) before the node. Children
 * are paired position by position while their names' bytes are equal; from the first pair that differs,
 * the k-th remaining old child of a name pairs with the k-th remaining new child of it ({@link pairByName},
 * names decoded). Stopping at bytes that differ but decode alike pairs the same nodes as going on would:
 * from there both lists hold those names at the same positions, so their k-th occurrences are paired
 * alike either way. Names that are not all pooled bytes (a tree put under a new root, names kept as
 * strings) are compared by sameName in the first pass too, as their bytes cannot be.
 */
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
  const same =
    pooledBytes(oldName) && pooledBytes(newName)
      ? equalBytes
      : (i: number, j: number) => equalBytes(i, j) || sameName(oldName, i, newName, j);
  for (let n = 0; n < newTree.length; n++) {
    const o = newToOld[n];
    if (o < 0) {
      n += newCount[n] - 1; // nothing under an unmatched node can match by path
      continue;
    }
    if (newCount[n] > 1 && oldCount[o] > 1)
      pairChildren(same, oldName, oldCount, o, newName, newCount, n, oldToNew, newToOld);
  }
}

/**
 * The children of matched old node o and new node n: position by position while `same` holds, then by
 * name ({@link pairByName}). A function of its own, called once a node with children on both sides: the
 * loop over every node stays small, and the engine makes a small loop fast soon.
 */
function pairChildren(
  same: (i: number, j: number) => boolean,
  oldName: Names,
  oldCount: Int32Array,
  o: number,
  newName: Names,
  newCount: Int32Array,
  n: number,
  oldToNew: Int32Array,
  newToOld: Int32Array,
): void {
  const oEnd = o + oldCount[o];
  const nEnd = n + newCount[n];
  let oc = o + 1;
  let nc = n + 1;
  while (oc < oEnd && nc < nEnd && same(oc, nc)) {
    oldToNew[oc] = nc;
    newToOld[nc] = oc;
    oc += oldCount[oc];
    nc += newCount[nc];
  }
  if (oc < oEnd && nc < nEnd)
    pairByName(oldName, oldCount, oc, oEnd, newName, newCount, nc, nEnd, oldToNew, newToOld);
}

/** Whether every name is bytes in a pool, which bytesCompare compares. */
function pooledBytes(names: Names): boolean {
  return names instanceof NamePool && names.byteRuns() !== null;
}

/**
 * The old children from `oc` to `oEnd` and the new ones from `nc` to `nEnd` (of matched parents): the
 * k-th old child of a name pairs with the k-th new child of it.
 */
function pairByName(
  oldName: Names,
  oldCount: Int32Array,
  oc: number,
  oEnd: number,
  newName: Names,
  newCount: Int32Array,
  nc: number,
  nEnd: number,
  oldToNew: Int32Array,
  newToOld: Int32Array,
): void {
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
