import { EspalierError, quoted, say } from "../../errors.js";

/**
 * How a path list's sizes count a folder: `own`, the folder's line gives the folder alone (`find -printf
 * '%s\t%p\n'` prints a directory's own size); `total`, the folder with everything under it (`du -ab`
 * prints that, each folder after its contents). Absent: decided by the listing (see {@link readsAsTotals}).
 */
export type FolderSizes = "own" | "total";

/** The nodes of a placed path list, as {@link folderTotals} reads and changes them. */
export interface PlacedSizes {
  readonly length: number;
  readonly parentOf: Int32Array;
  /** Each node's size as its line gave it (0 for a node only made as an ancestor); changed in place. */
  readonly ownSize: Float64Array;
  /** The line that named each listed node. */
  readonly origin: Int32Array;
  /** Whether a line named the node (not only made as an ancestor of a path). */
  isListed(node: number): boolean;
  /** The node's path, for messages. */
  pathOf(node: number): string;
}

/**
 * Reads folder lines' sizes as totals when `mode` says so, or, without a mode, when the listing looks
 * as `du -ab` prints it (see {@link readsAsTotals}): each listed folder's own size becomes its line's
 * size minus what its contents add up to, so no byte is counted twice. Returns whether it did.
 *
 * `order` counts, from PathPlacer, the paths that added a node below a folder already listed (a listing
 * that puts each folder after its contents has none) and the folders listed after some of their
 * contents (a listing of files only has none). `root` is the node an empty
 * path named (-1 when none), the only node whose index may exceed its children's; every other parent
 * was made before its children.
 *
 * `mode` `total` on a folder whose line is smaller than its contents is BAD_SIZE at that line.
 */
export function folderTotals(
  nodes: PlacedSizes,
  root: number,
  order: { contentAfterListing: number; listedAfterContents: number },
  mode: FolderSizes | undefined,
): boolean {
  if (mode === "own") return false;
  // Folders before their contents, or no folder listed at all (a list of files): own sizes, and no pass;
  // unless the lines are sorted biggest first (`du -ab DIR | sort -rn`), which puts every total before
  // its contents.
  if (
    mode === undefined &&
    (order.contentAfterListing > 0 || order.listedAfterContents === 0) &&
    !(order.listedAfterContents === 0 && biggestFirst(nodes))
  )
    return false;
  const { length, parentOf, ownSize } = nodes;
  // What each node's contents add up to: a listed node stands for its line's size, an unlisted one
  // (an ancestor no line named) for its contents. Children have higher indices than their parents,
  // but the root an empty path named may come last, so it is summed after the rest.
  const contents = new Float64Array(length);
  const parents = new Uint8Array(length);
  for (let i = length - 1; i >= 0; i--) {
    if (i === root) continue;
    const p = parentOf[i];
    if (p === -1) continue;
    contents[p] += nodes.isListed(i) ? ownSize[i] : contents[i];
    parents[p] = 1;
  }
  if (mode === undefined && !readsAsTotals(nodes, contents, parents)) return false;
  if (mode === undefined && inBlocks(nodes) && !foldersOfBytes(nodes, contents, parents)) throw blockCounts();
  for (let i = 0; i < length; i++) {
    if (parents[i] === 0 || !nodes.isListed(i)) continue;
    if (ownSize[i] < contents[i]) throw smallerThanContents(nodes, i, contents[i]);
    ownSize[i] -= contents[i];
  }
  return true;
}

/**
 * Lines a listing sorted biggest first must have before it may read as folder totals: a `find` listing
 * (each folder first) of a few small files can be in that order by chance, its folder's entry bigger
 * than what it holds (`1 a`, `1 a/b`); eight sizes fall in order by chance once in 8! (40,320).
 */
const SORTED_EVIDENCE = 8;

/**
 * Whether the listed entries, no folder listed after any of its contents (so in the order of their
 * lines), never grow from one line to the next, as `sort -rn` orders a `du -ab` listing (every folder
 * then comes before its contents): at least {@link SORTED_EVIDENCE} of them. A `find` listing so sorted
 * puts its folders' few KiB among the files, and the test of {@link readsAsTotals} tells it apart.
 */
