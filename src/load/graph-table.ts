import { EspalierError, placedAtRow, quoted, quotedList, say } from "../errors.js";
import type { GraphNodes } from "../model/graph-nodes.js";
import type { LoadOptions } from "./load-options.js";
import { limitExceeded } from "./node-sink.js";
import { tableNotUtf8Notes } from "./not-utf8-note.js";
import { keepingOtherFields, otherFields } from "./other-fields.js";
import { fieldSizeUnit } from "./size-unit.js";
import { checkWrittenIds } from "./table/check-written.js";
import { inexactId } from "./table/inexact-id.js";
import { keptColumns, sizeOf } from "./table/link-table.js";
import { idIsNullParent, missingParent, nearParentId, nullParentSet } from "./table/null-parent.js";
import type { Cell, Table } from "./table/table.js";
import { cellText as text } from "./table/table.js";
import { valuesByParent } from "./table/values-by-parent.js";

type Fields = Pick<
  LoadOptions,
  | "idField"
  | "parentField"
  | "nullParents"
  | "childField"
  | "nameField"
  | "sizeField"
  | "keepFields"
  | "rootName"
  | "maxNodes"
  | "pathField"
  | "childrenField"
  | "optionalKeepFields"
  | "keepOtherFields"
>;

/**
 * A table read as a graph. With an id and a parent column (`--graph`), each row links its id to its
 * parent, and an id may repeat with other parents: the first row of an id gives the node's record
 * (name, size, kept fields); a later row of it may leave those cells empty or repeat them, and a
 * different value is DUPLICATE_ID, as is a row that repeats an id with the same parent. An empty parent
 * declares the node only. A parent no row has as its id is MISSING_PARENT. With `keepOtherFields`, the
 * other columns are kept too (a diff compares them); one of them, or a field kept where records have it
 * (`optionalKeepFields`: a diff's `version`), whose cells differ between the rows of an id holds a value
 * per edge, not DUPLICATE_ID (see valuesByParent). With a parent and a child
 * column instead (an edge table), each row is one edge and nodes come from the ids the rows name; the
 * name, size and kept columns then describe nothing and are not read (give node records separately),
 * but with `keepOtherFields` the other columns are kept as the cells of each node's edges in, by
 * parent (see {@link edgeCells}), so that a diff compares them.
 */
export function linkGraphTable(table: Table, options: Fields, edgesOnly = false): GraphNodes {
  try {
    const graph = linkGraph(table, options, edgesOnly);
    if (table.place) graph.placeRow = table.place;
    const notUtf8 = tableNotUtf8Notes(table);
    if (notUtf8.length > 0) graph.notes = [...(graph.notes ?? []), ...notUtf8];
    return graph;
  } catch (err) {
    throw placedAtRow(err, table.place);
  }
}

function linkGraph(table: Table, options: Fields, edgesOnly: boolean): GraphNodes {
  if (table.length === 0) throw new EspalierError("INPUT_EMPTY", "the table has no data rows");
  const parents = table.column(options.parentField);
  const ids = edgesOnly ? undefined : table.column(options.idField);
  if (ids && parents) {
    checkWrittenIds(table, [options.idField, options.parentField]);
    return linkRows(table, ids, parents, options);
  }
  const children = table.column(options.childField);
  if (parents && children) {
    checkWrittenIds(table, [options.parentField, options.childField]);
    return edgeCells(linkEdges(table, parents, children, options), table, options);
  }
  throw new EspalierError(
    "FIELD_MISSING",
    say`a graph table needs "${options.idField}" and "${options.parentField}" columns, or "${options.parentField}" and "${options.childField}"; the columns are ${quotedList("name", table.columnNames())}`,
  );
}

