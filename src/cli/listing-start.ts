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
  if (oldStart === standsForFolder(newTree)) return [oldTree, newTree];
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
  const names = new Set<string>();
  for (let i = 1; i < tree.length; i++) if (tree.parent[i] === 0) names.add(tree.name.get(i));
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
 */
function fromNode(tree: Tree, k: number, folderRole: "OLD" | "NEW", folderFile: string): Tree {
  const reading = tree.reading;
  const shown = pathOfChain(tree, k);
  const note: ReadingNote = {
    code: "ROOT_IS_FOLDER",
    count: k,
    ...(tree.origin[k] > 0 ? { line: tree.origin[k] } : {}),
    parts:
      k === 0
        ? say`its top folder ${quoted.path(shown)} is compared as the root of ${folderRole} (${folderFile}), which lists that folder's contents without its name`
        : say`read from ${quoted.path(shown)} down, compared as the root of ${folderRole} (${folderFile}), which lists that folder's contents without its path; the ${k} ${k === 1 ? "folder" : "folders"} above it ${k === 1 ? "is" : "are"} left out`,
  };
  const base = { ...(reading ?? { shape: "paths" as const, sizeUnit: "bytes" as const }) };
  const notes = [...(base.notes ?? []), note];
  if (k === 0) return { ...tree, reading: { ...base, rootIsStart: true, notes } };
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
    reading: { ...base, rootIsStart: true, notes },
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
