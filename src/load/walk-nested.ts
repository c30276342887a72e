import { EspalierError, type MessagePart, quoted, quotedList, type SourcePos, say } from "../errors.js";
import type { LinkedNodes } from "../model/linked-nodes.js";
import { isSize } from "../model/size-rule.js";
import { describeNode } from "./describe-node.js";
import type { LoadOptions } from "./load-options.js";
import { FieldsSeen, missingField, nameFieldNamed, sizeFieldNamed } from "./missing-field.js";
import { NodeSink } from "./node-sink.js";
import { fieldSizeUnit } from "./size-unit.js";

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
  /** Marks a node or children list as placed; false when it already was (an alias placed it twice). */
  claim(v: V): boolean;
}

/**
 * Walks a nested document: the top level is one node object or an array of them; a node holds a name,
 * an own size and children, either an array of node objects or a mapping from child name to a node
 * object, a number (a leaf of that size) or null (a leaf). Nodes are numbered as they are discovered
 * (siblings in input order), so the walk is a loop over that numbering, with no recursion.
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
  // Keys of the first node objects, for the message of a field no node has.
  const seen = new FieldsSeen();
  let hasNames = false;

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
  const keys: string[] = [];
  const values: V[] = [];
  for (let i = 0; i < sink.length; i++) {
    const v = pending[i] as V;
    pending[i] = undefined;
    const kind = access.kind(v);
    if (kind !== Kind.Map) {
      if (keyed[i] === 1 && kind === Kind.Number) {
        const size = access.number(v);
        if (!isSize(size)) throw badSize(quoted.excerpt(access.text(v)), where(i), access.pos(v));
        sink.ownSize[i] = size;
        sink.hasSizes = true;
      } else if (keyed[i] !== 1 || kind !== Kind.Null) {
        const expected = keyed[i] === 1 ? "a node object, a number or null" : "a node object";
        throw new EspalierError("SHAPE", say`${where(i)} must be ${expected}`, access.pos(v));
      }
      for (const column of kept) column.push("");
      continue;
    }
    if (!access.claim(v)) throw twoParents(where(i), access.pos(v));
    if (seen.wants(i)) {
      keys.length = 0;
      values.length = 0;
      access.entries(v, keys, values);
      for (const key of keys) seen.add(key);
    }

    if (keyed[i] !== 1) {
      const nameValue = access.field(v, nameField);
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
          where(i),
          access.pos(sizeValue),
        );
      }
      sink.ownSize[i] = size;
      sink.hasSizes = true;
    } else if (sizeKind !== Kind.Null) {
      const shown = sizeKind === Kind.String ? quoted.value(access.text(sizeValue as V)) : "a non-number";
      throw new EspalierError(
        "BAD_SIZE",
        say`the "${sizeField}" of ${where(i)} must be a number from 0 to 2^53 - 1, got ${shown}`,
        access.pos(sizeValue),
      );
    }

    for (let f = 0; f < keepFields.length; f++) {
      const value = access.field(v, keepFields[f]);
      const k = access.kind(value);
      if (k !== Kind.Null || value !== undefined) keptSeen[f] = true;
      kept[f].push(
        k === Kind.Null
          ? ""
          : k === Kind.Seq || k === Kind.Map
            ? access.source(value as V)
            : access.text(value as V),
      );
    }

    const children = access.field(v, childrenField);
    const childrenKind = access.kind(children);
    if (childrenKind === Kind.Null) continue;
    if (childrenKind !== Kind.Seq && childrenKind !== Kind.Map) {
      throw new EspalierError(
        "SHAPE",
        say`the "${childrenField}" of ${where(i)} must be an array or an object keyed by child name`,
        access.pos(children),
      );
    }
    if (!access.claim(children as V))
      throw twoParents(say`the "${childrenField}" of ${where(i)}`, access.pos(children));
    if (childrenKind === Kind.Seq) {
      for (const item of access.items(children as V)) {
        sink.add(i, "", access.line(item));
        pending.push(item);
      }
      continue;
    }
    keys.length = 0;
    values.length = 0;
    access.entries(children as V, keys, values);
    for (let c = 0; c < keys.length; c++) {
      const j = sink.add(i, keys[c], access.line(values[c]));
      pending.push(values[c]);
      if (j >= keyed.length) {
        const grown = new Uint8Array(keyed.length * 2);
        grown.set(keyed);
        keyed = grown;
      }
      keyed[j] = 1;
    }
  }

  const fields = new Map<string, string[]>();
  for (let f = 0; f < keepFields.length; f++) {
    if (!keptSeen[f]) throw missingField("kept", keepFields[f], seen.list(), true);
    fields.set(keepFields[f], kept[f]);
  }
  if (sink.length === 1 && rootKind === Kind.Map) {
    // One node, from a top-level mapping that holds more than that node: say so, never print one line.
    keys.length = 0;
    values.length = 0;
    access.entries(root, keys, values);
    const nested = keys.filter((key, k) => {
      if (key === childrenField || key === nameField || key === sizeField || keepFields.includes(key))
        return false;
      const kind = access.kind(values[k]);
      return kind === Kind.Map || kind === Kind.Seq;
    });
    if (nested.length > 0) {
      throw new EspalierError(
        "FIELD_MISSING",
        say`no node has the children field "${childrenField}", so the input would be one node; the top-level mapping's fields holding mappings or sequences are ${quotedList("name", nested)}: name the one holding the children with --children-field, or read every value with --read-as values`,
      );
    }
  }
  if (!sink.hasSizes && sizeFieldNamed(options)) throw missingField("size", sizeField, seen.list(), true);
  if (!hasNames && nameFieldNamed(options)) throw missingField("name", nameField, seen.list(), true);
  return sink.finish(options.rootName, fields, null, {
    shape: "nodes",
    sizeUnit: fieldSizeUnit(options.sizeField),
    childrenField,
    ...(found ? { childrenFieldFound: true } : {}),
  });
}

function badSize(shown: MessagePart, where: MessagePart[], pos: SourcePos | undefined): EspalierError {
  return new EspalierError(
    "BAD_SIZE",
    say`the size of ${where} must be a number from 0 to 2^53 - 1, got ${shown}`,
    pos,
  );
}

function twoParents(what: MessagePart[], pos: SourcePos | undefined): EspalierError {
  return new EspalierError(
    "TWO_PARENTS",
    say`${what} is an alias of something already placed in the tree, so a node would have two parents`,
    pos,
  );
}
