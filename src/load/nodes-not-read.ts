import { type MessagePart, quoted, say } from "../errors.js";
import type { ReadingNote } from "../model/reading-note.js";
import { isSize } from "../model/size-rule.js";

/**
 * How a value outside the fields a node is read for holds node objects: a list of them (`list`), one
 * node object (`node`), or an object of them by key (`map`).
 */
export type NotReadKind = "list" | "node" | "map";

/** The fields a node object is read for: one of them in an object makes it node-shaped. */
export interface NodeFields {
  readonly nameField: string;
  readonly sizeField: string;
  readonly childrenField: string;
}

/**
 * Node objects a nested reading leaves out: those in a field of a node object other than the fields it
 * is read for (name, size, children, kept fields), as `{"name": "harbor", "children": [...], "extras":
 * [{"name": "quay", "size": 30}]}` holds `quay` under `extras`. Each such field value (a place) adds
 * how many node-shaped objects it holds, at any depth (an object holding the name, size or children
 * field), and the sum of their sizes; NODES_NOT_READ says so, so the tree's totals are never taken for
 * the whole document's in silence. Places are added in document order.
 */
export class NodesNotRead {
  private readonly node: number[] = [];
  private readonly line: number[] = [];
  private readonly count: number[] = [];
  private readonly size: number[] = [];
  private readonly key: number[] = [];
  private readonly kind: NotReadKind[] = [];
  private readonly keys: string[] = [];
  private readonly keyIndex = new Map<string, number>();

  /** Whether any place was added. */
  get any(): boolean {
    return this.node.length > 0;
  }

  /** Field `key` of node `node`, on `line`, holds `count` node objects of `size` in all. */
  add(key: string, node: number, line: number, count: number, size: number, kind: NotReadKind): void {
    let k = this.keyIndex.get(key);
    if (k === undefined) {
      k = this.keys.length;
      this.keys.push(key);
      this.keyIndex.set(key, k);
    }
    this.node.push(node);
    this.line.push(line);
    this.count.push(count);
    this.size.push(size);
    this.key.push(k);
    this.kind.push(kind);
  }

  /** Forgets the places of nodes `from` on (a repeated children field dropped them, with their fields). */
  dropFrom(from: number): void {
    let to = 0;
    for (let p = 0; p < this.node.length; p++) {
      if (this.node[p] >= from) continue;
      this.node[to] = this.node[p];
      this.line[to] = this.line[p];
      this.count[to] = this.count[p];
      this.size[to] = this.size[p];
      this.key[to] = this.key[p];
      this.kind[to] = this.kind[p];
      to++;
    }
    for (const column of [this.node, this.line, this.count, this.size, this.key, this.kind])
      column.length = to;
  }

  /**
   * NODES_NOT_READ, or undefined when no place was added. `where(node)`: the node the first place is a
   * field of, as messages name it (undefined when nodes were moved since, so its index may be stale).
   * `format`: which command line merges the fields into the children field.
   */
  note(
    fields: NodeFields,
    format: "json" | "yaml",
    where: (node: number) => readonly MessagePart[] | undefined,
  ): ReadingNote | undefined {
    if (this.node.length === 0) return undefined;
    let count = 0;
    let size = 0;
    let mergeable = true;
    const used: string[] = [];
    const usedSet = new Set<number>();
    for (let p = 0; p < this.node.length; p++) {
      count += this.count[p];
      size += this.size[p];
      if (this.kind[p] === "map") mergeable = false;
      if (!usedSet.has(this.key[p])) {
        usedSet.add(this.key[p]);
        used.push(this.keys[this.key[p]]);
      }
    }
    const line = this.line[0];
    const first = this.keys[this.key[0]];
    const of = where(this.node[0]);
    // Their size when they hold one: a document without sizes says none.
    const sized = size > 0 ? ` of size ${size}` : "";
    const objects = `${count === 1 ? "1 node object" : `${count} node objects`}${sized}`;
    const places = this.node.length;
    const more =
      places === 1
        ? ""
        : say`, and ${places - 1} more ${places === 2 ? "field value" : "field values"} so (${places} in all, under ${used.length === 1 ? "that key" : [used.length, " keys: ", ...keyList(used)]})`;
    const holder: MessagePart[] = of === undefined ? ["a node object"] : [...of];
    const merge = mergeable ? mergeLine(used, fields.childrenField, format) : undefined;
    const fix: MessagePart[] =
      merge === undefined
        ? ["read every value with --read-as values"]
        : say`read every value with --read-as values, or move them under "${fields.childrenField}" first: ${merge}`;
    return {
      code: "NODES_NOT_READ",
      ...(line > 0 ? { line } : {}),
      count,
      parts: say`the field ${quoted.name(first)} of ${holder} holds node objects (objects with "${fields.nameField}", "${fields.sizeField}" or "${fields.childrenField}") outside its "${fields.childrenField}"${more}: ${objects} in all, not read, and no total counts them; ${fix}`,
    };
  }
}

