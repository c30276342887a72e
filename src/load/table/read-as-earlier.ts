import type { NamePool } from "../../model/names.js";
import { MAX_SIZE } from "../../model/size-rule.js";
import type { Tree } from "../../model/tree.js";
import { KeptForLater } from "../kept-for-later.js";
import type { LoadOptions } from "../load-options.js";
import { nameFieldNamed, sizeFieldNamed } from "../missing-field.js";
import { otherFields } from "../other-fields.js";
import { type ByteIdIndex, viewOf } from "./byte-id-index.js";
import type { Table, TakenRows } from "./table.js";

/**
 * A table read against an earlier version's kept table (a diff's NEW against its OLD), described as
 * that version with known changes, so that a diff can lay the two out together without linking NEW's
 * rows into a tree of its own (diff/direct-combine.ts). Made only when NEW's rows link without an
 * error, as OLD's did, and keep OLD's order: every row NEW shares with OLD (same id) comes in OLD's row
 * order, and OLD's rows are OLD's pre-order. The parents of the rows not taken whole are OLD rows, or
 * added rows written as `-2 - j` (`j`: the added row's place in `scanned`); -1 for the root's.
 */
export interface ReadAsEarlier {
  /** The earlier version's tree: node i is its data row i. */
  readonly earlier: Tree;
  /** This table's data rows. */
  readonly rows: number;
  /** This table's row of each earlier row (by id), or -1: the earlier row's id is gone (removed). */
  readonly rowOfEarlier: Int32Array;
  /** This table's rows not taken whole, in order. */
  readonly scanned: Int32Array;
  /** The earlier row of each scanned row's id, or -1 (added). */
  readonly scannedEarlier: Int32Array;
  /** The parent of each scanned row: an earlier row, `-2 - j` for scanned row j (added), -1 for none. */
  readonly scannedParent: Int32Array;
  /** How many scanned rows are added. */
  readonly added: number;
  /** This table's names, ids and own sizes (0 where it has no size column), by row. */
  readonly names: NamePool;
  readonly ids: NamePool;
  readonly sizes: Float64Array | null;
}

/** What a later version's reading against an earlier one found, by the later version's tree (taken once). */
export const readsAsEarlier = new KeptForLater<ReadAsEarlier>();

/**
 * `table`, read against the kept table of `earlier` (TakenRows), as that version with known changes;
 * undefined when it is anything but the simple case: options that change how rows link or read (null
 * parents, folder sizes, kept fields, a graph, a part of the input), an earlier tree that is not its
 * rows in order, cells that are not plain (ids not UTF-8, empty names, sizes or parents written as
 * text), or rows that would not link as the earlier ones did (an empty or repeated id, a parent that is
 * gone, a cycle, a second top-level row), or that come in another order than the earlier ones.
 * Then the table is linked the usual way, which gives the same tree, or says what is wrong.
 */
export function readAsEarlier(
  table: Table,
  options: LoadOptions,
  earlierVersion: LoadOptions["earlierVersion"],
): ReadAsEarlier | undefined {
  const taken = table.taken;
  const rowsById = taken?.rowsById;
  // Read once: NEW's tree may hold the table (its arrays made when read), and the index is 8 MiB at 1M rows.
  if (taken !== undefined) taken.rowsById = undefined;
  if (earlierVersion === undefined || taken === undefined || rowsById === undefined) return undefined;
  // The kept table is the one OLD's load kept by its tree: that tree, whole.
  if (!("parent" in earlierVersion) || !("origin" in earlierVersion)) return undefined;
  const earlier = earlierVersion as Tree;
  if (!plainOptions(options) || table.filledRows) return undefined;
  const n = table.length;
  const m = taken.earlierRows;
  if (n > options.maxNodes || n === 0 || earlier.length !== m || earlier.syntheticRoot) return undefined;
  if (earlier.ids === null || !earlier.originIsRow || earlier.parent[0] !== -1) return undefined;
  const columns = table.columnNames();
  // No field kept beside the tree's (one that may be missing and is: none).
  if (otherFields(columns, options) !== undefined) return undefined;
  const optional = options.optionalKeepFields ?? [];
  if (options.keepFields.some((key) => !optional.includes(key) || columns.includes(key))) return undefined;
  const ids = table.pooledColumn?.(options.idField);
  const parents = table.numberColumn?.(options.parentField);
  const names = table.pooledColumn?.(options.nameField);
  const sizeCells = table.numberColumn?.(options.sizeField);
  if (ids === undefined || parents === undefined || names === undefined) return undefined;
  if (ids.length < n || names.length !== n || ids.byteRuns() === null || names.byteRuns() === null)
    return undefined;
  if (sizeCells === undefined && (sizeFieldNamed(options) || columns.includes(options.sizeField)))
    return undefined;
  if (nameFieldNamed(options) && !columns.includes(options.nameField)) return undefined;
  if (table.writtenCells?.(options.idField) || table.writtenCells?.(options.parentField)) return undefined;
  if (!rowsInOrder(earlier.origin, m) || emptyName(names, n)) return undefined;
  const rowOfEarlier = new Int32Array(m);
  const scanned = takeRuns(taken, rowOfEarlier, n);
  if (scanned === null) return undefined;
  const found = pairScanned(scanned, ids, rowsById, rowOfEarlier);
  if (found === null) return undefined;
  const parent = scannedParents(scanned, found, parents, rowsById, rowOfEarlier);
  if (parent === null) return undefined;
  const sizes = sizeCells === undefined ? null : sizeCells.values;
  if (!keepsOrder(taken, scanned, found.earlier)) return undefined;
  if (!linksAsEarlier(earlier, rowOfEarlier, scanned, found.earlier, parent)) return undefined;
  if (sizes !== null && !sizesRead(earlier, scanned, sizes)) return undefined;
  return {
    earlier,
    rows: n,
    rowOfEarlier,
    scanned,
    scannedEarlier: found.earlier,
    scannedParent: parent,
    added: found.added,
    names,
    ids,
    sizes,
  };
}

