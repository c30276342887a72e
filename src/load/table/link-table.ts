import { Buffer } from "node:buffer";
import { didYouMean } from "../../did-you-mean.js";
import { EspalierError, type MessagePart, placedAtRow, quoted, quotedList, say } from "../../errors.js";
import type { LinkedNodes } from "../../model/linked-nodes.js";
import { copyName, isEmptyName, NamePool, type Names, StringNames } from "../../model/names.js";
import type { ReadingNote } from "../../model/reading-note.js";
import { isSize } from "../../model/size-rule.js";
import type { TreeReading } from "../../model/tree.js";
import type { LoadOptions } from "../load-options.js";
import { missingField, nameFieldNamed, sizeFieldNamed } from "../missing-field.js";
import { limitExceeded, NodeSink } from "../node-sink.js";
import { tableNotUtf8Notes } from "../not-utf8-note.js";
import { keepingOtherFields, otherFields, withOtherFields } from "../other-fields.js";
import { parseSize } from "../parse-size.js";
import { mixedStartsNote } from "../path-list/mixed-starts.js";
import { PathPlacer } from "../path-placer.js";
import { sizeTextHint } from "../size-text-hint.js";
import { fieldSizeUnit } from "../size-unit.js";
import { ByteIdIndex, viewOf } from "./byte-id-index.js";
import { checkWrittenIds, checkWrittenPaths } from "./check-written.js";
import { IdIndex } from "./id-index.js";
import { inexactId } from "./inexact-id.js";
import { idIsNullParent, missingParent, nearParentId, nullParentSet, spacedIdRow } from "./null-parent.js";
import { rowsInside } from "./rows-inside.js";
import { rowsTable } from "./rows-table.js";
import { withSeparatorHint } from "./separator-hint.js";
import { type Cell, cellText, type NumberCells, numberCell, type Table } from "./table.js";

/**
 * Links table rows into nodes: by id and parent columns when the table has both (an empty parent makes a
 * top-level row), else by a path column (ancestors created implicitly), else FIELD_MISSING.
 * A node's name is its name cell when that is not empty, else its id or last path segment.
 * Origins are data rows (1-based).
 */
export function linkTable(
  table: Table,
  options: LoadOptions,
  shape: "table" | "rows" = "table",
): LinkedNodes {
  let linked: LinkedNodes;
  try {
    linked = linkRows(table, options, shape);
  } catch (err) {
    throw placedAtRow(
      shape === "table" ? withSeparatorHint(err, table.columnNames()) : withValuesHint(err, options),
      table.place,
    );
  }
  linked.reading = tableReading(table, options, shape, linked.reading?.notes ?? []);
  if (table.place) linked.placeRow = table.place;
  return linked;
}

/** How {@link linkTable} read `table`: its reading, with the link's `notes` and the table's own. */
export function tableReading(
  table: Table,
  options: LoadOptions,
  shape: "table" | "rows",
  notes: readonly ReadingNote[],
): TreeReading {
  // Linked by id with no name column: the ids name the nodes, and the header says so. By the header's
  // names only: `column` would make a cell of every row of a table that keeps its ids as bytes.
  const columns = table.columnNames();
  const idsName =
    columns.includes(options.idField) &&
    columns.includes(options.parentField) &&
    !columns.includes(options.nameField);
  return {
    shape,
    sizeUnit: fieldSizeUnit(options.sizeField),
    ...(table.filledRows ? { filledRows: table.filledRows } : {}),
    ...(idsName ? { namesFrom: options.idField } : {}),
    linkedBy: linkedBy(table, options),
    ...withOtherFields(otherFields(columns, options)),
    ...notesOf([...notes, ...tableNotUtf8Notes(table)]),
  };
}

/** `notes` as a reading's field: absent when there are none. */
function notesOf(notes: ReadingNote[]): { notes?: ReadingNote[] } {
  return notes.length > 0 ? { notes } : {};
}

/**
 * DUPLICATE_PATH of JSON or YAML rows linked by path, with a way to read the document anyway: an array
 * of records with a path member need not be a tree's rows, as a JSON Patch (RFC 6902 §3: operations
 * applied in order, several on one path) is not; `--read-as values` reads every value of it.
 */
