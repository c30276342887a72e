import type { Tree } from "../../model/tree.js";
import { oneFolderEntries } from "./one-folder-entries.js";

/**
 * Why a path list read with sizes in bytes shows its unit nowhere: `entries`, it lists one folder's
 * entries (or an inventory's) and nothing else ({@link oneFolderEntries}); `short`, it has fewer than
 * {@link UNIT_EVIDENCE} sizes above 0, too few for the tests of folder-totals.ts that tell du's and
 * find's KiB and blocks from bytes (`du -s --apparent-size a b c`, `du -a` of a folder of three files,
 * each 1,024 times too small read as bytes). `count`: the entries, or the sizes above 0.
 */
export interface UnitNotShown {
  readonly why: "entries" | "short";
  readonly count: number;
}

/** The sizes above 0 from which folder-totals.ts tells KiB and blocks from bytes (its BLOCK_EVIDENCE and SORTED_EVIDENCE). */
export const UNIT_EVIDENCE = 8;

/**
 * A directory's own bytes at least which, in a listed folder, show that a path list gives bytes: `du
 * -ab` gives a folder's own part (its line less its contents) and `find -printf '%s'` its line as its
 * directory's size, 4,096 and up on ext4 (seen with du -ab and stat here), where in KiB or blocks
 * (`du -a`, `du -a --apparent-size`, `find -printf '%k'`) it is 4 or 8 for a folder of a few entries,
 * and 1,024 would take a directory of a MiB. The same bound as folder-totals.ts's FOLDER_BYTES.
 */
const FOLDER_BYTES = 1024;

/**
 * The size `du -sb` gives an empty folder on ext4, one block (seen here); in KiB (`du -s
 * --apparent-size`) it would be an entry of 4,193,281 to 4,194,304 bytes.
 */
const EMPTY_FOLDER = 4096;

/** Empty folders' sizes from which a list of one folder's entries shows bytes. */
const EMPTY_FOLDERS = 2;

/**
 * Whether, and why, the sizes of `tree` (a path list read as bytes) show no unit; undefined when they
 * show bytes. Any list shows bytes when a folder's own size (after its contents', for totals) is at
 * least {@link FOLDER_BYTES}. A list of one folder's entries, the folder not listed, shows bytes when
 * {@link EMPTY_FOLDERS} of them are {@link EMPTY_FOLDER} exactly, as empty folders are in `du -sb
 * DIR/*` on ext4; in KiB that takes two entries of exactly 4 MiB (to the KiB). Measured here on the
 * 3,067 folders of 8 entries or more below /usr/share, /usr/lib, /usr/local, /usr/bin, /usr/sbin,
 * /usr/libexec, /usr/include, /usr/src, /etc, /var, /opt and this project's node_modules: of their
 * `du -sb DIR/*` lists, 48 show bytes so (all had the note before); of the 796 `du -s --apparent-size
 * DIR/*` lists read as bytes, none. Any other list of one folder's entries, as a list of a folder's
 * files, in KiB, looks as one in bytes of files 1,024 times smaller. Any other list shows bytes from
 * {@link UNIT_EVIDENCE} sizes above 0 on, where folder-totals.ts has judged them.
 */
export function unitNotShown(tree: Tree): UnitNotShown | undefined {
  const { length, ownSize, parent } = tree;
  // A folder (a node some other node is under) whose own size is a directory's bytes.
  for (let i = 0; i < length; i++) {
    const p = parent[i];
    if (p !== -1 && ownSize[p] >= FOLDER_BYTES) return undefined;
  }
  const entries = oneFolderEntries(tree);
  if (entries > 0 && !folderListed(tree)) {
    let empty = 0;
    for (let i = 0; i < length && empty < EMPTY_FOLDERS; i++) if (ownSize[i] === EMPTY_FOLDER) empty++;
    return empty >= EMPTY_FOLDERS ? undefined : { why: "entries", count: entries };
  }
  let sized = 0;
  for (let i = 0; i < length && sized < UNIT_EVIDENCE; i++) if (ownSize[i] > 0) sized++;
  if (sized >= UNIT_EVIDENCE || sized === 0) return undefined;
  return folderListed(tree) || leavesLevel(tree) || wholeWords(tree)
    ? { why: "short", count: sized }
    : undefined;
}

/**
 * Whether every leaf is at one depth, as `du -s --apparent-size A/* B/*` lists the entries of two folders
 * (each a folder's or a file's size in KiB, none inside another).
 */
function leavesLevel(tree: Tree): boolean {
  const { length, parent, depth } = tree;
  const inner = new Uint8Array(length);
  for (let i = 0; i < length; i++) if (parent[i] !== -1) inner[parent[i]] = 1;
  let level = -1;
  for (let i = 0; i < length; i++) {
    if (inner[i] === 1) continue;
    if (level === -1) level = depth[i];
    else if (depth[i] !== level) return false;
  }
  return true;
}

/**
 * Whether every size above 0 is a multiple of 4, as 1 KiB blocks of a file system of 4 KiB blocks
 * are (`find -type f -printf '%k\t%p\n'`, `du -s`); bytes are so by chance, one in 4 each.
 */
function wholeWords(tree: Tree): boolean {
  const { length, ownSize } = tree;
  for (let i = 0; i < length; i++) if (ownSize[i] % 4 !== 0) return false;
  return true;
}

/** Whether a node with children has a size of its own: a line listed the folder (`du -a DIR`). */
function folderListed(tree: Tree): boolean {
  const { length, ownSize, parent } = tree;
  for (let i = 0; i < length; i++) if (parent[i] !== -1 && ownSize[parent[i]] > 0) return true;
  return false;
}