/** Options under which a table's rows link by id and parent alone, each row a node as it reads. */
function plainOptions(options: LoadOptions): boolean {
  return (
    !options.graph &&
    options.startAt === undefined &&
    (options.folderSizes === undefined || options.folderSizes === "own") &&
    (options.nullParents === undefined || options.nullParents.length === 0) &&
    options.keepForLaterVersion !== true &&
    options.nodeRecords === undefined
  );
}

/** Whether origin k is row k + 1 for every node: the tree is its rows in order. */
function rowsInOrder(origin: Int32Array, m: number): boolean {
  for (let k = 0; k < m; k++) if (origin[k] !== k + 1) return false;
  return true;
}

/** Whether a row's name cell is empty (its node would be named by its id). */
function emptyName(names: NamePool, n: number): boolean {
  const { size } = names.byteRuns()!;
  for (let r = 0; r < n; r++) if (size[r] === 0) return true;
  return false;
}

/**
 * Writes this table's row of each earlier row taken whole into `rowOfEarlier`, and -1 for every other
 * earlier row (each entry once: the runs come in the earlier rows' order too, or the reading is not
 * the simple case); returns the rows not taken (in order), or null when the runs overlap, go past the
 * table or take earlier rows out of their order.
 */
function takeRuns(taken: TakenRows, rowOfEarlier: Int32Array, n: number): Int32Array | null {
  const { runs, count } = taken;
  let scannedRows = n;
  for (let t = 0; t < count; t++) scannedRows -= runs[3 * t + 2];
  if (scannedRows < 0) return null;
  const scanned = new Int32Array(scannedRows);
  let s = 0;
  let next = 0;
  let earlier = 0;
  for (let t = 0; t < count; t++) {
    const row = runs[3 * t];
    const from = runs[3 * t + 1];
    const length = runs[3 * t + 2];
    if (row < next || row + length > n || from < earlier || from + length > rowOfEarlier.length) return null;
    while (next < row) scanned[s++] = next++;
    rowOfEarlier.fill(-1, earlier, from);
    fillRun(rowOfEarlier, from, row, length);
    next = row + length;
    earlier = from + length;
  }
  rowOfEarlier.fill(-1, earlier);
  while (next < n) scanned[s++] = next++;
  return s === scannedRows ? scanned : null;
}

/** rowOfEarlier[from + k] = row + k for k below `length`. */
function fillRun(rowOfEarlier: Int32Array, from: number, row: number, length: number): void {
  for (let k = 0; k < length; k++) rowOfEarlier[from + k] = row + k;
}

/**
 * Each scanned row's earlier row by its id (written into `rowOfEarlier`), -1 for an added one; null at
 * an empty id or an id twice in this table (the link's errors).
 */
function pairScanned(
  scanned: Int32Array,
  ids: NamePool,
  rowsById: ByteIdIndex,
  rowOfEarlier: Int32Array,
): { earlier: Int32Array; addedIds: Map<string, number>; added: number } | null {
  const { bytes, start, size } = ids.byteRuns()!;
  const view = viewOf(bytes);
  const earlier = new Int32Array(scanned.length);
  const addedIds = new Map<string, number>();
  for (let j = 0; j < scanned.length; j++) {
    const r = scanned[j];
    if (size[r] === 0) return null;
    const o = rowsById.getBytes(view, start[r], start[r] + size[r]);
    if (o >= 0) {
      if (rowOfEarlier[o] !== -1) return null;
      rowOfEarlier[o] = r;
    } else {
      const id = ids.get(r);
      if (addedIds.has(id)) return null;
      addedIds.set(id, j);
    }
    earlier[j] = o;
  }
  return { earlier, addedIds, added: addedIds.size };
}

/**
 * Each scanned row's parent (see {@link ReadAsEarlier.scannedParent}), found as `linkParents` finds it
 * (plain digits by their number, other cells by their bytes); null where it names a row this table
 * does not have, or a row other than the earlier root's has none.
 */
