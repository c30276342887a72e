import { bytesCompare, isEmptyName, NamePool, type Names, sameName } from "../model/names.js";
import type { Tree } from "../model/tree.js";
import { wellFormedUtf8 } from "../model/well-formed-utf8.js";
import { pairFullEntries } from "./full-entries.js";
import { elementReadings, isSequence, pairElements } from "./pair-elements.js";

/** How the nodes of two versions correspond. Roots always correspond to each other. */
export interface Matching {
  /** "id" when both versions link rows by id, else "path". */
  readonly by: "id" | "path";
  /** The new node matching each old node, or -1 (the old node was removed). */
  readonly oldToNew: Int32Array;
  /** The old node matching each new node, or -1 (the new node was added). */
  readonly newToOld: Int32Array;
  /**
   * True when every matched pair's parents are each other's counterparts, as matching by path pairs
   * them (only children of matched parents): then no node but the root can be moved or renamed. False
   * when a package's dependencies were paired between its full entries in two npm listings
   * (full-entries.ts): they are moved.
   */
  readonly parentsKept?: boolean;
}

/**
 * The old nodes a matching left without a counterpart (the removed nodes), as the matcher knows them:
 * how many, and, matched by id, ranges of old nodes (start, end, start, end, ... ascending) outside of
 * which every old node has one; null when they may lie anywhere. A later stage then need not read
 * every old node to find them.
 */
export interface UnmatchedOld {
  readonly count: number;
  readonly ranges: readonly number[] | null;
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
  return matchTreesListing(oldTree, oldCount, newTree, newCount, room).matching;
}

