import { EspalierError, type MessagePart, quoted, type SourcePos, say } from "../errors.js";
import type { LinkedNodes } from "../model/linked-nodes.js";
import { isSize } from "../model/size-rule.js";
import { badNodeSize } from "./bad-node-size.js";
import { describeNode } from "./describe-node.js";
import { defaultLoadOptions, type LoadOptions } from "./load-options.js";
import { MISSING_FIELD, missingEntriesNote } from "./missing-entries.js";
import {
  atMostOneLevel,
  FieldsSeen,
  loneRoot,
  missingField,
  nameFieldNamed,
  sizeFieldNamed,
  wrapperChildren,
} from "./missing-field.js";
import { NodeSink } from "./node-sink.js";
import { countNodeObjects, NodesNotRead, type NotReadKind } from "./nodes-not-read.js";
import { otherFields, withOtherFields } from "./other-fields.js";
import { OtherColumns, OtherFieldsKept } from "./other-fields-kept.js";
import { fieldSizeUnit } from "./size-unit.js";

/** The children field by default (load-options.ts). */
const DEFAULT_CHILDREN = defaultLoadOptions.childrenField;

/** What a value in a parsed document is, as far as the walker cares. */
export const Kind = { Null: 0, Number: 1, String: 2, Boolean: 3, Seq: 4, Map: 5, Other: 6 } as const;
export type Kind = (typeof Kind)[keyof typeof Kind];

/** The walker's view of a parsed document; plain JSON values and YAML nodes each provide one. */
export interface NestedAccess<V> {
  kind(v: V | undefined): Kind;
  /** The value of `key` in a mapping, or undefined. */
  field(map: V, key: string): V | undefined;
  items(seq: V): readonly V[];
  /** Appends a mapping's keys and values, in input order. */
  entries(map: V, keys: string[], values: V[]): void;
  number(v: V): number;
  /** A scalar as text. */
  text(v: V): string;
  /** A collection as text, for kept fields. */
  source(v: V): string;
  /** 1-based line where `v` starts; 0 when unknown. */
  line(v: V | undefined): number;
  /** Where `v` is in the input, when known. */
  pos(v: V | undefined): SourcePos | undefined;
  /**
   * Marks a node object (`role` "node") or children list (`role` "children") as placed by node `owner`;
   * -1 when it was not placed before, else the node that placed it first (a YAML alias reaches the same
   * value again).
   */
  claim(v: V, owner: number, role: "node" | "children"): number;
  /** The value itself, an alias's target for an alias: the same for every way the value is reached. */
  target(v: V): unknown;
}

/**
 * Walks a nested document: the top level is one node object or an array of them; a node holds a name,
 * an own size and children, either an array of node objects or a mapping from child name to a node
 * object, a number (a leaf of that size) or null (a leaf). Nodes are numbered as they are discovered
 * (siblings in input order), so the walk is a loop over that numbering, with no recursion.
 * A value reached a second time (a YAML alias of a node object or of a children list) is placed once,
 * where the walk (breadth-first, then input order) first reaches it; every other place it is reached
 * holds one-line references (`referenceOf`): a node object becomes a reference to its full entry, a
 * children list gives one reference per child, to that child's entry. References have no size, no
 * children and count in no node count, so every size and count adds up once.
 */
