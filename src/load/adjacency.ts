import { EspalierError, quoted, say } from "../errors.js";
import type { GraphNodes } from "../model/graph-nodes.js";
import { isSize } from "../model/size-rule.js";
import type { LoadOptions } from "./load-options.js";
import { limitExceeded } from "./node-sink.js";
import { fieldSizeUnit } from "./size-unit.js";

type Fields = Pick<
  LoadOptions,
  "nameField" | "childrenField" | "sizeField" | "keepFields" | "rootName" | "maxNodes"
>;

/**
 * An adjacency map as a graph: each key is a node id, and its value names its children by id: a list of
 * ids, or the node's own record (an object whose children field holds that list, with an optional name,
 * size and kept fields), or null for a node with no children. Ids are strings or numbers (a number
 * stands for its digits). An id that is no key is a node with no children and no record. Nodes are the
 * keys in map order, then the other ids in order of first mention; edges in map order.
 */
export function adjacencyNodes(value: unknown, options: Fields): GraphNodes {
  if (typeof value !== "object" || value === null || Array.isArray(value))
    throw new EspalierError("SHAPE", "a graph read as an adjacency map must be an object (a mapping) of ids");
  const map = value as Record<string, unknown>;
  const keys = Object.keys(map);
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
  for (const key of keys) add(key);
  const names: string[] = [...ids];
  const sizes: number[] = new Array(ids.length).fill(0);
  let hasSizes = false;
  // Keys of the entries' own records, for the message of a named field no record has.
  const recordFields = new Set<string>();
  const kept = new Map<string, string[]>(options.keepFields.map((k) => [k, new Array(ids.length).fill("")]));
  const from: number[] = [];
  const to: number[] = [];
  const shape = (key: string, what: string) =>
    new EspalierError("SHAPE", say`the entry ${quoted.id(key)} ${what}`, { field: key });
  for (const key of keys) {
    const node = nodeOf.get(key)!;
    const value = map[key];
    let children: unknown = value;
    if (typeof value === "object" && value !== null && !Array.isArray(value)) {
      const record = value as Record<string, unknown>;
      for (const field of Object.keys(record)) recordFields.add(field);
      children = Object.hasOwn(record, options.childrenField) ? record[options.childrenField] : null;
      if (Object.hasOwn(record, options.nameField)) {
        const name = record[options.nameField];
        if (typeof name !== "string" && typeof name !== "number")
          throw shape(key, `has a "${options.nameField}" that is not text`);
        if (String(name) !== "") names[node] = String(name);
      }
      if (Object.hasOwn(record, options.sizeField)) {
        const size = record[options.sizeField];
        if (size !== null) {
          if (typeof size !== "number" || !isSize(size)) {
            throw new EspalierError(
              "BAD_SIZE",
              say`the "${options.sizeField}" of the entry ${quoted.id(key)} must be a number from 0 to 2^53 - 1, got ${quoted.value(typeof size === "string" ? size : JSON.stringify(size))}`,
              { field: key },
            );
          }
          sizes[node] = size;
          hasSizes = true;
        }
      }
      for (const [field, column] of kept) {
        const v = record[field];
        if (Object.hasOwn(record, field) && v !== null && v !== undefined)
          column[node] = typeof v === "object" ? JSON.stringify(v) : String(v);
      }
    } else if (value !== null && !Array.isArray(value)) {
      throw shape(key, "must be a list of child ids, a record or null");
    }
    if (children === null || children === undefined) continue;
    if (!Array.isArray(children))
      throw shape(key, `has "${options.childrenField}" that is not a list of ids`);
    for (const child of children) {
      if (typeof child !== "string" && typeof child !== "number")
        throw shape(key, "lists a child that is not an id (text or a number)");
      const id = String(child);
      if (id === "") throw shape(key, "lists an empty child id");
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
  return {
    name: names,
    ids,
    ownSize: Float64Array.from(sizes),
    hasSizes,
    sizeUnit: fieldSizeUnit(options.sizeField),
    origin: new Int32Array(ids.length),
    originIsRow: false,
    recordFields: [...recordFields],
    fields: kept,
    rootName: options.rootName,
    edgeFrom: Int32Array.from(from),
    edgeTo: Int32Array.from(to),
    edgeOrigin: new Int32Array(from.length),
    edgeCount: from.length,
    repeatedEdges: "skip",
    linkedBy: "map",
  };
}
