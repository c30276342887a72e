import { EspalierError, quoted, say } from "../../errors.js";
import type { ReadingNote } from "../../model/reading-note.js";

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

/** How {@link folderTotals} read a listing's folder lines, and the note it has when it read them as own sizes that look like totals. */
export interface FolderReading {
  readonly totals: boolean;
  readonly note?: ReadingNote;
}

/**
 * Reads folder lines' sizes as totals when `mode` says so, or, without a mode, when the listing looks
 * as `du -ab` prints it (see {@link readsAsTotals} and {@link looksLikeDu}): each listed folder's own
 * size becomes its line's size minus what its contents add up to, so no byte is counted twice. A
 * listing whose sizes pass the test of totals in an order that does not settle it is read as own
 * sizes with a SIZES_LIKE_TOTALS note.
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
): FolderReading {
  if (mode === "own") return OWN;
  // No line named a folder that holds entries (a listing of files only, as an object store's): no
  // folder line to read as a total, and nothing to sum; unless the sizes are du -s DIR/*'s 1 KiB blocks
  // (a look at the first sizes, mostly: the first that is no multiple of 4 ends it).
  if (mode === undefined && order.contentAfterListing === 0 && order.listedAfterContents === 0) {
    if (inBlocks(nodes) && !wholeBlocks(nodes) && smallBlocks(nodes)) throw blockCounts("flat");
    if (smallUnits(nodes)) throw wholeUnits();
    return OWN;
  }
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
    // Only a listed node has a size above 0; a node of size 0 stands for its contents unless listed.
    const own = ownSize[i];
    contents[p] += own > 0 || contents[i] === 0 || nodes.isListed(i) ? own : contents[i];
    parents[p] = 1;
  }
  if (mode === undefined) {
    const duOrder = order.contentAfterListing === 0 && order.listedAfterContents > 0;
    if (!readsAsTotals(nodes, contents, parents)) {
      if (duOrder && roundedUp(nodes, contents, parents)) throw roundedBlocks();
      return ownUnlessBlocks(nodes, parents);
    }
    // du's own order (every folder after its contents), or du's lines sorted biggest first (`du -ab |
    // sort -rn` puts every total before its contents): totals. Any other order (`sort -k2` by path,
    // as find lists) is one a listing of own sizes has too, so the sizes must settle it.
    const sorted = order.listedAfterContents === 0 && biggestFirst(nodes);
    if (!duOrder && !sorted) {
      const seen = looksLikeDu(nodes, contents, parents);
      if (seen === "own") return ownUnlessBlocks(nodes, parents);
      if (seen === "unsure") return { totals: false, note: likeTotalsNote(nodes, contents, parents) };
    }
    if (inBlocks(nodes) && !foldersOfBytes(nodes, contents, parents)) throw blockCounts("totals");
    if (foldersOfUnits(nodes, contents, parents)) throw roundedBlocks();
  }
  for (let i = 0; i < length; i++) {
    if (parents[i] === 0 || !nodes.isListed(i)) continue;
    if (ownSize[i] < contents[i]) throw smallerThanContents(nodes, i, contents[i]);
    ownSize[i] -= contents[i];
  }
  return TOTALS;
}

const OWN: FolderReading = { totals: false };
const TOTALS: FolderReading = { totals: true };

/**
 * The unit a directory's size is a whole number of on the file systems that give it in blocks: ext4
 * gives a multiple of its block size (4096 here, seen with stat; 1,024 and up by its design, from
 * memory), and 512 bytes is the smallest block a Linux file system uses (from memory). tmpfs gives
 * 40 bytes and 20 per entry (seen with stat here), no multiple of it.
 */
const DIRECTORY_BLOCK = 512;

/**
 * Whether a listing whose folder lines all pass the size test of {@link readsAsTotals}, in an order
 * that both du and find lists in (each folder before its contents, as `sort -k2` puts du's lines, or
 * mixed, as `sort` by text does), gives totals: a folder's line is its directory's size in a listing
 * of own sizes (`find -printf '%s\t%p\n'`), its directory's size plus its contents in du's. Where
 * directories take whole blocks, the folders' lines are all such a size and their own parts (line
 * less contents) not, or the other way round: `own`, or `totals`. Otherwise `totals` from
 * {@link SORTED_EVIDENCE} listed lines on (a find listing passes the size test only where every folder
 * holds less than its entry, a tree of a few tiny files), else `unsure`. Measured on every folder below
 * /usr/share, /etc and two node_modules here (3,810, ext4), listed both ways: no find listing read as
 * totals, 3,794 du listings read as totals and 12 unsure; on a copy of /usr/share/doc and perl5 in
 * tmpfs, no find listing as totals, 703 of du's 871 unsure (one folder of a few files).
 */