export function walkNested<V>(
  root: V,
  access: NestedAccess<V>,
  options: LoadOptions,
  found = false,
): LinkedNodes {
  const { nameField, sizeField, childrenField, keepFields } = options;
  const sink = new NodeSink(options.maxNodes, false);
  const pending: (V | undefined)[] = [];
  // keyed[i] = 1 when node i is a value in a children mapping: its key is its name.
  let keyed = new Uint8Array(1024);
  const kept = keepFields.map(() => [] as string[]);
  const keptSeen = keepFields.map(() => false);
  // Every other field of the node objects, kept as they are walked (LoadOptions.keepOtherFields).
  const others = options.keepOtherFields === true ? new OtherFieldsKept(options) : undefined;
  const otherColumns = new OtherColumns();
  // Keys of the first node objects, for the message of a field no node has.
  const seen = new FieldsSeen();
  let hasNames = false;
  // Where a node first held an object or array under `children` while another field holds children.
  let unreadChildrenAt: SourcePos | undefined;
  // Nodes not keyed by name (their name comes from the name field, or is "").
  let unkeyed = 0;
  // referenceOf[i] = the node whose full entry node i stands for, -1 for a full entry.
  let referenceOf = new Int32Array(1024).fill(-1);
  // empty[i] = 1 when node i's object has no field at all (`{}`).
  let empty: Uint8Array<ArrayBuffer> | undefined;
  let emptyEntries = 0;
  // Node objects holding `"missing": true` (missing-entries.ts), the first, and the line of its field.
  let missingEntries = 0;
  let firstMissing = -1;
  let firstMissingLine = 0;
  let references = 0;
  const refer = (i: number, to: number) => {
    while (i >= referenceOf.length) {
      const grown = new Int32Array(referenceOf.length * 2).fill(-1);
      grown.set(referenceOf);
      referenceOf = grown;
    }
    referenceOf[i] = to;
    references++;
  };
  // A node's children: the index of the first and how many (they are added together).
  const childStart = new Map<number, number>();
  const childCount = new Map<number, number>();

  const rootKind = access.kind(root);
  if (rootKind === Kind.Map) {
    sink.add(-1, "", access.line(root));
    pending.push(root);
  } else if (rootKind === Kind.Seq) {
    for (const item of access.items(root)) {
      sink.add(-1, "", access.line(item));
      pending.push(item);
    }
    if (sink.length === 0) throw new EspalierError("INPUT_EMPTY", "the top-level array holds no nodes");
  } else {
    throw new EspalierError(
      "SHAPE",
      "the top level must be a node object or an array of them",
      access.pos(root),
    );
  }

  const where = (i: number) => describeNode(sink.parentOf, sink.name, i);
  const badSize = (shown: MessagePart, i: number, field: string | undefined, pos: SourcePos | undefined) =>
    badNodeSize(sink.parentOf, sink.name, i, shown, field, pos);
  const keys: string[] = [];
  const values: V[] = [];
  // The node objects read, by node (undefined for a leaf or a reference): their other fields are looked
  // through for node objects once all are read (see notReadNote).
  const read: (V | undefined)[] = [];
  for (let i = 0; i < sink.length; i++) {
    const v = pending[i] as V;
    pending[i] = undefined;
    if (i < referenceOf.length && referenceOf[i] !== -1) {
      // A reference made for a child of a children list placed before: nothing more to read.
      for (const column of kept) column.push("");
      continue;
    }
    const kind = access.kind(v);
    if (kind !== Kind.Map) {
      if (keyed[i] === 1 && kind === Kind.Number) {
        const size = access.number(v);
        if (!isSize(size)) throw badSize(quoted.excerpt(access.text(v)), i, undefined, access.pos(v));
        sink.ownSize[i] = size;
        sink.hasSizes = true;
      } else if (keyed[i] !== 1 || kind !== Kind.Null) {
        const expected = keyed[i] === 1 ? "a node object, a number or null" : "a node object";
        throw new EspalierError("SHAPE", say`${where(i)} must be ${expected}`, access.pos(v));
      }
      for (const column of kept) column.push("");
      continue;
    }
    const placedAt = access.claim(v, i, "node");
    if (placedAt === -1) read[i] = v;
    if (placedAt !== -1) {
      // The same node object again (an alias): a reference to its full entry.
      refer(i, placedAt);
      for (const column of kept) column.push("");
      continue;
    }
    if (seen.wants(i) || others !== undefined) {
      keys.length = 0;
      values.length = 0;
      access.entries(v, keys, values);
      if (seen.wants(i)) for (const key of keys) seen.add(key);
      if (others !== undefined)
        for (let k = 0; k < keys.length; k++)
          if (others.keeps(keys[k])) otherColumns.set(keys[k], i, fieldText(access, values[k]));
    }

    const nameValue = access.field(v, nameField);
    if (keyed[i] !== 1) {
      unkeyed++;
      const nameKind = access.kind(nameValue);
      if (nameKind === Kind.String || nameKind === Kind.Number || nameKind === Kind.Boolean) {
        sink.name.setString(i, access.text(nameValue as V));
        hasNames = true;
      } else if (nameKind !== Kind.Null) {
        throw new EspalierError(
          "SHAPE",
          say`the "${nameField}" of ${where(i)} must be text`,
          access.pos(nameValue),
        );
      }
    }

    const sizeValue = access.field(v, sizeField);
    const sizeKind = access.kind(sizeValue);
    if (sizeKind === Kind.Number) {
      const size = access.number(sizeValue as V);
      if (!isSize(size)) {
        // As written: a size past 2^53 - 1 must not be shown as its rounded neighbour.
        throw badSize(
          quoted.excerpt(access.source(sizeValue as V) || access.text(sizeValue as V)),
          i,
          undefined,
          access.pos(sizeValue),
        );
      }
      sink.ownSize[i] = size;
      sink.hasSizes = true;
    } else if (sizeKind !== Kind.Null) {
      const shown = sizeKind === Kind.String ? quoted.value(access.text(sizeValue as V)) : "a non-number";
      throw badSize(shown, i, sizeField, access.pos(sizeValue));
    }

    for (let f = 0; f < keepFields.length; f++) {
      const value = access.field(v, keepFields[f]);
      if (access.kind(value) !== Kind.Null || value !== undefined) keptSeen[f] = true;
      kept[f].push(value === undefined ? "" : fieldText(access, value));
    }

    const missing = access.field(v, MISSING_FIELD);
    if (access.kind(missing) === Kind.Boolean && access.text(missing as V) === "true") {
      if (missingEntries++ === 0) {
        firstMissing = i;
        firstMissingLine = access.line(missing);
      }
    }

    const children = access.field(v, childrenField);
    const childrenKind = access.kind(children);
    if (unreadChildrenAt === undefined && childrenField !== DEFAULT_CHILDREN) {
      // Children under `children` while another field is read for them (see wrapperChildren).
      const other = access.field(v, DEFAULT_CHILDREN);
      const otherKind = access.kind(other);
      if (otherKind === Kind.Seq || otherKind === Kind.Map) unreadChildrenAt = access.pos(other as V) ?? {};
    }
    if (nameValue === undefined && sizeValue === undefined && children === undefined) {
      // No name, size or children: an empty entry when the object has no field at all (`{}`).
      keys.length = 0;
      values.length = 0;
      access.entries(v, keys, values);
      if (keys.length === 0) {
        empty ??= new Uint8Array(Math.max(1024, sink.parentOf.length));
        while (i >= empty.length) empty = grownFlags(empty);
        empty[i] = 1;
        emptyEntries++;
      }
    }
    if (childrenKind === Kind.Null) continue;
    if (childrenKind !== Kind.Seq && childrenKind !== Kind.Map) {
      throw new EspalierError(
        "SHAPE",
        say`the "${childrenField}" of ${where(i)} must be an array or an object keyed by child name`,
        access.pos(children),
      );
    }
    const listedAt = access.claim(children as V, i, "children");
    if (listedAt !== -1) {
      // The same children list again (an alias): one reference per child of the list's first place.
      const start = childStart.get(listedAt) ?? 0;
      const count = childCount.get(listedAt) ?? 0;
      for (let c = 0; c < count; c++) {
        const j = sink.add(i, keyed[start + c] === 1 ? sink.name.get(start + c) : "", access.line(children));
        pending.push(undefined);
        if (j >= keyed.length) keyed = grownFlags(keyed);
        keyed[j] = keyed[start + c];
        refer(j, start + c);
      }
      continue;
    }
    const first = sink.length;
    if (childrenKind === Kind.Seq) {
      for (const item of access.items(children as V)) {
        sink.add(i, "", access.line(item));
        pending.push(item);
      }
    } else {
      keys.length = 0;
      values.length = 0;
      access.entries(children as V, keys, values);
      for (let c = 0; c < keys.length; c++) {
        const j = sink.add(i, keys[c], access.line(values[c]));
        pending.push(values[c]);
        if (j >= keyed.length) keyed = grownFlags(keyed);
        keyed[j] = 1;
      }
    }
    childStart.set(i, first);
    childCount.set(i, sink.length - first);
  }

  // A reference stands for its target's full entry (a reference's target may be one itself: follow it);
  // one in a list takes the entry's name, one keyed by name keeps its key.
  const linkedReferences = references > 0 ? referenceOf.slice(0, sink.length) : undefined;
  if (linkedReferences) {
    for (let j = 0; j < linkedReferences.length; j++) {
      let to = linkedReferences[j];
      if (to === -1) continue;
      while (linkedReferences[to] !== -1) to = linkedReferences[to];
      linkedReferences[j] = to;
      if (keyed[j] !== 1) sink.name.setString(j, sink.name.get(to));
    }
  }
  const fields = new Map<string, string[]>();
  for (let f = 0; f < keepFields.length; f++) {
    if (!keptSeen[f]) {
      if (options.optionalKeepFields?.includes(keepFields[f])) continue;
      throw missingField("kept", keepFields[f], seen.list(), true);
    }
    fields.set(keepFields[f], kept[f]);
  }
  for (const [field, column] of otherColumns.fields(sink.length)) fields.set(field, column);
  // The one node's mapping: the top-level one, or a top-level sequence's one item.
  const lone = rootKind === Kind.Map ? root : rootKind === Kind.Seq ? access.items(root)[0] : undefined;
  if (sink.length === 1 && lone !== undefined && access.kind(lone) === Kind.Map) {
    // One node, from a top-level mapping that holds more than that node: say so, never print one line.
    keys.length = 0;
    values.length = 0;
    access.entries(lone, keys, values);
    const nested = keys.filter((key, k) => {
      if (key === childrenField || key === nameField || key === sizeField || keepFields.includes(key))
        return false;
      const kind = access.kind(values[k]);
      return kind === Kind.Map || kind === Kind.Seq;
    });
    if (nested.length > 0) throw loneRoot(childrenField, nested, "yaml", rootKind === Kind.Seq);
  }
  if (unreadChildrenAt !== undefined && atMostOneLevel(sink.parentOf, sink.length))
    throw wrapperChildren(childrenField, unreadChildrenAt, "yaml");
  if (!sink.hasSizes && sizeFieldNamed(options)) throw missingField("size", sizeField, seen.list(), true);
  if (!hasNames && nameFieldNamed(options)) throw missingField("name", nameField, seen.list(), true);
  sink.nameNamelessTop(options.rootName);
  const missingNote =
    missingEntries === 0
      ? undefined
      : missingEntriesNote(missingEntries, where(firstMissing), firstMissingLine || undefined);
  const notRead = notReadNote(read, access, options, where);
  const notes = [...(notRead ? [notRead] : []), ...(missingNote ? [missingNote] : [])];
  const linked = sink.finish(options.rootName, fields, null, {
    shape: "nodes",
    sizeUnit: fieldSizeUnit(options.sizeField),
    childrenField,
    ...(found ? { childrenFieldFound: true } : {}),
    ...(emptyEntries > 0 ? { emptyEntries } : {}),
    ...(!hasNames && unkeyed > 1 ? { unnamed: nameField } : {}),
    ...(notes.length > 0 ? { notes } : {}),
    ...(others !== undefined ? others.reading() : withOtherFields(otherFields(seen.list(), options))),
  });
  const withEmpty = empty === undefined ? linked : { ...linked, empty: empty.slice(0, sink.length) };
  return linkedReferences ? { ...withEmpty, referenceOf: linkedReferences } : withEmpty;
}

