import { quoted, say } from "../errors.js";
import type { Names } from "../model/names.js";
import type { ReadingNote } from "../model/reading-note.js";
import type { Tree } from "../model/tree.js";

// Two path lists of one folder can name it differently: `find proj` (every path starts with proj/),
// `find /srv/proj` (with /srv/proj/), `find proj -printf '%P'` (without it, the folder an empty path or
// nothing). Compared as read, every node of one is removed and every node of the other added. A list
// whose root stands for the listed folder (its root is synthetic, an empty path's or `.`: see
// `TreeReading.rootIsStart`) tells where the other list's folder is: the first node on the other's
// chain from its root (each one the only child of the one above) whose children are the first list's
// top-level names.

/**
 * The two path lists of a diff with the same root: when exactly one stands for its folder, the other is
 * read from the node on its root's chain that holds the same top-level names (its root itself for
 * `find proj`; `/srv/proj` for `find /srv/proj`, the folders above it left out), with a ROOT_IS_FOLDER
 * note; as they are otherwise (and when the other's root is itself one of those names).
 */
export function alignListings(
  [oldTree, newTree]: readonly [Tree, Tree],
  [oldFile, newFile]: readonly [string, string],
): [Tree, Tree] {
  if (oldTree.reading?.shape !== "paths" || newTree.reading?.shape !== "paths") return [oldTree, newTree];
  const oldStart = standsForFolder(oldTree);
  const newStart = standsForFolder(newTree);
  if (!oldStart && !newStart) return fromListedStarts([oldTree, newTree], [oldFile, newFile]);
  if (oldStart === newStart) return [oldTree, newTree];
  const [folder, other, folderRole, folderFile] = oldStart
    ? ([oldTree, newTree, "OLD", oldFile] as const)
    : ([newTree, oldTree, "NEW", newFile] as const);
  const start = startIn(other, topNames(folder));
  if (start === -1) return [oldTree, newTree];
  const moved = fromNode(other, start, folderRole, folderFile);
  // Both versions know the folder's path as the naming list writes it, so a focus copied from that
  // list (`/srv/harbour-ops/berths`) names the node whichever version is printed (focus/resolve.ts).
  const folderPath = pathOfChain(other, start);
  const paired: [Tree, Tree] = oldStart ? [oldTree, moved] : [moved, newTree];
  return [withFolderPath(paired[0], folderPath), withFolderPath(paired[1], folderPath)];
}

/**
 * Two lists that each name their folder, at other paths (`find harbour-ops` and `find
 * /srv/harbour-ops`, or `find /home/ci/harbour-ops`): each read from its start (see {@link startOf}),
 * when the two starts hold mostly the same names; as they are otherwise. Compared as read, the two
 * roots' chains part above the folder (`/srv` against `/home`, or `harbour-ops` against `/`), and every
 * node of one is removed and every node of the other added.
 */
function fromListedStarts(
  [oldTree, newTree]: readonly [Tree, Tree],
  [oldFile, newFile]: readonly [string, string],
): [Tree, Tree] {
  const oldStart = startOf(oldTree);
  const newStart = startOf(newTree);
  const [oldK, newK] = [oldStart.node, newStart.node];
  if (oldK === 0 && newK === 0) return [oldTree, newTree];
  const oldPath = pathOfChain(oldTree, oldK);
  const newPath = pathOfChain(newTree, newK);
  if (oldPath === newPath || !sharesNames(childNames(oldTree, oldK), childNames(newTree, newK))) {
    return [oldTree, newTree];
  }
  // A start only the paths imply is the deepest folder they share: `find proj -type f` against a list
  // of proj/lib/… after everything moved into lib. Those are two readings of one folder only where
  // neither path leads into the other.
  const implied = !oldStart.listed || !newStart.listed;
  if (implied && (leadsInto(oldTree, oldK, newTree, newK) || leadsInto(newTree, newK, oldTree, oldK))) {
    return [oldTree, newTree];
  }
  const older = oldK === 0 ? oldTree : fromNode(oldTree, oldK, "NEW", newFile, newPath);
  const newer = newK === 0 ? newTree : fromNode(newTree, newK, "OLD", oldFile, oldPath);
  // A focus may be copied from either list; the printed tree is NEW's, so NEW's path where it has one.
  const folderPath = newK > 0 ? newPath : oldPath;
  return [withFolderPath(older, folderPath), withFolderPath(newer, folderPath)];
}