/** At most 5 keys, quoted, then `and N more`. */
function keyList(keys: readonly string[]): MessagePart[] {
  const parts: MessagePart[] = [];
  keys.slice(0, 5).forEach((key, k) => {
    if (k > 0) parts.push(", ");
    parts.push(quoted.name(key));
  });
  if (keys.length > 5) parts.push(` and ${keys.length - 5} more`);
  return parts;
}

/**
 * A jq program (for YAML, the same through yq's jq wrapper) that appends each of `keys`' values (a list,
 * or one node object) to the children list of every object holding it and deletes the key; undefined
 * when a key or the children field would need shell quoting beyond single quotes.
 */
function mergeLine(
  keys: readonly string[],
  childrenField: string,
  format: "json" | "yaml",
): MessagePart[] | undefined {
  if ([...keys, childrenField].some((k) => k.includes("'"))) return undefined;
  const children = `.[${JSON.stringify(childrenField)}]`;
  const names = keys.map((k) => JSON.stringify(k)).join(", ");
  const program = `walk(if type == "object" then reduce (${names}) as $k (.; if has($k) then ${children} = ((${children} // []) + (.[$k] | if type == "array" then . else [.] end)) | del(.[$k]) else . end) else . end)`;
  const command =
    format === "json" ? `jq '${program}' FILE` : `yq -y '${program}' FILE (the yq that wraps jq)`;
  return [quoted.excerpt(command)];
}

/** How countNodeObjects looks into a value JSON.parse made. */
export const plainValues = {
  isMap: (v: unknown) => typeof v === "object" && v !== null && !Array.isArray(v),
  isSeq: (v: unknown) => Array.isArray(v),
  items: (v: unknown) => v as readonly unknown[],
  entries(v: unknown, keys: string[], values: unknown[]) {
    for (const [key, value] of Object.entries(v as object)) {
      keys.push(key);
      values.push(value);
    }
  },
  size: (v: unknown) => (typeof v === "number" && isSize(v) ? v : undefined),
  target: (v: unknown) => v,
};

/**
 * Counts the node-shaped objects in a plain value read with JSON.parse or a YAML library, at any depth,
 * and the sum of their sizes: what a loader's NodesNotRead is told for one field value. For the loaders
 * that walk a parsed document (walk-nested.ts); `seen` keeps one value reached twice (a YAML alias)
 * from counting twice, and holds the node objects read as nodes.
 */
export function countNodeObjects<V>(
  value: V,
  fields: NodeFields,
  access: {
    isMap(v: V): boolean;
    isSeq(v: V): boolean;
    items(v: V): readonly V[];
    entries(v: V, keys: string[], values: V[]): void;
    size(v: V | undefined): number | undefined;
    target(v: V): unknown;
  },
  seen: Set<unknown>,
): { count: number; size: number } {
  let count = 0;
  let size = 0;
  const stack: V[] = [value];
  while (stack.length > 0) {
    const v = stack.pop() as V;
    const isMap = access.isMap(v);
    if (!isMap && !access.isSeq(v)) continue;
    const target = access.target(v);
    if (seen.has(target)) continue;
    seen.add(target);
    if (!isMap) {
      const items = access.items(v);
      for (let k = items.length - 1; k >= 0; k--) stack.push(items[k]);
      continue;
    }
    const keys: string[] = [];
    const values: V[] = [];
    access.entries(v, keys, values);
    let shaped = false;
    for (let k = 0; k < keys.length; k++) {
      const key = keys[k];
      if (key === fields.nameField || key === fields.childrenField) shaped = true;
      else if (key === fields.sizeField) {
        shaped = true;
        size += access.size(values[k]) ?? 0;
      }
    }
    if (shaped) count++;
    for (let k = values.length - 1; k >= 0; k--) stack.push(values[k]);
  }
  return { count, size };
}