function linkRows(table: Table, idCells: readonly Cell[], parentCells: readonly Cell[], given: Fields) {
  const rows = table.length;
  const other = given.keepOtherFields === true ? (otherFields(table.columnNames(), given) ?? []) : [];
  const options = keepingOtherFields(given, table.columnNames());
  // The fields kept where records have them (a diff's `version` and other fields), which no option
  // named: one whose cells differ between an id's rows is read per edge, as a summary reads it.
  const unnamed = new Set(options.optionalKeepFields ?? []);
  const names = table.column(options.nameField);
  const sizes = table.column(options.sizeField);
  const kept = keptColumns(table, options);
  // Other columns whose cells differ between the rows of one id.
  const perEdge = new Set<string>();
  const nodeOf = new Map<string, number>();
  const ids: string[] = [];
  const name: string[] = [];
  const ownSize: number[] = [];
  const origin: number[] = [];
  const fields = new Map<string, string[]>([...kept.keys()].map((k) => [k, []]));
  const firstRow: number[] = [];
  const nodeOfRow = new Int32Array(rows);
  const nullParents = nullParentSet(options);
  for (let r = 0; r < rows; r++) {
    const inexact = inexactId(idCells[r], r + 1, options.idField);
    if (inexact) throw inexact;
    const id = text(idCells[r]);
    if (nullParents?.has(id)) throw idIsNullParent(id, r + 1, options);
    if (id === "")
      throw new EspalierError("SHAPE", `row ${r + 1} has an empty "${options.idField}"`, {
        row: r + 1,
        field: options.idField,
      });
    const rowName = names ? text(names[r]) : "";
    const hasSize = sizes !== undefined && text(sizes[r]) !== "";
    const size = sizes ? sizeOf(sizes[r], table.textCells, r + 1, options.sizeField) : 0;
    let node = nodeOf.get(id);
    if (node === undefined) {
      node = ids.length;
      if (node >= options.maxNodes) throw limitExceeded(options.maxNodes, true, r + 1);
      nodeOf.set(id, node);
      ids.push(id);
      name.push(rowName || id);
      ownSize.push(size);
      origin.push(r + 1);
      firstRow.push(r);
      for (const [key, values] of kept) fields.get(key)!.push(values[r]);
    } else {
      const first = firstRow[node] + 1;
      const clash = (what: string) =>
        new EspalierError(
          "DUPLICATE_ID",
          say`row ${r + 1} repeats the ${options.idField} ${quoted.id(id)} of row ${first} with another ${what}`,
          { row: r + 1, field: what },
          { firstRow: first, field: what },
        );
      if (rowName !== "" && rowName !== name[node]) throw clash(options.nameField);
      if (hasSize && size !== ownSize[node]) throw clash(options.sizeField);
      for (const [key, values] of kept)
        if (values[r] !== "" && values[r] !== fields.get(key)![node]) {
          if (unnamed.has(key)) perEdge.add(key);
          else throw clash(key);
        }
    }
    nodeOfRow[r] = node;
  }
  const from = new Int32Array(rows);
  const to = new Int32Array(rows);
  const edgeOrigin = new Int32Array(rows);
  let edges = 0;
  for (let r = 0; r < rows; r++) {
    const cell = parentCells[r];
    const inexact = inexactId(cell, r + 1, options.parentField);
    if (inexact) throw inexact;
    const parentId = text(cell);
    if (parentId === "" || nullParents?.has(parentId)) continue;
    const p = nodeOf.get(parentId);
    if (p === undefined) {
      const near = nearParentId(parentId);
      const trimmed = near === undefined ? undefined : nodeOf.get(near);
      throw missingParent(parentId, r + 1, options, undefined, {
        ...(trimmed === undefined ? {} : { trimmedRow: firstRow[trimmed] + 1 }),
        strings: !table.textCells,
      });
    }
    from[edges] = p;
    to[edges] = nodeOfRow[r];
    edgeOrigin[edges] = r + 1;
    edges++;
  }
  const parentText = (r: number) => text(parentCells[r]);
  for (const key of perEdge) valuesByParent(fields.get(key)!, kept.get(key)!, parentText, nodeOfRow);
  return {
    name,
    ids,
    ownSize: Float64Array.from(ownSize),
    hasSizes: sizes !== undefined,
    sizeUnit: fieldSizeUnit(options.sizeField),
    origin: Int32Array.from(origin),
    originIsRow: true,
    recordFields: table.columnNames(),
    fields,
    ...(other.length > 0 ? { otherFields: other } : {}),
    rootName: options.rootName,
    edgeFrom: from,
    edgeTo: to,
    edgeOrigin,
    edgeCount: edges,
    repeatedEdges: "error",
    parentColumnRead: true,
    linkedBy: "id-parent",
  } satisfies GraphNodes;
}

