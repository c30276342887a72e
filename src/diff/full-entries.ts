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
 * DEDUPED_ENTRIES note on one of them). `pairBelow(o, n)` pairs the children of old node o and new
 * node n by path, and everything below them; it returns how many pairs it made, which this returns
 * summed. The k-th such old full entry of a package (in pre-order) pairs with the k-th new one.
 */
export function pairFullEntries(
  oldTree: Tree,
  oldCount: Int32Array,
  newTree: Tree,
  newCount: Int32Array,
  oldToNew: Int32Array,
  newToOld: Int32Array,
  pairBelow: (o: number, n: number) => number,
): number {
  if (!npmListing(oldTree, newTree)) return 0;
  const oldVersion = oldTree.fields.get(VERSION_FIELD)!;
  const newVersion = newTree.fields.get(VERSION_FIELD)!;
  const waiting = new Map<string, number[]>();
  for (let o = 1; o < oldTree.length; o++) {
    if (!orphaned(oldCount, oldToNew, newCount, o)) continue;
    const key = packageKey(oldTree.name.get(o), oldVersion[o]);
    const list = waiting.get(key);
    if (list) list.push(o);
    else waiting.set(key, [o]);
  }
  if (waiting.size === 0) return 0;
  let pairs = 0;
  for (let n = 1; n < newTree.length; n++) {
    if (!orphaned(newCount, newToOld, oldCount, n)) continue;
    const list = waiting.get(packageKey(newTree.name.get(n), newVersion[n]));
    if (!list) continue;
    // An earlier pair may have paired this one's dependencies already (a full entry below another).
    while (list.length > 0 && !orphaned(oldCount, oldToNew, newCount, list[0])) list.shift();
    const o = list.shift();
    if (o !== undefined) pairs += pairBelow(o, n);
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
