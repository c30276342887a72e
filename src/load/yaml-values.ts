import { Buffer } from "node:buffer";
import { isAlias, isMap, isScalar, isSeq, type LineCounter, type Node } from "yaml";
import { type MessagePart, quoted, say } from "../errors.js";
import type { LinkedNodes } from "../model/linked-nodes.js";
import type { ReadingNote } from "../model/reading-note.js";
import { byNode } from "./by-node.js";
import { describeNode } from "./describe-node.js";
import {
  EMPTY_ARRAY,
  EMPTY_OBJECT,
  ITEM_NAME_FIELD,
  type LoadOptions,
  MOST_ITEM_NAMES,
  SCALAR_VALUE_FIELD,
} from "./load-options.js";
import { checkNoNamedFields } from "./missing-field.js";
import { NodeSink } from "./node-sink.js";
import { isMergeKey, keyText } from "./yaml-keys.js";
import { pairItems } from "./yaml-pair-items.js";

/**
 * A YAML document as a tree of its values, as JsonValueLoader reads JSON: a mapping's entries are its
 * children, named by their keys, a sequence's items are named by index, scalars and aliases are leaves
 * (an alias is its own text, `*name`: nothing is expanded, so no byte is counted twice; an
 * ALIASES_AS_TEXT note says so). A value's size
 * is the UTF-8 byte length of its source text, so a node's own size is what its text holds beyond its
 * children's values; the root is the whole document (comments and markers too), so its size is the
 * document's. Merge keys are entries like any other here (`<<`): the bytes are where they are written.
 * Several documents (a YAML stream) are the root's children, named by index, as a sequence's items.
 */
export function yamlValues(
  documents: readonly (Node | null)[],
  text: string,
  lineCounter: LineCounter,
  options: LoadOptions,
): LinkedNodes {
  checkNoNamedFields(options, "values");
  const sink = new NodeSink(options.maxNodes, false);
  const toBytes = byteOffsets(text);
  const lineOf = (v: Node | null) => (v?.range ? lineCounter.linePos(v.range[0]).line : 0);
  const lengthOf = (v: Node | null) => (v?.range ? toBytes(v.range[1]) - toBytes(v.range[0]) : 0);

  // Each node's value, visited in the order nodes are added (pre-order by index).
  const stream = documents.length > 1;
  const scalars: string[] | null = options.keepScalars ? [] : null;
  // The list items with a `name` string (see ITEM_NAME_FIELD), and those strings.
  const namedItems: number[] = [];
  const itemNames: string[] = [];
  const pending: (Node | null)[] = [stream ? null : documents[0]];
  sink.add(-1, options.rootName, stream ? 1 : lineOf(documents[0]));
  // Aliases read (each a leaf of its own text), and the first: its node, text and line.
  let aliases = 0;
  let firstAlias: { node: number; text: string; line: number } | undefined;
  // Merge keys (`<<`) whose value is an alias, or a list holding one: their mappings' keys are not repeated.
  let merges = 0;
  for (let i = 0; i < sink.length; i++) {
    const v = pending[i];
    pending[i] = null;
    if (isAlias(v) && aliases++ === 0)
      firstAlias = {
        node: i,
        text: v.range ? text.slice(v.range[0], v.range[1]) : `*${v.source}`,
        line: lineOf(v),
      };
    // The root is the whole text, but under --start-at the part read (its own length).
    const own = i === 0 && !options.startAt ? Buffer.byteLength(text, "utf8") : lengthOf(v);
    let inner = 0;
    if (i === 0 && stream) {
      documents.forEach((doc, k) => {
        const j = sink.add(i, String(k), lineOf(doc));
        pending[j] = doc;
        inner += lengthOf(doc);
      });
    } else if (!isAlias(v) && isMap(v)) {
      for (const pair of v.items) {
        const value = (pair.value ?? null) as Node | null;
        if (isMergeKey(pair.key) && (isAlias(value) || (isSeq(value) && value.items.some(isAlias)))) merges++;
        const j = sink.add(i, keyText(pair.key), lineOf(value) || lineOf(pair.key as Node | null));
        pending[j] = value;
        inner += lengthOf(value);
      }
    } else if (!isAlias(v) && isSeq(v)) {
      pairItems(v.items).forEach((item, k) => {
        const j = sink.add(i, String(k), lineOf(item as Node | null));
        const named = isAlias(item) ? undefined : itemName(item as Node | null);
        if (named !== undefined && namedItems.length <= MOST_ITEM_NAMES) {
          namedItems.push(j);
          itemNames.push(named);
        }
        pending[j] = item as Node | null;
        inner += lengthOf(item as Node | null);
      });
    }
    sink.ownSize[i] = own - inner;
    // A scalar's value for a diff to compare (LoadOptions.keepScalars), as JSON's value reader keeps it.
    if (scalars && v?.range && (isScalar(v) || isAlias(v))) scalars[i] = scalarText(v, text);
    else if (scalars) scalars[i] = isMap(v) ? EMPTY_OBJECT : isSeq(v) ? EMPTY_ARRAY : "";
  }
  sink.hasSizes = true;
  const fields = new Map<string, string[]>();
  if (scalars)
    fields.set(
      SCALAR_VALUE_FIELD,
      Array.from({ length: sink.length }, (_, i) => scalars[i] ?? ""),
    );
  const itemNamesField = byNode(sink.length, namedItems, itemNames, MOST_ITEM_NAMES);
  if (itemNamesField) fields.set(ITEM_NAME_FIELD, itemNamesField);
  const note =
    firstAlias &&
    aliasesNote(aliases, merges, firstAlias, describeNode(sink.parentOf, sink.name, firstAlias.node));
  return sink.finish(options.rootName, fields, null, {
    shape: "values",
    sizeUnit: "bytes",
    ...(stream ? { documents: documents.length } : {}),
    ...(note ? { notes: [note] } : {}),
  });
}