function biggestFirst(nodes: PlacedSizes): boolean {
  let line = 0;
  let size = Number.POSITIVE_INFINITY;
  let seen = 0;
  for (let i = 0; i < nodes.length; i++) {
    if (!nodes.isListed(i)) continue;
    if (nodes.origin[i] <= line || nodes.ownSize[i] > size) return false;
    line = nodes.origin[i];
    size = nodes.ownSize[i];
    seen++;
  }
  return seen >= SORTED_EVIDENCE;
}

/**
 * Whether a listing with every folder after its contents gives folders' totals: at least one listed
 * folder has contents of some size, and no listed folder is smaller than its contents. A listing of
 * own sizes fails the second test on any folder holding more bytes than its own entry (a directory
 * entry is a few KiB), so only a listing whose folders are all bigger than their contents, and listed
 * after them (`find -depth` of tiny files), is read the other way: `--folder-sizes own` says otherwise.
 */
function readsAsTotals(nodes: PlacedSizes, contents: Float64Array, parents: Uint8Array): boolean {
  let sized = false;
  for (let i = 0; i < nodes.length; i++) {
    if (parents[i] === 0 || !nodes.isListed(i)) continue;
    if (nodes.ownSize[i] < contents[i]) return false;
    if (contents[i] > 0) sized = true;
  }
  return sized;
}

/**
 * Listed sizes that must all be multiples of 4 before a listing reads as du's 1 KiB blocks: byte sizes
 * are so by chance once in 4^8 (65,536) listings, and a byte listing must also have a folder whose own
 * part is under 1 KiB to be refused (see foldersOfBytes). It was 16: `du -a` of a folder of 14 files
 * read as bytes, 1,024 times too small, with exit 0.
 */
const BLOCK_EVIDENCE = 8;

/**
 * Whether a listing of folder totals gives 1 KiB blocks, as `du -a` prints disk usage without `-b`
 * (GNU coreutils: `--block-size` defaults to 1024), rather than bytes: on a file system of 4 KiB
 * blocks every size is then a multiple of 4. At least {@link BLOCK_EVIDENCE} sizes above 0 must be,
 * all of them: apparent byte sizes are so only by chance (one in 4 each).
 */
function inBlocks(nodes: PlacedSizes): boolean {
  let seen = 0;
  for (let i = 0; i < nodes.length; i++) {
    if (!nodes.isListed(i)) continue;
    const size = nodes.ownSize[i];
    if (size === 0) continue;
    if (size % 4 !== 0) return false;
    seen++;
  }
  return seen >= BLOCK_EVIDENCE;
}

/** A folder's own part (its line less its contents) from which a listing of multiples of 4 is bytes. */
const FOLDER_BYTES = 1024;

/**
 * Whether a listing whose sizes are all multiples of 4 still gives bytes: every listed folder's own part
 * (its line less its contents) is at least {@link FOLDER_BYTES}. `du -ab` prints a folder's own part as
 * its directory's apparent size, 4096 bytes and up on ext4 (a directory is at least one block; seen with
 * du -ab here); `du -a` in 1 KiB blocks prints it as the directory's blocks, 4 for a folder of a few
 * entries, and 1,024 would take a directory of 1 MiB, so no block listing has every folder that big.
 * A block listing with one huge folder is still refused, since a small one shows too; a byte listing
 * whose folders are small (other file systems) is refused as before, with the way out said.
 */
function foldersOfBytes(nodes: PlacedSizes, contents: Float64Array, parents: Uint8Array): boolean {
  for (let i = 0; i < nodes.length; i++) {
    if (parents[i] === 0 || !nodes.isListed(i)) continue;
    if (nodes.ownSize[i] - contents[i] < FOLDER_BYTES) return false;
  }
  return true;
}

function blockCounts(): EspalierError {
  return new EspalierError(
    "PARSE_PATHS",
    "every size is a multiple of 4 and each folder's line totals its contents, as du without -b prints disk usage in 1 KiB blocks: read as bytes, each size would be 1,024 times too small. List bytes with du -ab, or pass --folder-sizes total (and --units plain) to read the numbers as they are",
    { line: 1, column: 1 },
  );
}

function smallerThanContents(nodes: PlacedSizes, node: number, contents: number): EspalierError {
  const line = nodes.origin[node];
  return new EspalierError(
    "BAD_SIZE",
    say`line ${line} gives the folder ${quoted.path(nodes.pathOf(node))} the size ${nodes.ownSize[node]}, less than the ${contents} its contents add up to; with --folder-sizes total a folder's size includes its contents (--folder-sizes own reads each line's size as its own)`,
    { line, column: 1 },
  );
}