function withValuesHint(error: unknown, options: LoadOptions): unknown {
  if (!(error instanceof EspalierError) || error.code !== "DUPLICATE_PATH") return error;
  return new EspalierError(
    error.code,
    [
      ...error.parts,
      `; the array was read as rows linked by their "${options.pathField}" field, one row a path: to read it as written (a list of operations on paths, as a JSON Patch is), every value a node, pass --read-as values`,
    ],
    error.pos,
    error.details,
  );
}

/** The columns {@link linkRows} linked the rows by: id and parent when the table has both, else the path. */
function linkedBy(table: Table, options: LoadOptions): string[] {
  const columns = table.columnNames();
  return columns.includes(options.idField) && columns.includes(options.parentField)
    ? [options.idField, options.parentField]
    : [options.pathField];
}

function linkRows(table: Table, given: LoadOptions, shape: "table" | "rows"): LinkedNodes {
  if (table.length === 0) throw new EspalierError("INPUT_EMPTY", "the table has no data rows");
  // Every other column kept as well, when asked (a diff's versions: LoadOptions.keepOtherFields).
  const options = keepingOtherFields(given, table.columnNames());
  const byteIds = table.pooledColumn?.(options.idField);
  const byteParents = byteIds && table.numberColumn?.(options.parentField);
  if (byteIds && byteParents && byteIds.length >= table.length && byteIds.byteRuns() !== null) {
    checkWrittenIds(table, [options.idField, options.parentField]);
    return linkByteIds(table, byteIds, byteParents, options);
  }
  const ids = table.column(options.idField);
  const parents = ids && table.column(options.parentField);
  if (ids && parents) {
    checkWrittenIds(table, [options.idField, options.parentField]);
    return linkById(table, ids, parents, options);
  }
  const paths = table.column(options.pathField);
  if (paths) {
    checkWrittenPaths(table, options);
    return linkByPath(table, paths, options);
  }
  // A parent column beside a name column and no id column: parents written by name (an org chart's
  // manager column), which --id-field reads.
  const byName =
    !ids && table.column(options.parentField) !== undefined && table.column(options.nameField) !== undefined;
  // Columns named otherwise (employee_id, manager_id) are read by naming them: the message says how,
  // unless the header is one column (another separator, or a list of paths: nothing to name).
  const naming = !byName && table.columnNames().length > 1;
  // A CSV/TSV table of edges (`from,to`, `source<TAB>target`) is read by --input-format edges, which
  // never is detected: say so, naming its columns when there are two.
  const edges = shape === "table" && naming ? edgeTableRemedy(table.columnNames(), options) : undefined;
  const remedies = [
    ...(byName ? [`--id-field ${options.nameField}`] : []),
    ...(naming ? ["--id-field", "--parent-field", "--path-field"] : []),
    ...(edges ? ["--input-format edges"] : []),
    ...(shape === "table" ? ["--input-format paths"] : []),
  ];
  throw new EspalierError(
    "FIELD_MISSING",
    say`rows need "${options.idField}" and "${options.parentField}" columns, or a "${options.pathField}" column; the columns are ${quotedList("name", table.columnNames())}${
      byName
        ? `; if "${options.parentField}" holds the rows' ${options.nameField}s, say --id-field ${options.nameField}`
        : naming
          ? "; say which columns hold them with --id-field COLUMN and --parent-field COLUMN, or --path-field COLUMN"
          : ""
    }${edges ?? ""}${rowsInside(table, options)}${
      shape === "table"
        ? "; a listing of sizes and paths (size, a tab, the path) reads with --input-format paths"
        : ""
    }`,
    undefined,
    {
      fieldsNeeded: [options.idField, options.parentField, options.pathField],
      fieldsSeen: table.columnNames(),
      ...(remedies.length > 0 ? { remedies } : {}),
    },
  );
}

/**
 * The end of a FIELD_MISSING message for a table that may be a list of edges (a parent and a child a
 * row): the options that read it so. With the parent and child columns at their names (`parent,child`)
 * `--input-format edges` is enough; a table of two columns is named as it is, parent first.
 */
function edgeTableRemedy(columns: readonly string[], options: LoadOptions): MessagePart[] {
  const lead = "; a table of edges (a parent and a child a row) reads with --input-format edges";
  if (columns.includes(options.parentField) && columns.includes(options.childField)) return [lead];
  if (columns.length === 2)
    return say`${lead} --parent-field ${quoted.name(columns[0])} --child-field ${quoted.name(columns[1])}`;
  return [`${lead} --parent-field COLUMN --child-field COLUMN`];
}

function linkById(
  table: Table,
  idCells: readonly Cell[],
  parentCells: readonly Cell[],
  options: LoadOptions,
) {
  const n = table.length;
  if (n > options.maxNodes) throw limitExceeded(options.maxNodes, true, options.maxNodes + 1);
  checkNameColumn(table, options);
  const keep = keptColumns(table, options);
  const pooled = table.pooledColumn?.(options.nameField);
  const names = pooled ? undefined : table.column(options.nameField);
  const sizes = sizeColumn(table, options);
  // A column of text is its own list of ids (the index writes back the same strings); else a copy.
  const ids: string[] = allText(idCells, n) ? (idCells as string[]) : new Array(n);
  const rowOf = new IdIndex(ids);
  const nullParents = nullParentSet(options);
  for (let r = 0; r < n; r++) {
    const inexact =
      inexactId(idCells[r], r + 1, options.idField) ?? inexactId(parentCells[r], r + 1, options.parentField);
    if (inexact) throw inexact;
    const id = cellText(idCells[r]);
    if (nullParents?.has(id)) throw idIsNullParent(id, r + 1, options);
    if (id === "") throw emptyId(r, options);
    const earlier = rowOf.add(id, r);
    if (earlier !== -1) throw duplicateId(r, id, earlier, options);
  }
  const parentOf = new Int32Array(n);
  const origin = new Int32Array(n);
  const ownSize = new Float64Array(n);
  // A name column with no empty cell is the list of names itself; else names fall back to ids.
  const named = names !== undefined && allText(names, n, true);
  const name: string[] | null = pooled ? null : named ? (names as string[]) : new Array(n);
  for (let r = 0; r < n; r++) {
    const parentCell = parentCells[r];
    // A cell kept as a number is looked up as the number (it stands for its digits).
    const parentId = typeof parentCell === "number" ? parentCell : cellText(parentCell);
    if (parentId === "" || nullParents?.has(cellText(parentId))) {
      parentOf[r] = -1;
    } else {
      const p = rowOf.get(parentId);
      if (p === -1) {
        const text = cellText(parentId);
        const near = nearParentId(text);
        const trimmed = near === undefined ? -1 : rowOf.get(near);
        const spacedId = spacedIdRow(text, n, (k) => ids[k]);
        throw missingParent(text, r + 1, options, rowNamed(text, pooled, names, n), {
          ...(trimmed === -1 ? {} : { trimmedRow: trimmed + 1 }),
          ...(spacedId === -1 ? {} : { spacedIdRow: spacedId + 1 }),
          strings: !table.textCells,
        });
      }
      parentOf[r] = p;
    }
    origin[r] = r + 1;
    if (name !== null && !named) name[r] = (names && cellText(names[r])) || ids[r];
    if (sizes) ownSize[r] = sizeOf(sizes[r], table.textCells, r + 1, options.sizeField);
  }
  return rowLinked(
    {
      parentOf,
      name: name === null ? namesOrIds(pooled!, new StringNames(ids), n) : name,
      ownSize,
      hasSizes: sizes !== undefined,
      ids,
      origin,
      fields: keep,
    },
    options,
  );
}

/** SHAPE at row `r` (0-based), whose id cell is empty. */
function emptyId(r: number, options: LoadOptions): EspalierError {
  return new EspalierError("SHAPE", say`row ${r + 1} has an empty "${options.idField}"`, {
    row: r + 1,
    field: options.idField,
  });
}

/** DUPLICATE_ID at row `r` (0-based), naming the earlier row with the same id. */
function duplicateId(r: number, id: string, earlier: number, options: LoadOptions): EspalierError {
  return new EspalierError(
    "DUPLICATE_ID",
    say`row ${r + 1} repeats the ${options.idField} ${quoted.id(id)} of row ${earlier + 1}`,
    { row: r + 1, field: options.idField },
    { firstRow: earlier + 1 },
  );
}

/**
 * {@link linkById} for a table that kept its ids as bytes and its parent cells as numbers and bytes
 * (a CSV table, csv-table-reader.ts): the same nodes and the same errors, with no string made per row.
 * Ids are compared by their bytes, which the reader keeps as UTF-8 text ({@link ByteIdIndex}).
 */
function linkByteIds(table: Table, ids: NamePool, parents: NumberCells, options: LoadOptions): LinkedNodes {
  const n = table.length;
  if (n > options.maxNodes) throw limitExceeded(options.maxNodes, true, options.maxNodes + 1);
  checkNameColumn(table, options);
  const keep = keptColumns(table, options);
  const pooled = table.pooledColumn?.(options.nameField);
  const names = pooled ? undefined : table.column(options.nameField);
  const byteSizes = table.numberColumn?.(options.sizeField);
  const sizes = byteSizes ? undefined : sizeColumn(table, options);
  const rowOf = new ByteIdIndex(ids.byteRuns()!, n);
  const nullParents = nullParentSet(options);
  // Each loop over the rows is a function of its own: a function whose first loop ran compiles again
  // at the second (its code never ran), in every load (docs/performance.md).
  indexIds(rowOf, ids, n, nullParents, options);
  // A later version read against this table finds the rows it did not take whole by id here.
  if (table.keptForLater) table.keptForLater.rowsById = rowOf;
  const parentOf = new Int32Array(n);
  const origin = new Int32Array(n);
  const ownSize = new Float64Array(n);
  const named = names !== undefined && allText(names, n, true);
  const name: string[] | null = pooled ? null : named ? (names as string[]) : new Array(n);
  const columns: RowColumns = { pooled, names, named, byteSizes, sizes, textCells: table.textCells };
  linkParents(rowOf, ids, parents, columns, { parentOf, origin, ownSize, name }, nullParents, options);
  return rowLinked(
    {
      parentOf,
      name: name === null ? namesOrIds(pooled!, ids, n) : name,
      ownSize,
      hasSizes: sizes !== undefined || byteSizes !== undefined,
      ids,
      origin,
      fields: keep,
    },
    options,
  );
}

/** A table linked by its id and parent columns: each node at its row. */
function rowLinked(
  nodes: Omit<LinkedNodes, "originIsRow" | "rootName" | "parentColumnRead">,
  options: LoadOptions,
): LinkedNodes {
  return { ...nodes, originIsRow: true, rootName: options.rootName, parentColumnRead: true };
}

/** Indexes the rows' ids; INVALID_ID, EMPTY_ID or DUPLICATE_ID at the first row that may not be linked. */
function indexIds(
  rowOf: ByteIdIndex,
  ids: NamePool,
  n: number,
  nullParents: ReadonlySet<string> | undefined,
  options: LoadOptions,
): void {
  for (let r = 0; r < n; r++) {
    if (nullParents?.has(ids.get(r))) throw idIsNullParent(ids.get(r), r + 1, options);
    if (ids.byteLengthOf(r) === 0) throw emptyId(r, options);
    const earlier = rowOf.add(r);
    if (earlier !== -1) throw duplicateId(r, ids.get(r), earlier, options);
  }
}

/** The columns of a table {@link linkParents} reads besides the ids and parents. */
interface RowColumns {
  pooled: NamePool | undefined;
  names: readonly Cell[] | undefined;
  named: boolean;
  byteSizes: NumberCells | undefined;
  sizes: readonly Cell[] | undefined;
  textCells: boolean;
}

/** Each row's parent (its row, -1 for none), origin, size and, unless pooled, name; MISSING_PARENT where none. */
function linkParents(
  rowOf: ByteIdIndex,
  ids: NamePool,
  parents: NumberCells,
  columns: RowColumns,
  out: { parentOf: Int32Array; origin: Int32Array; ownSize: Float64Array; name: string[] | null },
  nullParents: ReadonlySet<string> | undefined,
  options: LoadOptions,
): void {
  const { pooled, names, named, byteSizes, sizes, textCells } = columns;
  const { parentOf, origin, ownSize, name } = out;
  const n = parentOf.length;
  const { values, texts } = parents;
  // The text cells' bytes (read only once every cell is in).
  const textRuns = texts.byteRuns();
  const textView = textRuns === null ? null : viewOf(textRuns.bytes);
  for (let r = 0; r < n; r++) {
    const value = values[r];
    let p: number;
    let text: string | undefined;
    if (!Number.isNaN(value)) {
      // A cell of plain digits stands for its digits.
      if (nullParents?.has(String(value))) p = -1;
      else {
        p = rowOf.getNumber(value);
        if (p === -1) text = String(value);
      }
    } else if (r >= texts.length || texts.byteLengthOf(r) === 0 || nullParents?.has(texts.get(r))) {
      p = -1;
    } else {
      const s = textRuns === null ? 0 : textRuns.start[r];
      p = textView === null ? -1 : rowOf.getBytes(textView, s, s + textRuns!.size[r]);
      if (p === -1) text = texts.get(r);
    }
    if (text !== undefined) {
      const near = Buffer.from(nearParentId(text) ?? "", "utf8");
      const at = near.length === 0 ? -1 : rowOf.getBytes(viewOf(near), 0, near.length);
      const spacedId = spacedIdRow(text, n, (k) => ids.get(k));
      throw missingParent(text, r + 1, options, rowNamed(text, pooled, names, n), {
        ...(at === -1 ? {} : { trimmedRow: at + 1 }),
        ...(spacedId === -1 ? {} : { spacedIdRow: spacedId + 1 }),
        strings: false,
      });
    }
    parentOf[r] = p;
    origin[r] = r + 1;
    if (name !== null && !named) name[r] = (names && cellText(names[r])) || ids.get(r);
    if (byteSizes) {
      ownSize[r] = sizeOf(numberCell(byteSizes, r), true, r + 1, options.sizeField);
    } else if (sizes) ownSize[r] = sizeOf(sizes[r], textCells, r + 1, options.sizeField);
  }
}

/** The pooled name column as the nodes' names, each empty name replaced by the row's id. */
function namesOrIds(pooled: NamePool, ids: Names, n: number): NamePool {
  let empty = false;
  for (let r = 0; r < n && !empty; r++) empty = isEmptyName(pooled, r);
  if (!empty && pooled.length === n) return pooled;
  const out = new NamePool(n, n * 8);
  for (let r = 0; r < n; r++) {
    if (isEmptyName(pooled, r)) copyName(out, r, ids, r);
    else copyName(out, r, pooled, r);
  }
  return out;
}

function linkByPath(table: Table, pathCells: readonly Cell[], options: LoadOptions): LinkedNodes {
  const n = table.length;
  checkNameColumn(table, options);
  const keep = keptColumns(table, options);
  const names = table.column(options.nameField);
  const sizes = sizeColumn(table, options);
  const sink = new NodeSink(options.maxNodes, true);
  // A name cell relabels the node in the sink, so the placer keeps the names it finds nodes by.
  const index = new PathPlacer(sink, names !== undefined);
  // Kept values by row, spread over nodes at the end (implicit ancestors keep "").
  const nodeOfRow = new Int32Array(n);
  for (let r = 0; r < n; r++) {
    const path = cellText(pathCells[r]);
    // The empty path is the root, as a lock file's "" key (and a listing's start) name it.
    let i: number;
    try {
      i = index.placeText(path, r + 1);
      if (i === -1) i = index.placeRoot(r + 1);
    } catch (err) {
      // A repeated path: at its cell.
      throw err instanceof EspalierError ? err.placed({ field: options.pathField }) : err;
    }
    nodeOfRow[r] = i;
    const label = names ? cellText(names[r]) : "";
    if (label !== "") sink.name.setString(i, label);
    if (sizes) sink.ownSize[i] = sizeOf(sizes[r], table.textCells, r + 1, options.sizeField);
  }
  sink.hasSizes = sizes !== undefined;
  const root = index.adoptTopLevel();
  if (root !== -1 && isEmptyName(sink.name, root)) sink.name.setString(root, options.rootName);
  const mixed = mixedStartsNote(
    sink,
    root,
    (i) => index.isListed(i),
    "row",
    (row) => table.place?.(row)?.line ?? row + 1,
  );
  const fields = new Map<string, string[]>();
  for (const [key, byRow] of keep) {
    const byNode: string[] = new Array(sink.length).fill("");
    for (let r = 0; r < n; r++) byNode[nodeOfRow[r]] = byRow[r];
    fields.set(key, byNode);
  }
  const linked = sink.finish(options.rootName, fields);
  if (mixed) linked.reading = { shape: "table", sizeUnit: "number", notes: [mixed] };
  return linked;
}

/** The size column; a named size field that is no column is FIELD_MISSING naming the columns. */
function sizeColumn(table: Table, options: LoadOptions): readonly Cell[] | undefined {
  const sizes = table.column(options.sizeField);
  if (!sizes && sizeFieldNamed(options)) throw missingField("size", options.sizeField, visibleColumns(table));
  return sizes;
}

/** A named name field that is no column is FIELD_MISSING naming the columns. */
function checkNameColumn(table: Table, options: LoadOptions): void {
  if (nameFieldNamed(options) && !table.columnNames().includes(options.nameField))
    throw missingField("name", options.nameField, visibleColumns(table));
}

/** The columns a user can name (a path map's key column is no field of the records). */
function visibleColumns(table: Table): string[] {
  return table.columnNames().filter((name) => name !== PATH_KEY);
}

/** The kept columns as text, by row; FIELD_MISSING names the columns there are. */
export function keptColumns(
  table: Table,
  options: Pick<LoadOptions, "keepFields" | "optionalKeepFields">,
): Map<string, string[]> {
  const values = new Map<string, string[]>();
  for (const key of options.keepFields) {
    const cells = table.keptText ? table.keptText(key) : table.column(key)?.map(cellText);
    if (!cells && options.optionalKeepFields?.includes(key)) continue;
    if (!cells) {
      const near = didYouMean(key, visibleColumns(table));
      throw new EspalierError(
        "FIELD_MISSING",
        say`no column "${key}" to keep${near === undefined ? "." : say`; did you mean ${quoted.name(near)}?`} The columns are ${quotedList("name", visibleColumns(table))}`,
        undefined,
        near === undefined
          ? { field: key, fieldsSeen: visibleColumns(table) }
          : { field: key, suggestion: near, fieldsSeen: visibleColumns(table) },
      );
    }
    values.set(key, cells);
  }
  return values;
}

/** A size cell as a number (text cells parsed as sizes); an empty cell is 0; anything else BAD_SIZE. */
export function sizeOf(cell: Cell, textCells: boolean, row: number, field: string): number {
  if (cell === undefined || cell === null) return 0;
  const value =
    typeof cell === "number" ? cell : textCells && typeof cell === "string" ? parseSize(cell) : Number.NaN;
  if (isSize(value)) return value;
  throw new EspalierError(
    "BAD_SIZE",
    say`the "${field}" of row ${row} must be a number from 0 to 2^53 - 1, got ${quoted.value(typeof cell === "string" ? cell : JSON.stringify(cell))}${typeof cell === "string" ? sizeTextHint(cell) : ""}`,
    { row, field },
  );
}

/** Whether the first `n` cells are all strings (and, with `nonEmpty`, none is ""), in an array of `n`. */
function allText(cells: readonly Cell[], n: number, nonEmpty = false): boolean {
  if (cells.length !== n) return false;
  for (let r = 0; r < n; r++) {
    const cell = cells[r];
    if (typeof cell !== "string" || (nonEmpty && cell === "")) return false;
  }
  return true;
}

/** The column a path map's keys are read from; no record field can be named so. */
const PATH_KEY = "\u0000path";

/**
 * Records keyed by path (see JsonPathMapLoader) linked as rows by path: the key is the path, the
 * record's fields are the row's other columns. `field` is where the map was (for the reading).
 */
export function linkPathMap(
  keys: readonly string[],
  records: readonly unknown[],
  options: LoadOptions,
  field: string,
): LinkedNodes {
  const rows = rowsTable(records);
  const table: Table = {
    length: rows.length,
    textCells: false,
    column: (name) => (name === PATH_KEY ? keys : rows.column(name)),
    keptText: (name) => rows.keptText?.(name),
    columnNames: () => rows.columnNames(),
  };
  if (table.length === 0) throw new EspalierError("INPUT_EMPTY", `the object keyed by path is empty`);
  const linked = linkByPath(table, keys, {
    ...keepingOtherFields(options, rows.columnNames()),
    pathField: PATH_KEY,
  });
  linked.reading = {
    shape: "path-map",
    sizeUnit: fieldSizeUnit(options.sizeField),
    pathMapField: field,
    ...withOtherFields(otherFields(rows.columnNames(), options)),
  };
  return linked;
}

/** The 1-based row whose name is `text` (for MISSING_PARENT's hint), or undefined. */
function rowNamed(
  text: string,
  pooled: NamePool | undefined,
  names: readonly Cell[] | undefined,
  n: number,
): number | undefined {
  for (let r = 0; r < n; r++) {
    const name = pooled ? pooled.get(r) : names ? cellText(names[r]) : undefined;
    if (name === undefined) return undefined;
    if (name === text) return r + 1;
  }
  return undefined;
}