/**
 * Where a list that names its folder starts: the first node of its root chain that a line names (the
 * folders above it are only the front of every path), else, for a list without folder lines (`find
 * DIR -type f`), the chain's last node, the deepest folder every path goes through.
 */
function startOf(tree: Tree): { node: number; listed: boolean } {
  let k = 0;
  for (; k < tree.length; k++) {
    if (namedByALine(tree, k)) return { node: k, listed: true };
    if (!onlyChild(tree, k)) break;
  }
  return { node: k, listed: false };
}

/** Whether chain node `a` of `one` is chain node `b` of `other` or above it: the same names from the root. */
function leadsInto(one: Tree, a: number, other: Tree, b: number): boolean {
  if (a > b) return false;
  for (let i = 0; i <= a; i++) if (one.name.get(i) !== other.name.get(i)) return false;
  return true;
}

/**
 * Whether node `k` was named by a line of its own, not only made as the front of a longer path. The
 * line that made a folder made its first child too, and so on down to the node that line names, whose
 * origin it stays (one line names one node; a folder listed later, as du lists it after its contents,
 * takes that later line): in pre-order those first children are k + 1, k + 2, … So a folder made by a
 * path below it shares its origin with one of them; a folder named by its own line shares it with none.
 */
function namedByALine(tree: Tree, k: number): boolean {
  for (let i = k + 1; i < tree.length && tree.parent[i] === i - 1; i++) {
    if (tree.origin[i] === tree.origin[k]) return false;
  }
  return true;
}

/** Whether node `k`'s first child, k + 1, is its only one. */
function onlyChild(tree: Tree, k: number): boolean {
  for (let i = k + 2; i < tree.length && tree.depth[i] > tree.depth[k]; i++)
    if (tree.parent[i] === k) return false;
  return true;
}

/** Whether two folders' children are mostly the same names (at least one, and half of the fewer). */
function sharesNames(a: ReadonlySet<string>, b: ReadonlySet<string>): boolean {
  let shared = 0;
  for (const name of a) if (b.has(name)) shared++;
  return shared > 0 && 2 * shared >= Math.min(a.size, b.size);
}

/** Nodes 0 to k of the root chain as a listing writes their path (`/srv/harbour-ops`, `harbour-ops`). */
function pathOfChain(tree: Tree, k: number): string {
  const path: string[] = [];
  for (let i = 0; i <= k; i++) path.push(tree.name.get(i));
  return path[0] === "/" ? `/${path.slice(1).join("/")}` : path.join("/");
}

function withFolderPath(tree: Tree, folderPath: string): Tree {
  const reading = tree.reading;
  return reading === undefined ? tree : { ...tree, reading: { ...reading, folderPath } };
}

function standsForFolder(tree: Tree): boolean {
  return tree.syntheticRoot || tree.reading?.rootIsStart === true;
}

/** The names of the root's children. */
function topNames(tree: Tree): Set<string> {
  return childNames(tree, 0);
}

/** The names of node `k`'s children. */
function childNames(tree: Tree, k: number): Set<string> {
  const names = new Set<string>();
  for (let i = k + 1; i < tree.length && tree.depth[i] > tree.depth[k]; i++) {
    if (tree.parent[i] === k) names.add(tree.name.get(i));
  }
  return names;
}

/**
 * The node of `tree`'s root chain whose children are mostly `names` (at least one, and at least half of
 * the fewer of the two), or -1: none is, or the root's own name is one of `names` (the root is then a
 * folder inside the other list's, as a list of one top folder beside a list of several). In pre-order
 * the chain is nodes 0, 1, 2, … while each has one child.
 */
