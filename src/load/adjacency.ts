import { EspalierError, quoted, type SourcePos, say } from "../errors.js";
import type { GraphNodes } from "../model/graph-nodes.js";
import { isSize } from "../model/size-rule.js";
import type { LoadOptions } from "./load-options.js";
import { missingField } from "./missing-field.js";
import { limitExceeded } from "./node-sink.js";
import { OtherColumns, OtherFieldsKept } from "./other-fields-kept.js";
import { fieldSizeUnit } from "./size-unit.js";

type Fields = Pick<
  LoadOptions,
  | "nameField"
  | "childrenField"
  | "sizeField"
  | "keepFields"
  | "rootName"
  | "maxNodes"
  | "idField"
  | "parentField"
  | "pathField"
  | "optionalKeepFields"
  | "keepOtherFields"
  | "nodeRecords"
>;

/** A node's entry: its id, its value (a list of child ids, a record or null), and where it is. */
interface Entry {
  readonly id: string;
  readonly value: unknown;
  readonly at: SourcePos;
}

/**
 * Whether `rows` (a JSON or YAML array read as a graph) are records naming their children: objects, one
 * at least holding a list under the children field, and none the parent field (rows linked by parent
 * are a graph table: graph-table.ts).
 */
export function rowsListChildren(
  rows: readonly unknown[],
  options: Pick<LoadOptions, "childrenField" | "parentField">,
): boolean {
  let lists = false;
  for (const row of rows) {
    if (typeof row !== "object" || row === null || Array.isArray(row)) return false;
    if (Object.hasOwn(row, options.parentField)) return false;
    if (Array.isArray((row as Record<string, unknown>)[options.childrenField])) lists = true;
  }
  return lists;
}

/**
 * An adjacency map as a graph: each key is a node id, and its value names its children by id: a list of
 * ids, or the node's own record (an object whose children field holds that list, with an optional name,
 * size and kept fields), or null for a node with no children. Ids are strings or numbers (a number
 * stands for its digits). An id that is no key is a node with no children and no record. Nodes are the
 * keys in map order, then the other ids in order of first mention; edges in map order.
 * An array is rows naming their children (see {@link rowsListChildren}): each row a node's record, its
 * id under the id field, as a CycloneDX SBOM lists `dependencies: [{"ref": …, "dependsOn": [...]}]`
 * (ECMA-424); read as the map with those ids as keys, in row order.
 */
export function adjacencyNodes(value: unknown, options: Fields, readToo: readonly string[] = []): GraphNodes {
  if (Array.isArray(value)) {
    if (!rowsListChildren(value, options))
      throw new EspalierError(
        "SHAPE",
        say`a graph read from a list must hold records naming their children: objects with an id under ${quoted.name(options.idField)} and a list of child ids under ${quoted.name(options.childrenField)} (--id-field, --children-field), or rows linked by ${quoted.name(options.parentField)}`,
      );
    return adjacencyEntries(rowEntries(value, options), options, "id-children", readToo);
  }
  if (typeof value !== "object" || value === null)
    throw new EspalierError("SHAPE", "a graph read as an adjacency map must be an object (a mapping) of ids");
  const map = value as Record<string, unknown>;
  return adjacencyEntries(
    Object.keys(map).map((key) => ({ id: key, value: map[key], at: { field: key } })),
    options,
    "map",
    readToo,
  );
}

/** Rows naming their children as entries: each row's id, and the row as its record. */
function rowEntries(rows: readonly unknown[], options: Fields): Entry[] {
  const entries: Entry[] = [];
  const rowOf = new Map<string, number>();
  for (let r = 0; r < rows.length; r++) {
    const record = rows[r] as Record<string, unknown>;
    const id = record[options.idField];
    const at = { row: r + 1 };
    if ((typeof id !== "string" && typeof id !== "number") || String(id) === "")
      throw new EspalierError(
        Object.hasOwn(record, options.idField) ? "SHAPE" : "FIELD_MISSING",
        say`row ${r + 1} has no id under ${quoted.name(options.idField)} (text or a number): rows naming their children are linked by their ids (--id-field)`,
        at,
        { field: options.idField },
      );
    const text = String(id);
    const earlier = rowOf.get(text);
    if (earlier !== undefined)
      throw new EspalierError(
        "DUPLICATE_ID",
        say`row ${r + 1} repeats the id ${quoted.id(text)} of row ${earlier}: a node's record, with all its children, is given once`,
        at,
      );
    rowOf.set(text, r + 1);
    entries.push({ id: text, value: record, at });
  }
  return entries;
}

/**
 * Entries (in order) as a graph, linked as `linkedBy` says. With `keepOtherFields`, every other field of
 * the records is kept too, as text (an object or array as its JSON text), but those `readToo` names
 * (read for the graph by the caller: an SBOM's bom-ref). A kept field that no record holds is
 * FIELD_MISSING naming the fields they do hold, not a column of nothing (a label or `--compare-field`
 * naming it would print or compare nothing), unless it is kept only where records have it
 * (`optionalKeepFields`: a diff's `version`) or node records may hold it (`--nodes`, which check it).
 */