/**
 * NODES_NOT_READ (nodes-not-read.ts) for the node objects `read` (by node): the node objects in their
 * fields that are not read as nodes (all but the name, size and children fields), each value counted once
 * however many aliases reach it, and none that is read as a node. Places in document order.
 */
function notReadNote<V>(
  read: readonly (V | undefined)[],
  access: NestedAccess<V>,
  options: LoadOptions,
  where: (i: number) => MessagePart[],
) {
  const { nameField, sizeField, childrenField } = options;
  const seen = new Set<unknown>();
  for (const v of read) if (v !== undefined) seen.add(access.target(v));
  const counting = {
    isMap: (v: V) => access.kind(v) === Kind.Map,
    isSeq: (v: V) => access.kind(v) === Kind.Seq,
    items: (v: V) => access.items(v),
    entries: (v: V, keys: string[], values: V[]) => access.entries(v, keys, values),
    size: (v: V | undefined) => {
      if (access.kind(v) !== Kind.Number) return undefined;
      const size = access.number(v as V);
      return isSize(size) ? size : undefined;
    },
    target: (v: V) => access.target(v),
  };
  const places: {
    key: string;
    node: number;
    line: number;
    count: number;
    size: number;
    kind: NotReadKind;
  }[] = [];
  const keys: string[] = [];
  const values: V[] = [];
  for (let i = 0; i < read.length; i++) {
    const v = read[i];
    if (v === undefined) continue;
    keys.length = 0;
    values.length = 0;
    access.entries(v, keys, values);
    for (let k = 0; k < keys.length; k++) {
      const key = keys[k];
      if (key === nameField || key === sizeField || key === childrenField) continue;
      const kind = access.kind(values[k]);
      if (kind !== Kind.Map && kind !== Kind.Seq) continue;
      const { count, size } = countNodeObjects(values[k], options, counting, seen);
      if (count === 0) continue;
      const shaped =
        kind === Kind.Map &&
        [nameField, sizeField, childrenField].some((f) => access.field(values[k], f) !== undefined);
      places.push({
        key,
        node: i,
        line: access.line(values[k]),
        count,
        size,
        kind: kind === Kind.Seq ? "list" : shaped ? "node" : "map",
      });
    }
  }
  if (places.length === 0) return undefined;
  places.sort((a, b) => a.line - b.line);
  const notRead = new NodesNotRead();
  for (const p of places) notRead.add(p.key, p.node, p.line, p.count, p.size, p.kind);
  return notRead.note(options, "yaml", where);
}

/** A field's value as kept: a scalar's text, an object's or array's source text, "" for null. */
function fieldText<V>(access: NestedAccess<V>, value: V): string {
  const k = access.kind(value);
  return k === Kind.Null ? "" : k === Kind.Seq || k === Kind.Map ? access.source(value) : access.text(value);
}

function grownFlags(flags: Uint8Array<ArrayBuffer>): Uint8Array<ArrayBuffer> {
  const grown = new Uint8Array(flags.length * 2);
  grown.set(flags);
  return grown;
}