function startIn(tree: Tree, names: ReadonlySet<string>): number {
  if (names.size === 0 || names.has(tree.name.get(0))) return -1;
  for (let k = 0; k < tree.length; k++) {
    let children = 0;
    let shared = 0;
    for (let i = k + 1; i < tree.length && tree.depth[i] > tree.depth[k]; i++) {
      if (tree.parent[i] !== k) continue;
      children++;
      if (names.has(tree.name.get(i))) shared++;
    }
    if (shared > 0 && 2 * shared >= Math.min(children, names.size)) return k;
    // Only the one child of a chain node can be the next on the chain.
    if (children !== 1) return -1;
  }
  return -1;
}

/**
 * `tree` from node `k` of its root chain down: the nodes above it left out (in pre-order they are 0 to
 * k - 1, and every other node is below k), k the root standing for the listed folder; with a note.
 * `otherPath`: the other list names its folder too, at that path, so k keeps its name as a root (a
 * folder renamed between the versions is `renamed`, as the roots of `find a` and `find b` are).
 */
function fromNode(
  tree: Tree,
  k: number,
  folderRole: "OLD" | "NEW",
  folderFile: string,
  otherPath?: string,
): Tree {
  const reading = tree.reading;
  const shown = pathOfChain(tree, k);
  const above = say`the ${k} ${k === 1 ? "folder" : "folders"} above it ${k === 1 ? "is" : "are"} left out`;
  const note: ReadingNote = {
    code: "ROOT_IS_FOLDER",
    count: k,
    ...(tree.origin[k] > 0 ? { line: tree.origin[k] } : {}),
    parts:
      otherPath !== undefined
        ? [
            ...say`read from ${quoted.path(shown)} down, compared with ${quoted.path(otherPath)}, the folder ${folderRole} (${folderFile}) lists, which holds mostly the same names; `,
            ...above,
          ]
        : k === 0
          ? say`its top folder ${quoted.path(shown)} is compared as the root of ${folderRole} (${folderFile}), which lists that folder's contents without its name`
          : [
              ...say`read from ${quoted.path(shown)} down, compared as the root of ${folderRole} (${folderFile}), which lists that folder's contents without its path; `,
              ...above,
            ],
  };
  const base = { ...(reading ?? { shape: "paths" as const, sizeUnit: "bytes" as const }) };
  const notes = [...(base.notes ?? []), note];
  const start = otherPath === undefined ? { rootIsStart: true } : {};
  if (k === 0) return { ...tree, reading: { ...base, ...start, notes } };
  const n = tree.length - k;
  const parent = new Int32Array(n);
  const depth = new Int32Array(n);
  parent[0] = -1;
  for (let i = 1; i < n; i++) {
    parent[i] = tree.parent[i + k] - k;
    depth[i] = tree.depth[i + k] - tree.depth[k];
  }
  const fields = new Map<string, string[]>();
  for (const [key, values] of tree.fields) fields.set(key, values.slice(k));
  return {
    length: n,
    parent,
    depth,
    name: new NamesFrom(k, tree.name),
    ownSize: tree.ownSize.slice(k),
    hasSizes: tree.hasSizes,
    ids: tree.ids === null ? null : new NamesFrom(k, tree.ids),
    origin: tree.origin.slice(k),
    originIsRow: tree.originIsRow,
    fields,
    syntheticRoot: false,
    reading: { ...base, ...start, notes },
    ...(tree.empty ? { empty: tree.empty.slice(k) } : {}),
  };
}

/** The names of `rest` from index `k` on. */
class NamesFrom implements Names {
  constructor(
    private readonly k: number,
    private readonly rest: Names,
  ) {}

  get length(): number {
    return this.rest.length - this.k;
  }

  get(i: number): string {
    return this.rest.get(i + this.k);
  }
}
