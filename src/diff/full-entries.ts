import { NPM_CHILDREN_FIELD, VERSION_FIELD } from "../load/deduped-entries.js";
import type { Tree } from "../model/tree.js";

/**
 * Pairs the dependencies of a package's full entry in one version of `npm ls --all --json` with those
 * of its full entry in the other, wherever each stands. npm lists a package's dependencies once, under
 * its first entry, and every other entry of it is deduped (`{"version": …}`, see
 * load/deduped-entries.ts); adding a direct dependency on a package already installed makes the new
 * top-level entry the full one and the old place a deduped one. Matched by path alone, the old full
 * entry's dependencies were removed and the new one's added, though nothing was installed or removed:
 * a package's dependencies belong to the package (its name and version), not to the place it is
 * listed. So a full entry whose dependencies went unmatched in one version (it was removed, or matched
 * to a deduped entry) pairs them with those of the other version's full entry of the same name and
 * version whose dependencies went unmatched too; they are then moved from the old full entry.
 *
 * Only for two listings read as npm's (node objects under `dependencies`, with a `version`, and a
 * DEDUPED_ENTRIES note on one of them). Each such old full entry of a package (shallower first, then
 * in pre-order) pairs with the first new one still with a dependency unpaired that lists as many
 * entries below it, else with the first one still so, and the dependencies pair by path below them,
 * those paired already left out. Returns how many pairs it made.
 */
export function pairFullEntries(
  oldTree: Tree,
  oldCount: Int32Array,
  newTree: Tree,
  newCount: Int32Array,
  oldToNew: Int32Array,
  newToOld: Int32Array,
): number {
  if (!npmListing(oldTree, newTree)) return 0;
  const oldVersion = oldTree.fields.get(VERSION_FIELD)!;
  const newVersion = newTree.fields.get(VERSION_FIELD)!;
  const oldEntries = outerFirst(oldTree, (o) => orphaned(oldCount, oldToNew, newCount, o));
  if (oldEntries.length === 0) return 0;
  const waiting = new Map<string, number[]>();
  for (const n of outerFirst(newTree, (n) => orphaned(newCount, newToOld, oldCount, n))) {
    const key = packageKey(newTree.name.get(n), newVersion[n]);
    const list = waiting.get(key);
    if (list) list.push(n);
    else waiting.set(key, [n]);
  }
  const oldSide = { tree: oldTree, count: oldCount, toOther: oldToNew };
  const newSide = { tree: newTree, count: newCount, toOther: newToOld };
  let pairs = 0;
  for (const o of oldEntries) {
    const list = waiting.get(packageKey(oldTree.name.get(o), oldVersion[o]));
    // An earlier pair may have paired this entry's dependencies already (a full entry below another).
    if (!list || !unpairedChild(oldSide, o)) continue;
    while (list.length > 0 && !unpairedChild(newSide, list[0])) list.shift();
    if (list.length === 0) continue;
    const [n] = list.splice(alike(list, newSide, oldCount[o]), 1);
    pairs += pairUnpaired(oldSide, o, newSide, n);
  }
  return pairs;
}

/** One version's tree, subtree counts and pairing, as {@link pairFullEntries} reads and writes them. */
interface Side {
  readonly tree: Tree;
  readonly count: Int32Array;
  readonly toOther: Int32Array;
}

/**
 * The nodes of `tree` for which `take` holds, shallower first, then in pre-order: an entry pairs
 * before the full entries listed below it, which then pair along with it, by path.
 */
function outerFirst(tree: Tree, take: (x: number) => boolean): number[] {
  const entries: number[] = [];
  for (let x = 1; x < tree.length; x++) if (take(x)) entries.push(x);
  const depth = tree.depth;
  return entries.sort((a, b) => depth[a] - depth[b] || a - b);
}

/**
 * Of a package's full entries left in `list` (the first of which has a dependency unpaired), the first
 * that lists as many entries below it as the old one (`entries`), else the first: npm installs a
 * package at several places when their dependencies need it so, and each copy's listing differs in
 * which dependencies are in full there and which deduped, so one of as many entries is likely the
 * same copy at another place.
 */
function alike(list: readonly number[], side: Side, entries: number): number {
  for (let k = 0; k < list.length; k++)
    if (side.count[list[k]] === entries && unpairedChild(side, list[k])) return k;
  return 0;
}

/** Whether some child of x is not paired yet. */
function unpairedChild({ count, toOther }: Side, x: number): boolean {
  const end = x + count[x];
  for (let c = x + 1; c < end; c += count[c]) if (toOther[c] === -1) return true;
  return false;
}

/**
 * Pairs the children of old node o and new node n by name, and the children of each pair likewise,
 * down both subtrees, leaving out every node paired already: an earlier pair of full entries may have
 * paired some (a full entry listed below another), and a node is never paired twice. A package's
 * dependencies are the keys of one JSON object, so a name is one child (RFC 8259 §4: names should be
 * unique; a repeated one is read as JSON.parse reads it, the last). Returns how many pairs it made.
 */
function pairUnpaired(oldSide: Side, o: number, newSide: Side, n: number): number {
  const oldName = oldSide.tree.name;
  const newName = newSide.tree.name;
  const { count: oldCount, toOther: oldToNew } = oldSide;
  const { count: newCount, toOther: newToOld } = newSide;
  let pairs = 0;
  const stack = [o, n];
  while (stack.length > 0) {
    const nx = stack.pop()!;
    const ox = stack.pop()!;
    const byName = new Map<string, number>();
    for (let c = ox + 1; c < ox + oldCount[ox]; c += oldCount[c])
      if (oldToNew[c] === -1) byName.set(oldName.get(c), c);
    if (byName.size === 0) continue;
    for (let c = nx + 1; c < nx + newCount[nx]; c += newCount[c]) {
      if (newToOld[c] !== -1) continue;
      const m = byName.get(newName.get(c));
      if (m === undefined) continue;
      byName.delete(newName.get(c));
      oldToNew[m] = c;
      newToOld[c] = m;
      pairs++;
      stack.push(m, c);
    }
  }
  return pairs;
}

/** Whether both versions read as `npm ls --all --json` with deduped entries on one side at least. */
function npmListing(oldTree: Tree, newTree: Tree): boolean {
  const trees = [oldTree, newTree];
  return (
    trees.every(
      (t) =>
        t.reading?.shape === "nodes" &&
        t.reading.childrenField === NPM_CHILDREN_FIELD &&
        t.ids === null &&
        t.fields.has(VERSION_FIELD),
    ) && trees.some((t) => t.reading?.notes?.some((note) => note.code === "DEDUPED_ENTRIES") ?? false)
  );
}

/**
 * Whether node x (of a version whose counts are `count`) is an entry with dependencies none of which was
 * matched: x itself unmatched, or matched to an entry without any (a deduped one). Its first child
 * tells, as a matched parent's children are paired by path, never some of them alone unless names differ.
 */
function orphaned(count: Int32Array, toOther: Int32Array, otherCount: Int32Array, x: number): boolean {
  if (count[x] < 2 || toOther[x + 1] !== -1) return false;
  const other = toOther[x];
  return other < 0 || otherCount[other] === 1;
}

/** A package's name and version as one key (a name holds no NUL in npm's registry; common practice). */
function packageKey(name: string, version: string | undefined): string {
  return `${name}\u0000${version ?? ""}`;
}