function linkEdges(table: Table, parentCells: readonly Cell[], childCells: readonly Cell[], options: Fields) {
  const rows = table.length;
  const nodeOf = new Map<string, number>();
  const ids: string[] = [];
  const origin: number[] = [];
  const idOf = (cell: Cell, r: number, field: string) => {
    const inexact = inexactId(cell, r + 1, field);
    if (inexact) throw inexact;
    const id = text(cell);
    if (id === "")
      throw new EspalierError("SHAPE", `row ${r + 1} has an empty "${field}"`, { row: r + 1, field });
    let node = nodeOf.get(id);
    if (node === undefined) {
      node = ids.length;
      if (node >= options.maxNodes) throw limitExceeded(options.maxNodes, true, r + 1);
      nodeOf.set(id, node);
      ids.push(id);
      origin.push(r + 1);
    }
    return node;
  };
  const from = new Int32Array(rows);
  const to = new Int32Array(rows);
  const edgeOrigin = new Int32Array(rows);
  for (let r = 0; r < rows; r++) {
    from[r] = idOf(parentCells[r], r, options.parentField);
    to[r] = idOf(childCells[r], r, options.childField);
    edgeOrigin[r] = r + 1;
  }
  return {
    name: ids,
    ids,
    ownSize: new Float64Array(ids.length),
    hasSizes: false,
    sizeUnit: "number",
    origin: Int32Array.from(origin),
    originIsRow: true,
    recordFields: [],
    fields: new Map(),
    rootName: options.rootName,
    edgeFrom: from,
    edgeTo: to,
    edgeOrigin,
    edgeCount: rows,
    repeatedEdges: "skip",
    linkedBy: "parent-child",
  } satisfies GraphNodes;
}

/**
 * Node records from a second table (an id column, and name, size and kept columns) laid over a graph's
 * nodes: a record's name (when not empty), size and fields become the node's. A record whose id no edge
 * names adds a node with no edge, after the others, in record order. The records' fields replace the
 * graph's own but its other fields (an edge table's cells by edge, LoadOptions.keepOtherFields), and
 * their other columns are other fields too. A repeated record id is
 * DUPLICATE_ID; the positions name the records' rows.
 */
export function withRecords(graph: GraphNodes, records: Table, options: Fields): GraphNodes {
  try {
    return withRecordsOf(graph, records, options);
  } catch (err) {
    // At the record in the records' own file (its table's places name it); a fault of the table as a
    // whole (no id column) at its header, so it names the records' file, not the graph's.
    if (err instanceof EspalierError && err.pos === undefined && records.place)
      throw err.placed(records.place(0));
    throw placedAtRow(err, records.place);
  }
}

function withRecordsOf(graph: GraphNodes, records: Table, given: Fields): GraphNodes {
  // The records' other columns kept too, when asked (a diff's versions: LoadOptions.keepOtherFields).
  const other = given.keepOtherFields === true ? (otherFields(records.columnNames(), given) ?? []) : [];
  const options = keepingOtherFields(given, records.columnNames());
  const idCells = records.column(options.idField);
  if (!idCells) {
    throw new EspalierError(
      "FIELD_MISSING",
      say`the node records need an "${options.idField}" column; the columns are ${quotedList("name", records.columnNames())}`,
    );
  }
  const names = records.column(options.nameField);
  const sizes = records.column(options.sizeField);
  const kept = keptColumns(records, options);
  const n = graph.origin.length;
  const idList: string[] = [];
  const nodeOf = new Map<string, number>();
  for (let i = 0; i < n; i++) {
    const id = get(graph.ids, i);
    idList.push(id);
    nodeOf.set(id, i);
  }
  const nameList: string[] = [];
  for (let i = 0; i < n; i++) nameList.push(get(graph.name, i));
  const ownSize = [...graph.ownSize];
  const origin = [...graph.origin];
  const fields = new Map<string, string[]>([...kept.keys()].map((k) => [k, new Array<string>(n).fill("")]));
  const seen = new Map<number, number>();
  for (let r = 0; r < records.length; r++) {
    const id = text(idCells[r]);
    if (id === "")
      throw new EspalierError("SHAPE", `record ${r + 1} has an empty "${options.idField}"`, {
        row: r + 1,
        field: options.idField,
      });
    let node = nodeOf.get(id);
    if (node === undefined) {
      node = idList.length;
      if (node >= options.maxNodes) throw limitExceeded(options.maxNodes, true, r + 1);
      nodeOf.set(id, node);
      idList.push(id);
      nameList.push(id);
      ownSize.push(0);
      origin.push(0);
      for (const column of fields.values()) column.push("");
    }
    const earlier = seen.get(node);
    if (earlier !== undefined) {
      throw new EspalierError(
        "DUPLICATE_ID",
        say`record ${r + 1} repeats the ${options.idField} ${quoted.id(id)} of record ${earlier + 1}`,
        { row: r + 1, field: options.idField },
        { firstRow: earlier + 1 },
      );
    }
    seen.set(node, r);
    const label = names ? text(names[r]) : "";
    if (label !== "") nameList[node] = label;
    if (sizes) ownSize[node] = sizeOf(sizes[r], records.textCells, r + 1, options.sizeField);
    for (const [key, values] of kept) fields.get(key)![node] = values[r];
  }
  return {
    ...graph,
    name: nameList,
    ids: idList,
    ownSize: Float64Array.from(ownSize),
    hasSizes: graph.hasSizes || sizes !== undefined,
    recordFields: [...new Set([...(graph.recordFields ?? []), ...records.columnNames()])],
    sizeUnit: sizes !== undefined ? fieldSizeUnit(options.sizeField) : graph.sizeUnit,
    origin: Int32Array.from(origin),
    ...withGraphOthers(graph, fields, other, idList.length),
  };
}