/** {@link matchTrees}, and the old nodes it left unmatched ({@link UnmatchedOld}). */
export function matchTreesListing(
  oldTree: Tree,
  oldCount: Int32Array,
  newTree: Tree,
  newCount: Int32Array,
  room = 0,
): { matching: Matching; unmatched: UnmatchedOld } {
  if (oldTree.ids && newTree.ids) {
    // Every entry is written by the walk (a pair, or -1 for a row it leaves), so none is filled first.
    const oldToNew = numbers(oldTree.length, room);
    const newToOld = numbers(newTree.length, room);
    const unmatched = matchById(oldTree.ids, oldCount, newTree.ids, newCount, oldToNew, newToOld);
    return { matching: { by: "id", oldToNew, newToOld }, unmatched };
  }
  const oldToNew = numbers(oldTree.length, room).fill(-1);
  const newToOld = numbers(newTree.length, room).fill(-1);
  oldToNew[0] = 0;
  newToOld[0] = 0;
  const { pairs, parentsKept } = matchByPath(oldTree, oldCount, newTree, newCount, oldToNew, newToOld);
  return {
    matching: { by: "path", oldToNew, newToOld, parentsKept },
    unmatched: { count: oldTree.length - 1 - pairs, ranges: null },
  };
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
 * Writes every entry of both arrays (memory of any contents); returns the old rows left unmatched.
 */
function matchById(
  oldIds: Names,
  oldCount: Int32Array,
  newIds: Names,
  newCount: Int32Array,
  oldToNew: Int32Array,
  newToOld: Int32Array,
): UnmatchedOld {
  oldToNew[0] = 0;
  newToOld[0] = 0;
  const left = pairInPlace(oldIds, oldCount, newIds, newCount, oldToNew, newToOld);
  const oldLeft = unpaired(oldToNew, left.old);
  unpaired(newToOld, left.new);
  const byId = unpairedIds(oldIds, left.old);
  const pairs = byId.size > 0 ? pairByMap(byId, newIds, left.new, oldToNew, newToOld) : 0;
  return { count: oldLeft - pairs, ranges: left.old };
}

/** Marks the rows of `ranges` (see {@link pairInPlace}) unpaired (-1) in `toOther`; returns how many. */
function unpaired(toOther: Int32Array, ranges: number[]): number {
  let rows = 0;
  for (let r = 0; r < ranges.length; r += 2) {
    toOther.fill(-1, ranges[r], ranges[r + 1]);
    rows += ranges[r + 1] - ranges[r];
  }
  return rows;
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
  const sameOldNew = sameIds(oldIds, newIds);
  const sameNewOld = sameIds(newIds, oldIds);
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
    if (isEmptyName(newIds, n) || !sameOldNew(o, n)) {
      const skipOld = ahead(oldCount, o, sameOldNew, isEmptyName(newIds, n) ? -1 : n);
      if (skipOld > 0) {
        leave(oldLeft, o, skipOld);
        o = skipOld;
        continue;
      }
      const skipNew = ahead(newCount, n, sameNewOld, isEmptyName(oldIds, o) ? -1 : o);
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

/**
 * New rows the walk left unpaired (`left`: ranges), paired with the unpaired old row of their id;
 * returns how many pairs it made.
 */
function pairByMap(
  byId: Map<string, number>,
  newIds: Names,
  left: number[],
  oldToNew: Int32Array,
  newToOld: Int32Array,
): number {
  let pairs = 0;
  for (let r = 0; r < left.length; r += 2) {
    for (let k = left[r]; k < left[r + 1]; k++) {
      if (isEmptyName(newIds, k)) continue;
      const m = byId.get(newIds.get(k));
      if (m === undefined || oldToNew[m] !== -1) continue;
      oldToNew[m] = k;
      newToOld[k] = m;
      pairs++;
    }
  }
  return pairs;
}

/**
 * A position just past a few whole subtrees, or one node, from `at` (in a version of `count.length`
 * rows) whose id is id `j` of the other version by `same`; else 0, and always for `j` -1 (an empty id).
 */
function ahead(count: Int32Array, at: number, same: (i: number, j: number) => boolean, j: number): number {
  if (j < 0) return 0;
  const length = count.length;
  if (at + 1 < length && same(at + 1, j)) return at + 1;
  let p = at;
  for (let k = 0; k < 4; k++) {
    p += count[p];
    if (p >= length) return 0;
    if (same(p, j)) return p;
  }
  return 0;
}

/**
 * Whether id i of `a` and id j of `b` are the same id, as the walk of {@link pairInPlace} asks. Both
 * pools of bytes: by equal bytes alone (`bytesCompare`). Ids whose bytes differ yet decode alike (bytes
 * that are not UTF-8) are then left to {@link pairByMap}, which pairs them by text: ids are unique in
 * a version, so the same pairs come out, and the walk's loop calls nothing that decodes (a smaller loop
 * that the engine compiles sooner, docs/performance.md, twelfth session). Otherwise `sameName`.
 */
function sameIds(a: Names, b: Names): (i: number, j: number) => boolean {
  const equalBytes = bytesCompare(a, b);
  if (pooledBytes(a) && pooledBytes(b)) return equalBytes;
  return (i, j) => equalBytes(i, j) || sameName(a, i, b, j);
}

/**
 * Top-down in the new tree's pre-order: a node's parent is matched (or not) before the node. Children
 * are paired position by position while their names' bytes are equal; from the first pair that differs,
 * the k-th remaining old child of a name pairs with the k-th remaining new child of it ({@link pairByName},
 * names decoded; a few children of well-formed names by their bytes, {@link pairInOrder}). Stopping at bytes that differ but decode alike pairs the same nodes as going on would:
 * from there both lists hold those names at the same positions, so their k-th occurrences are paired
 * alike either way. Names that are not all pooled bytes (a tree put under a new root, names kept as
 * strings) are compared by sameName in the first pass too, as their bytes cannot be. Then, in two npm
 * listings, a package's dependencies pair between its full entries ({@link pairFullEntries}). Returns
 * how many pairs it made below the roots, and whether every pair's parents are each other's.
 */
function matchByPath(
  oldTree: Tree,
  oldCount: Int32Array,
  newTree: Tree,
  newCount: Int32Array,
  oldToNew: Int32Array,
  newToOld: Int32Array,
): { pairs: number; parentsKept: boolean } {
  const oldName = oldTree.name;
  const newName = newTree.name;
  const equalBytes = bytesCompare(oldName, newName);
  const pooled = pooledBytes(oldName) && pooledBytes(newName);
  const same = pooled
    ? equalBytes
    : (i: number, j: number) => equalBytes(i, j) || sameName(oldName, i, newName, j);
  // Names as bytes, for pairing few children by them (pairInOrder); null when some name is no bytes.
  const byBytes = pooled
    ? { equalBytes, old: (oldName as NamePool).byteRuns()!, new: (newName as NamePool).byteRuns()! }
    : null;
  const elements = elementReadings(oldTree, oldCount, newTree, newCount);
  const below = (from: number, to: number): number =>
    pairDown(same, byBytes, elements, oldName, oldCount, newName, newCount, oldToNew, newToOld, from, to);
  const pairs = below(0, newTree.length);
  // A package's dependencies, listed under its full entry only, pair wherever that entry stands.
  const moved = pairFullEntries(oldTree, oldCount, newTree, newCount, oldToNew, newToOld);
  return { pairs: pairs + moved, parentsKept: moved === 0 };
}

/**
 * The loop of {@link matchByPath} over new nodes `from` to `to` (a whole subtree's, or every node), in
 * pre-order: the children of each matched node with children on both sides are paired. Returns how many
 * pairs it made.
 */
function pairDown(
  same: (i: number, j: number) => boolean,
  byBytes: NameBytes | null,
  elements: ReturnType<typeof elementReadings>,
  oldName: Names,
  oldCount: Int32Array,
  newName: Names,
  newCount: Int32Array,
  oldToNew: Int32Array,
  newToOld: Int32Array,
  from: number,
  to: number,
): number {
  let pairs = 0;
  for (let n = from; n < to; n++) {
    const o = newToOld[n];
    if (o < 0) {
      n += newCount[n] - 1; // nothing under an unmatched node can match by path
      continue;
    }
    if (newCount[n] > 1 && oldCount[o] > 1)
      pairs +=
        elements !== null && isSequence(elements.old, o) && isSequence(elements.new, n)
          ? pairElements(elements.old, o, elements.new, n, oldToNew, newToOld)
          : pairChildren(same, byBytes, oldName, oldCount, o, newName, newCount, n, oldToNew, newToOld);
  }
  return pairs;
}

/** Both versions' names as bytes (NamePool.byteRuns), and whether two are equal bytes. */
interface NameBytes {
  equalBytes: (i: number, j: number) => boolean;
  old: ByteRuns;
  new: ByteRuns;
}

type ByteRuns = NonNullable<ReturnType<NamePool["byteRuns"]>>;

/**
 * The children of matched old node o and new node n: position by position while `same` holds, then by
 * name ({@link pairByName}). A function of its own, called once a node with children on both sides: the
 * loop over every node stays small, and the engine makes a small loop fast soon. Returns how many pairs.
 */
function pairChildren(
  same: (i: number, j: number) => boolean,
  byBytes: NameBytes | null,
  oldName: Names,
  oldCount: Int32Array,
  o: number,
  newName: Names,
  newCount: Int32Array,
  n: number,
  oldToNew: Int32Array,
  newToOld: Int32Array,
): number {
  const oEnd = o + oldCount[o];
  const nEnd = n + newCount[n];
  let oc = o + 1;
  let nc = n + 1;
  let pairs = 0;
  while (oc < oEnd && nc < nEnd && same(oc, nc)) {
    oldToNew[oc] = nc;
    newToOld[nc] = oc;
    oc += oldCount[oc];
    nc += newCount[nc];
    pairs++;
  }
  if (oc < oEnd && nc < nEnd)
    pairs +=
      byBytes !== null &&
      fewWellFormed(byBytes.old, oldCount, oc, oEnd) &&
      fewWellFormed(byBytes.new, newCount, nc, nEnd)
        ? pairInOrder(byBytes, oldCount, oc, oEnd, newCount, nc, nEnd, oldToNew, newToOld)
        : pairByName(oldName, oldCount, oc, oEnd, newName, newCount, nc, nEnd, oldToNew, newToOld);
  return pairs;
}

/**
 * Children at most {@link pairInOrder} pairs (on each side): it compares each new child with the old
 * ones still unpaired, up to this many squared comparisons of names' lengths and bytes, where
 * {@link pairByName} decodes every name once into a map. A bound chosen, not tuned: the bench's 1M
 * JSON pair has about 9 old and 9 new children a call (5,509 calls; docs/performance.md, fourteenth
 * session).
 */
const FEW_CHILDREN = 32;

/**
 * Whether the children from `c` to `end` (of one parent) are at most {@link FEW_CHILDREN}, with names of
 * well-formed UTF-8: bytes that differ then decode differently, so equal bytes are equal names.
 */
function fewWellFormed(names: ByteRuns, count: Int32Array, c: number, end: number): boolean {
  const { bytes, start, size } = names;
  let children = 0;
  for (; c < end; c += count[c]) {
    if (++children > FEW_CHILDREN || !wellFormedUtf8(bytes, start[c], start[c] + size[c])) return false;
  }
  return true;
}

/**
 * {@link pairByName} for few children of well-formed names (see {@link fewWellFormed}), by their bytes:
 * each new child, in order, pairs with the first old child of its name not yet paired, which is the
 * k-th old child of the name for the k-th new one. Nothing decoded, no map made (their strings and
 * maps were most of what the collector had to do in a diff's own stage). Returns how many pairs.
 */
function pairInOrder(
  byBytes: NameBytes,
  oldCount: Int32Array,
  oc: number,
  oEnd: number,
  newCount: Int32Array,
  nc: number,
  nEnd: number,
  oldToNew: Int32Array,
  newToOld: Int32Array,
): number {
  const { equalBytes } = byBytes;
  const oldSize = byBytes.old.size;
  const newSize = byBytes.new.size;
  let pairs = 0;
  // The first old child not yet paired: those before it all are.
  let first = oc;
  for (let c = nc; c < nEnd; c += newCount[c]) {
    while (first < oEnd && oldToNew[first] !== -1) first += oldCount[first];
    const length = newSize[c];
    for (let m = first; m < oEnd; m += oldCount[m]) {
      // Equal bytes (equalBytes: never two empty names, which are equal names too).
      if (oldToNew[m] !== -1 || oldSize[m] !== length || (length > 0 && !equalBytes(m, c))) continue;
      oldToNew[m] = c;
      newToOld[c] = m;
      pairs++;
      break;
    }
  }
  return pairs;
}

/** Whether every name is bytes in a pool, which bytesCompare compares. */
function pooledBytes(names: Names): boolean {
  return names instanceof NamePool && names.byteRuns() !== null;
}

/**
 * The old children from `oc` to `oEnd` and the new ones from `nc` to `nEnd` (of matched parents): the
 * k-th old child of a name pairs with the k-th new child of it. Returns how many pairs.
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
): number {
  const waiting = new Map<string, { next: number; list: number[] }>();
  for (let c = oc; c < oEnd; c += oldCount[c]) {
    const name = oldName.get(c);
    const queue = waiting.get(name);
    if (queue) queue.list.push(c);
    else waiting.set(name, { next: 0, list: [c] });
  }
  let pairs = 0;
  for (let c = nc; c < nEnd; c += newCount[c]) {
    const queue = waiting.get(newName.get(c));
    if (!queue || queue.next === queue.list.length) continue;
    const m = queue.list[queue.next++];
    oldToNew[m] = c;
    newToOld[c] = m;
    pairs++;
  }
  return pairs;
}