function looksLikeDu(
  nodes: PlacedSizes,
  contents: Float64Array,
  parents: Uint8Array,
): "own" | "totals" | "unsure" {
  let linesWhole = true;
  let ownWhole = true;
  for (let i = 0; i < nodes.length; i++) {
    if (parents[i] === 0 || !nodes.isListed(i) || contents[i] === 0) continue;
    const size = nodes.ownSize[i];
    if (size % DIRECTORY_BLOCK !== 0) linesWhole = false;
    // du gives a folder's own part as its directory's size: above 0 (4096 on ext4, 40 and up on tmpfs, seen here).
    const own = size - contents[i];
    if (own === 0 || own % DIRECTORY_BLOCK !== 0) ownWhole = false;
  }
  if (ownWhole && !linesWhole) return "totals";
  if (linesWhole && !ownWhole) return "own";
  let listed = 0;
  for (let i = 0; i < nodes.length && listed < SORTED_EVIDENCE; i++) if (nodes.isListed(i)) listed++;
  return listed >= SORTED_EVIDENCE ? "totals" : "unsure";
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

/**
 * OWN, or PARSE_PATHS where a listing read as own sizes gives disk blocks, as `find -printf '%k\t%p\n'`
 * (1 KiB blocks) and `'%b\t%p\n'` (512-byte blocks) print each entry's: at least {@link BLOCK_EVIDENCE}
 * sizes above 0, all multiples of 4 ({@link inBlocks}), not all whole {@link DIRECTORY_BLOCK}s (a
 * listing of directories' own bytes is), and every listed folder that holds a listed entry under
 * {@link FOLDER_BYTES}: a directory takes 4 KiB blocks (4 or 8) where `find -printf '%s'` gives its 4,096
 * bytes and up on ext4. Measured here on every folder below /usr/share, /usr/lib, /etc, /usr/include and
 * this project's node_modules, each listed by find: no `%s` listing of the 14,234 with 8 sizes above 0
 * refused (69 of them were all multiples of 4: fonts, executables, icons), 6,195 of the 6,198 `%k`
 * listings refused.
 */
function ownUnlessBlocks(nodes: PlacedSizes, parents: Uint8Array): FolderReading {
  // The folders first: a listing in bytes has one of 4,096 near its start, which ends the test.
  let folders = 0;
  for (let i = 0; i < nodes.length; i++) {
    if (parents[i] === 0 || !nodes.isListed(i)) continue;
    if (nodes.ownSize[i] >= FOLDER_BYTES) return OWN;
    folders++;
  }
  if (folders === 0 || !inBlocks(nodes) || wholeBlocks(nodes)) return OWN;
  throw new EspalierError(
    "PARSE_PATHS",
    "every size is a multiple of 4 and every folder's line under 1,024, as find -printf '%k' (1 KiB blocks) and '%b' (512-byte blocks) print each entry's disk usage, where a folder's own bytes are 4,096 and up: read as bytes, each size would be 512 to 1,024 times too small. List bytes with find DIR -printf '%s\\t%p\\n', or pass --folder-sizes own to read the numbers as bytes (--units plain prints them as plain numbers)",
    { line: 1, column: 1 },
  );
}

/**
 * PARSE_PATHS for du's 1 KiB blocks: a listing of `totals` (`du -a`), or a `flat` one, no listed entry
 * inside another (`du -s DIR/*`, each entry's disk usage once).
 */
function blockCounts(listing: "totals" | "flat"): EspalierError {
  const message =
    listing === "totals"
      ? "every size is a multiple of 4 and each folder's line totals its contents, as du without -b prints disk usage in 1 KiB blocks: read as bytes, each size would be 1,024 times too small. List bytes with du -ab, or pass --folder-sizes total (and --units plain) to read the numbers as they are"
      : "every size is a multiple of 4 and no listed entry is inside another, as du -s DIR/* prints each entry's disk usage in 1 KiB blocks: read as bytes, each size would be 1,024 times too small. List bytes with du -sb DIR/* (or du -ab DIR, with what each folder holds), or pass --folder-sizes own to read the numbers as bytes (--units plain prints them as plain numbers)";
  return new EspalierError("PARSE_PATHS", message, { line: 1, column: 1 });
}

/** The largest size {@link smallBlocks} counts as small: an entry of up to 256 KiB in `du -s DIR/*`. */
const SMALL_BLOCKS = 256;

/**
 * Whether a listing with no entry inside another whose sizes are all multiples of 4 has a quarter of
 * them or more at most {@link SMALL_BLOCKS}, as `du -s DIR/*` gives most entries' disk usage in 1 KiB
 * blocks (4 to 256 for an entry of up to 256 KiB), where bytes that are all multiples of 4 (shared
 * objects, fonts, LLVM bitcode, folders' 4,096) are mostly bigger. Measured here on the 3,012 folders
 * of 8 entries or more of {@link smallUnits}' measure: listed as du -sb DIR/* lists them, 59 were all
 * multiples of 4 and refused before, none now; listed as du -s DIR/* (du -ak, grouped by folder),
 * 2,979 of the 2,990 refused before still are (the others read as bytes, with the note on a list of
 * one folder's entries that says its unit shows nowhere).
 */
function smallBlocks(nodes: PlacedSizes): boolean {
  let sized = 0;
  let small = 0;
  const { ownSize } = nodes;
  for (let i = 0; i < nodes.length; i++) {
    const size = ownSize[i];
    if (size === 0) continue;
    sized++;
    if (size <= SMALL_BLOCKS) small++;
  }
  return small * 4 >= sized;
}

/** The largest size {@link smallUnits} counts as small: an entry of up to 4 KiB in `du -s --apparent-size`. */
const SMALL_UNITS = 4;

/**
 * Whether a listing with no entry inside another gives whole units of a KiB or more, rounded up, as
 * `du -s --apparent-size DIR/*` (KiB; GNU du rounds each entry's bytes up, seen here: its size is
 * du -sb's divided by 1,024 and rounded up), `du -sm DIR/*` and `du -s --block-size=1M` print each
 * entry: at least {@link BLOCK_EVIDENCE} sizes above 0, a quarter of them or more at most
 * {@link SMALL_UNITS} (each entry of up to 4 KiB, or 4 MiB), and those not all one size above 1. In
 * bytes such sizes are links and files of a word, mostly one length (/usr/lib/git-core: 169 links of
 * 3 bytes to "git"). Measured here on the 3,012 folders of 8 entries or more below /usr/share,
 * /usr/lib, /usr/local, /usr/bin, /usr/sbin, /usr/libexec, /usr/include, /usr/src, /etc, /var, /opt
 * and this project's node_modules, each one's entries listed as du -sb DIR/* lists them: none
 * refused; listed in KiB, 2,246 refused (818 by the rule of a quarter exactly 1 this replaced), in
 * MiB 3,010. Of the 5,189 such folders' files and links alone (find DIR ! -type d -printf '%s\t%p\n'),
 * one refused, as by that rule (a test folder of 1-byte files: --folder-sizes own reads it).
 */
function smallUnits(nodes: PlacedSizes): boolean {
  // Only a listed node has a size above 0; a size of 0 (a link, an empty file) says nothing of the unit.
  let sized = 0;
  let small = 0;
  let least = Number.POSITIVE_INFINITY;
  let most = 0;
  const { ownSize } = nodes;
  for (let i = 0; i < nodes.length; i++) {
    const size = ownSize[i];
    if (size === 0) continue;
    sized++;
    if (size > SMALL_UNITS) continue;
    small++;
    least = Math.min(least, size);
    most = Math.max(most, size);
  }
  return sized >= BLOCK_EVIDENCE && small * 4 >= sized && (least === 1 || least !== most);
}

/** PARSE_PATHS for du -s DIR/* in KiB or bigger units, as {@link smallUnits} reads a listing. */
function wholeUnits(): EspalierError {
  return new EspalierError(
    "PARSE_PATHS",
    "a quarter or more of the sizes are 1 to 4 and no listed entry is inside another, as du -s --apparent-size DIR/* prints each entry's size in whole KiB and du -sm DIR/* its disk usage in whole MiB, rounded up: read as bytes, each size would be a thousand or a million times too small. List bytes with du -sb DIR/* (or du -s --apparent-size -B1 DIR/*, or du -ab DIR, with what each folder holds), or pass --folder-sizes own to read the numbers as bytes (--units plain prints them as plain numbers)",
    { line: 1, column: 1 },
  );
}

/**
 * Whether every listed size is a whole number of {@link DIRECTORY_BLOCK}s, as a listing of directories'
 * own sizes is (`find DIR -maxdepth 1 -type d -printf '%s\t%p\n'`): no sign of du's 1 KiB blocks then.
 */
function wholeBlocks(nodes: PlacedSizes): boolean {
  for (let i = 0; i < nodes.length; i++)
    if (nodes.isListed(i) && nodes.ownSize[i] % DIRECTORY_BLOCK !== 0) return false;
  return true;
}

/**
 * Whether a listing in du's order (every folder after its contents) whose folders are not all at least
 * their contents gives totals rounded up to blocks bigger than a byte, as `du -m`, `du -BM` and
 * `du --apparent-size` in 1 KiB print (each entry's usage rounded up, so a folder can be less than its
 * rounded contents add up to): at least {@link SORTED_EVIDENCE} lines, and every listed folder is at
 * least each of its listed entries (a total is), and some folder's size is no whole number of
 * {@link DIRECTORY_BLOCK}s (a `find -depth` listing of own sizes, each folder its directory's blocks
 * after its files, passes the second test only where its files are all smaller than it).
 */
function roundedUp(nodes: PlacedSizes, contents: Float64Array, parents: Uint8Array): boolean {
  const { length, parentOf, ownSize } = nodes;
  let listed = 0;
  let notWhole = false;
  for (let i = 0; i < length; i++) {
    if (!nodes.isListed(i)) continue;
    listed++;
    if (parents[i] === 1 && contents[i] > 0 && ownSize[i] % DIRECTORY_BLOCK !== 0) notWhole = true;
    // The nearest listed folder above: a total is at least each entry under it.
    let p = parentOf[i];
    while (p !== -1 && !nodes.isListed(p)) p = parentOf[p];
    if (p !== -1 && ownSize[p] < ownSize[i]) return false;
  }
  return notWhole && listed >= SORTED_EVIDENCE;
}

/** A folder's own part (its line less its contents) at most which, in every folder, a listing of totals is in units of 1 KiB or more. */
const UNIT_OWN_PART = 4;

/**
 * Whether a listing read as totals gives them in units bigger than a byte, as `du -a --apparent-size`
 * (1 KiB, rounded up) and `du -am` print them: every listed folder with contents has an own part (its
 * line less its contents) of at most {@link UNIT_OWN_PART}, at least {@link SORTED_EVIDENCE} lines listed.
 * In bytes a folder's own part is its directory's size (`du -ab`): 4,096 and up on ext4, 40 and up on
 * tmpfs (seen here); in KiB it is the directory's 4 KiB less what rounding each entry up added.
 */
function foldersOfUnits(nodes: PlacedSizes, contents: Float64Array, parents: Uint8Array): boolean {
  let listed = 0;
  for (let i = 0; i < nodes.length; i++) {
    if (!nodes.isListed(i)) continue;
    listed++;
    if (parents[i] === 1 && nodes.ownSize[i] - contents[i] > UNIT_OWN_PART) return false;
  }
  return listed >= SORTED_EVIDENCE;
}

function roundedBlocks(): EspalierError {
  return new EspalierError(
    "PARSE_PATHS",
    "every folder's line comes after its contents and is at least as big as each of them, as du prints totals, yet some folder is less than its contents add up to, as sizes rounded up to whole blocks bigger than a byte are (du -m, du -BM, du without -b): read as bytes, each size would be too small and the folders' totals counted again. List bytes with du -ab, or pass --folder-sizes own to read each line as the entry's own size in bytes",
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

/**
 * SIZES_LIKE_TOTALS on a path list: every listed folder is at least as big as its contents add up to,
 * as du -ab gives folders, but neither the order nor the sizes settle it, so each line was read as the
 * entry's own size. Names the first such folder with contents of some size.
 */
function likeTotalsNote(nodes: PlacedSizes, contents: Float64Array, parents: Uint8Array): ReadingNote {
  let first = -1;
  let count = 0;
  for (let i = 0; i < nodes.length; i++) {
    if (parents[i] === 0 || !nodes.isListed(i) || contents[i] === 0) continue;
    count++;
    if (first === -1 || nodes.origin[i] < nodes.origin[first]) first = i;
  }
  const line = nodes.origin[first];
  const others = count === 1 ? "" : ` and ${count - 1} more`;
  return {
    code: "SIZES_LIKE_TOTALS",
    count,
    line,
    parts: say`every folder's line is at least what its contents add up to (line ${line}, ${quoted.path(nodes.pathOf(first))}: ${nodes.ownSize[first]}, its contents ${contents[first]}${others}), as du -ab gives a folder with its contents; in this order (folders before their contents) a find listing of a few small files is so too, so each line was read as the entry's own size: --folder-sizes total reads a folder's line as the folder with its contents, --folder-sizes own as its own without this note`,
  };
}