function get(names: GraphNodes["name"], i: number): string {
  return Array.isArray(names) ? (names as string[])[i] : (names as { get(i: number): string }).get(i);
}

/**
 * An edge table's other columns (LoadOptions.keepOtherFields) kept by node: each cell describes its
 * row's edge, so a node's value is the cell of its edge in, or, where its edges in hold different
 * cells (an empty one too), those cells by parent id (valuesByParent); a node no edge enters holds
 * nothing. A diff then
 * sees a cell changed on any edge as an edit of the edge's child. The graph unchanged without them.
 */
function edgeCells(graph: GraphNodes, table: Table, options: Fields): GraphNodes {
  if (options.keepOtherFields !== true) return graph;
  const read = [options.parentField, options.childField];
  const other = (otherFields(table.columnNames(), options) ?? []).filter((f) => !read.includes(f));
  if (other.length === 0) return graph;
  const n = graph.origin.length;
  const child = graph.edgeTo.subarray(0, graph.edgeCount);
  const parentOf = (r: number) => get(graph.ids, graph.edgeFrom[r]);
  const fields = new Map<string, string[]>();
  for (const field of other) {
    const cells = table.keptText ? table.keptText(field) : table.column(field)?.map(text);
    if (cells === undefined) continue;
    const values = new Array<string>(n).fill("");
    const seen = new Uint8Array(n);
    for (let r = 0; r < child.length; r++)
      if (seen[child[r]] === 0) {
        seen[child[r]] = 1;
        values[child[r]] = cells[r];
      }
    // An empty cell is its edge's own (no value), not a repeat of another edge's.
    valuesByParent(values, cells, parentOf, child, false);
    fields.set(field, values);
  }
  return { ...graph, fields, otherFields: [...fields.keys()] };
}

/**
 * The fields of a graph with node records: the records' (`fields`, their other columns `other`), and
 * the graph's own other fields that the records do not hold, each padded with nothing for the nodes
 * the records added (up to `n`).
 */
function withGraphOthers(
  graph: GraphNodes,
  fields: Map<string, string[]>,
  other: readonly string[],
  n: number,
): Pick<GraphNodes, "fields" | "otherFields" | "otherFieldsLeft"> {
  const all = new Map(fields);
  const others = [...other];
  for (const field of graph.otherFields ?? []) {
    const values = graph.fields.get(field);
    if (values === undefined || all.has(field)) continue;
    const column = values.slice(0, n);
    while (column.length < n) column.push("");
    all.set(field, column);
    others.push(field);
  }
  return {
    fields: all,
    otherFields: others.length > 0 ? others : undefined,
    otherFieldsLeft: graph.otherFieldsLeft?.names.some((f) => !all.has(f))
      ? graph.otherFieldsLeft
      : undefined,
  };
}