function scannedParents(
  scanned: Int32Array,
  found: { earlier: Int32Array; addedIds: Map<string, number> },
  parents: { values: Float64Array; texts: NamePool },
  rowsById: ByteIdIndex,
  rowOfEarlier: Int32Array,
): Int32Array | null {
  const { values, texts } = parents;
  const textRuns = texts.byteRuns();
  const textView = textRuns === null ? null : viewOf(textRuns.bytes);
  const parent = new Int32Array(scanned.length);
  for (let j = 0; j < scanned.length; j++) {
    const r = scanned[j];
    const value = values[r];
    let p: number;
    let id: string;
    if (!Number.isNaN(value)) {
      // A cell of plain digits stands for its digits (as linkParents reads it).
      p = rowsById.getNumber(value);
      id = String(value);
    } else if (r >= texts.length || texts.byteLengthOf(r) === 0) {
      if (found.earlier[j] !== 0) return null;
      parent[j] = -1;
      continue;
    } else {
      if (textRuns === null || textView === null) return null;
      const s = textRuns.start[r];
      p = rowsById.getBytes(textView, s, s + textRuns.size[r]);
      id = texts.get(r);
    }
    if (p >= 0) {
      if (rowOfEarlier[p] === -1) return null;
      parent[j] = p;
      continue;
    }
    const a = found.addedIds.get(id);
    if (a === undefined) return null;
    parent[j] = -2 - a;
  }
  return parent;
}

/**
 * Whether the rows shared with the earlier version come in its order (runs taken and scanned rows
 * paired by id, merged by this table's row): then children that stay under a parent keep their order.
 */
function keepsOrder(taken: TakenRows, scanned: Int32Array, earlier: Int32Array): boolean {
  const { runs, count } = taken;
  let last = -1;
  let j = 0;
  for (let t = 0; t <= count; t++) {
    const row = t < count ? runs[3 * t] : Number.POSITIVE_INFINITY;
    for (; j < scanned.length && scanned[j] < row; j++) {
      const o = earlier[j];
      if (o < 0) continue;
      if (o <= last) return false;
      last = o;
    }
    if (t === count) break;
    if (runs[3 * t + 1] <= last) return false;
    last = runs[3 * t + 1] + runs[3 * t + 2] - 1;
  }
  return true;
}

/**
 * Whether every row links as in a tree: the root is there, each row taken whole has its earlier
 * parent here (the same parent cell), and no chain of parents through a row whose parent changed
 * (moved) or an added row goes round. Steps up are bounded: a chain longer than the rows is a cycle.
 */
function linksAsEarlier(
  tree: Tree,
  rowOfEarlier: Int32Array,
  scanned: Int32Array,
  earlier: Int32Array,
  parent: Int32Array,
): boolean {
  if (rowOfEarlier[0] === -1) return false;
  const scannedOf = new Map<number, number>();
  for (let j = 0; j < scanned.length; j++) if (earlier[j] >= 0) scannedOf.set(earlier[j], j);
  if (!takenParentsThere(tree, rowOfEarlier, scannedOf)) return false;
  const oldParent = tree.parent;
  const up = (key: number): number => {
    if (key <= -2) return parent[-2 - key];
    const j = scannedOf.get(key);
    return j === undefined ? oldParent[key] : parent[j];
  };
  const most = tree.length + scanned.length;
  for (let j = 0; j < scanned.length; j++) {
    const o = earlier[j];
    if (o >= 0 && parent[j] === oldParent[o]) continue;
    let steps = 0;
    for (let key = parent[j]; key !== -1; key = up(key)) if (++steps > most) return false;
  }
  return true;
}

/**
 * Whether the earlier parent of every earlier row taken whole is here (taken, or paired by id): the
 * children of each earlier row that is gone, found below it in the earlier pre-order by their depth,
 * are gone too, or paired (their parent cell read anew).
 */
function takenParentsThere(
  tree: Tree,
  rowOfEarlier: Int32Array,
  scannedOf: ReadonlyMap<number, number>,
): boolean {
  const { depth } = tree;
  const m = rowOfEarlier.length;
  for (let a = nextGone(rowOfEarlier, 1); a < m; a = nextGone(rowOfEarlier, a + 1)) {
    const below = depth[a] + 1;
    for (let o = a + 1; o < m && depth[o] >= below; o++)
      if (depth[o] === below && rowOfEarlier[o] !== -1 && !scannedOf.has(o)) return false;
  }
  return true;
}

/** The first earlier row from `from` on that is gone (-1), or the number of rows. */
function nextGone(rowOfEarlier: Int32Array, from: number): number {
  const at = rowOfEarlier.indexOf(-1, from);
  return at === -1 ? rowOfEarlier.length : at;
}

/**
 * Whether the scanned rows' sizes are numbers (a cell of plain digits) and every size together stays
 * within 2^53 - 1 (check-sizes.ts): the earlier version's sum plus theirs bounds this one's.
 */
function sizesRead(tree: Tree, scanned: Int32Array, sizes: Float64Array): boolean {
  let total = 0;
  const own = tree.ownSize;
  for (let k = 0; k < tree.length; k++) total += own[k];
  for (let j = 0; j < scanned.length; j++) {
    const size = sizes[scanned[j]];
    if (Number.isNaN(size)) return false;
    total += size;
  }
  return total <= MAX_SIZE;
}