function adjacencyEntries(
  entries: readonly Entry[],
  options: Fields,
  linkedBy: "map" | "id-children",
  readToo: readonly string[],
): GraphNodes {
  const nodeOf = new Map<string, number>();
  const ids: string[] = [];
  const add = (id: string) => {
    let node = nodeOf.get(id);
    if (node === undefined) {
      node = ids.length;
      if (node >= options.maxNodes) throw limitExceeded(options.maxNodes, false, 0);
      nodeOf.set(id, node);
      ids.push(id);
    }
    return node;
  };
  for (const entry of entries) add(entry.id);
  const names: string[] = [...ids];
  const sizes: number[] = new Array(ids.length).fill(0);
  let hasSizes = false;
  // Keys of the entries' own records, for the message of a named field no record has.
  const recordFields = new Set<string>();
  const kept = new Map<string, string[]>(options.keepFields.map((k) => [k, new Array(ids.length).fill("")]));
  const others =
    options.keepOtherFields === true
      ? new OtherFieldsKept({ ...options, keepFields: [...options.keepFields, ...readToo] })
      : undefined;
  const otherColumns = new OtherColumns();
  const from: number[] = [];
  const to: number[] = [];
  const shape = (entry: Entry, what: string) =>
    new EspalierError("SHAPE", say`the entry ${quoted.id(entry.id)} ${what}`, entry.at);
  for (const entry of entries) {
    const key = entry.id;
    const node = nodeOf.get(key)!;
    const value = entry.value;
    let children: unknown = value;
    if (typeof value === "object" && value !== null && !Array.isArray(value)) {
      const record = value as Record<string, unknown>;
      for (const field of Object.keys(record)) {
        recordFields.add(field);
        if (others?.keeps(field)) otherColumns.set(field, node, fieldText(record[field]));
      }
      children = Object.hasOwn(record, options.childrenField) ? record[options.childrenField] : null;
      if (Object.hasOwn(record, options.nameField)) {
        const name = record[options.nameField];
        if (typeof name !== "string" && typeof name !== "number")
          throw shape(entry, `has a "${options.nameField}" that is not text`);
        if (String(name) !== "") names[node] = String(name);
      }
      if (Object.hasOwn(record, options.sizeField)) {
        const size = record[options.sizeField];
        if (size !== null) {
          if (typeof size !== "number" || !isSize(size)) {
            throw new EspalierError(
              "BAD_SIZE",
              say`the "${options.sizeField}" of the entry ${quoted.id(key)} must be a number from 0 to 2^53 - 1, got ${quoted.value(typeof size === "string" ? size : JSON.stringify(size))}`,
              entry.at,
            );
          }
          sizes[node] = size;
          hasSizes = true;
        }
      }
      for (const [field, column] of kept)
        if (Object.hasOwn(record, field)) column[node] = fieldText(record[field]);
    } else if (value !== null && !Array.isArray(value)) {
      throw shape(entry, "must be a list of child ids, a record or null");
    }
    if (children === null || children === undefined) continue;
    if (!Array.isArray(children))
      throw shape(entry, `has "${options.childrenField}" that is not a list of ids`);
    for (const child of children) {
      if (typeof child !== "string" && typeof child !== "number")
        throw shape(entry, "lists a child that is not an id (text or a number)");
      const id = String(child);
      if (id === "") throw shape(entry, "lists an empty child id");
      const c = add(id);
      if (c === names.length) {
        names.push(id);
        sizes.push(0);
        for (const column of kept.values()) column.push("");
      }
      from.push(node);
      to.push(c);
    }
  }
  for (const field of kept.keys()) {
    if (recordFields.has(field)) continue;
    if (options.nodeRecords === undefined && !options.optionalKeepFields?.includes(field)) {
      const read = [options.idField, options.childrenField];
      throw missingField(
        "kept",
        field,
        [...recordFields].filter((f) => !read.includes(f)),
      );
    }
    kept.delete(field);
  }
  const fields = new Map([...kept, ...otherColumns.fields(ids.length)]);
  return {
    name: names,
    ids,
    ownSize: Float64Array.from(sizes),
    hasSizes,
    sizeUnit: fieldSizeUnit(options.sizeField),
    origin: new Int32Array(ids.length),
    originIsRow: false,
    recordFields: [...recordFields],
    fields,
    ...others?.reading(),
    rootName: options.rootName,
    edgeFrom: Int32Array.from(from),
    edgeTo: Int32Array.from(to),
    edgeOrigin: new Int32Array(from.length),
    edgeCount: from.length,
    repeatedEdges: "skip",
    linkedBy,
  };
}

/** A record field's value as kept: its text, an object or array as its JSON text, null as nothing. */
function fieldText(value: unknown): string {
  if (value === null || value === undefined) return "";
  return typeof value === "object" ? JSON.stringify(value) : String(value);
}