/**
 * ALIASES_AS_TEXT: a value tree shows an alias as a leaf like any scalar (`0  5 B`), though it stands
 * for a value written elsewhere, maybe a whole mapping (YAML 1.2.2 §3.2.2.2: a node in several places
 * is written once with an anchor, then as aliases). Nothing on a line can tell it, so a note says how
 * many there are and where the first is, and that what each names counts once, at its anchor. Merge
 * keys (`<<: *base`, the YAML 1.1 merge type, yaml.org/type/merge.html) are named apart: the keys a
 * mapping merges in are its own to a reader of 1.1, and here show only at their anchor.
 */
function aliasesNote(
  count: number,
  merges: number,
  first: { text: string; line: number },
  where: readonly MessagePart[],
): ReadingNote {
  const some = count === 1 ? "1 YAML alias is" : `${count} YAML aliases are`;
  const merged =
    merges === 0
      ? ""
      : `; ${merges === 1 ? "1 merge key (<<) names one" : `${merges} merge keys (<<) name some`}: the keys a mapping merges in (the YAML 1.1 merge type) show at their anchor only, not in the mapping that merges them`;
  return {
    code: "ALIASES_AS_TEXT",
    count,
    ...(first.line > 0 ? { line: first.line } : {}),
    parts: say`${some} read as leaves of their own text (the first: ${quoted.excerpt(first.text)}, ${where}): the value an alias names is counted once, where its anchor is, and not again where the alias stands${merged}; read as nodes (--read-as nodes), an alias of a node object is that node, shown as a reference`,
  };
}

/**
 * A scalar as a diff compares it, alike in YAML and JSON (json-value-loader.ts): a string as JSON
 * writes it (`"eu-west"`, whether plain, quoted or a block in the source: YAML 1.2 §7, §8), a boolean
 * or null as JSON's word, a number and an alias (`*base`) as written.
 */
function scalarText(v: Node, text: string): string {
  const source = text.slice(v.range![0], v.range![1]);
  if (!isScalar(v)) return source;
  if (typeof v.value === "string") return JSON.stringify(v.value);
  if (typeof v.value === "boolean" || v.value === null) return String(v.value);
  return source;
}

/** UTF-16 offsets of `text` to UTF-8 byte offsets, for offsets asked in any order. */
function byteOffsets(text: string): (offset: number) => number {
  if (Buffer.byteLength(text, "utf8") === text.length) return (offset) => offset;
  // Checkpoints every 4,096 code units; an offset costs the bytes of at most that much text.
  const STEP = 4096;
  const marks = new Float64Array(Math.floor(text.length / STEP) + 1);
  for (let k = 1; k < marks.length; k++) marks[k] = marks[k - 1] + utf8Length(text, (k - 1) * STEP, k * STEP);
  return (offset) => {
    const k = Math.floor(offset / STEP);
    return marks[k] + utf8Length(text, k * STEP, offset);
  };
}

/**
 * UTF-8 bytes of the code units `text[s, e)` as Buffer.from(text) encodes the whole text: a surrogate
 * pair is 4 bytes, counted at its high half (so a range may end between the halves), a lone surrogate
 * 3 (U+FFFD).
 */
function utf8Length(text: string, s: number, e: number): number {
  let bytes = 0;
  for (let k = s; k < e; k++) {
    const c = text.charCodeAt(k);
    if (c < 0x80) bytes += 1;
    else if (c < 0x800) bytes += 2;
    else if (c >= 0xd800 && c <= 0xdbff) {
      const d = k + 1 < text.length ? text.charCodeAt(k + 1) : 0;
      bytes += d >= 0xdc00 && d <= 0xdfff ? 4 : 3;
    } else if (c >= 0xdc00 && c <= 0xdfff) {
      const b = k > 0 ? text.charCodeAt(k - 1) : 0;
      bytes += b >= 0xd800 && b <= 0xdbff ? 0 : 3;
    } else bytes += 3;
  }
  return bytes;
}

/**
 * A list item's `name`: the string value of its mapping's entry keyed `name` (the last, where the key
 * repeats, as a mapping's value reads), undefined when the item is no mapping or holds no such string.
 */
function itemName(item: Node | null): string | undefined {
  if (!isMap(item)) return undefined;
  let found: string | undefined;
  for (const pair of item.items) {
    const key = pair.key as Node | null;
    if (!isScalar(key) || key.value !== "name") continue;
    const value = pair.value as Node | null;
    found = isScalar(value) && typeof value.value === "string" ? value.value : undefined;
  }
  return found;
}
