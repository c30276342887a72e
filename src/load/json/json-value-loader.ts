import { Buffer } from "node:buffer";
import type { LinkedNodes } from "../../model/linked-nodes.js";
import { byNode } from "../by-node.js";
import {
  EMPTY_ARRAY,
  EMPTY_OBJECT,
  ITEM_NAME_FIELD,
  type LoadOptions,
  MOST_ITEM_NAMES,
  SCALAR_VALUE_FIELD,
} from "../load-options.js";
import { checkNoNamedFields } from "../missing-field.js";
import { NodeSink } from "../node-sink.js";
import { ByteBuffer } from "./byte-buffer.js";
import { JsonTokenizer } from "./json-tokenizer.js";

/**
 * Any JSON document as a tree of its values, read from UTF-8 bytes whole or in chunks: every value is a
 * node; an object's members are its children, named by their keys, an array's elements are named by
 * their index ("0", "1", …), scalars are leaves. A node's path is then the RFC 6901 JSON Pointer of its
 * value. A value's size is the UTF-8 byte length of its source text, from its first character to its
 * last, so a node's own size is what its text holds beyond its children's values (keys, punctuation,
 * white space) and every subtree's size is its value's length. The root is the whole document: its own
 * size takes the white space around the value too, so its size is the document's (under `--start-at`,
 * the value read: the part's own length).
 */
export class JsonValueLoader extends JsonTokenizer {
  private readonly options: LoadOptions;
  private readonly sink: NodeSink;
  // Open containers: the node, where its text starts, how many bytes its children's values take, the
  // index of its next element.
  private node = new Float64Array(64);
  private start = new Float64Array(64);
  private inner = new Float64Array(64);
  private nextIndex = new Float64Array(64);
  private objectAt = new Float64Array(64);
  // The key of the member whose value comes next: its bytes, or its text when it has escapes.
  private readonly keyBytes = new ByteBuffer();
  private keyText: string | null = null;

  /** The list items with a `name` string (see ITEM_NAME_FIELD), in the order read, and those strings. */
  private readonly namedItems: number[] = [];
  private readonly itemNames: string[] = [];

  /** Each value as a diff compares it by node (`options.keepScalars`; objects and arrays their kind), else null. */
  private readonly scalars: string[] | null;

  constructor(options: LoadOptions) {
    super(options.limits);
    checkNoNamedFields(options, "values");
    this.options = options;
    this.sink = new NodeSink(options.maxNodes, false);
    this.scalars = options.keepScalars ? [] : null;
  }

  /** Ends the input; the nodes, ready for `buildTree`. */
  end(): LinkedNodes {
    this.endTokens();
    const sink = this.sink;
    // The root's own size takes the white space around the value: the whole document is accounted
    // (not under --start-at, where all but the value read is blanked: the root is that value).
    if (!this.options.startAt) sink.ownSize[0] += this.base - this.rootLength;
    sink.hasSizes = true;
    const fields = new Map<string, string[]>();
    const scalars = this.scalars;
    if (scalars)
      fields.set(
        SCALAR_VALUE_FIELD,
        Array.from({ length: sink.length }, (_, i) => scalars[i] ?? ""),
      );
    const itemNames = byNode(sink.length, this.namedItems, this.itemNames, MOST_ITEM_NAMES);
    if (itemNames) fields.set(ITEM_NAME_FIELD, itemNames);
    const notes = this.notUtf8Notes();
    return sink.finish(this.options.rootName, fields, null, {
      shape: "values",
      sizeUnit: "bytes",
      ...(notes.length > 0 ? { notes } : {}),
    });
  }

  // The length of the top-level value.
  private rootLength = 0;

  /** A node for the next value, named by its key or index. */
  private addValue(): number {
    const top = this.depth - 1;
    const sink = this.sink;
    const line = this.pos.line;
    let i: number;
    if (top < 0) {
      i = sink.add(-1, this.options.rootName, line);
    } else if (this.isObjectAt(top)) {
      const parent = this.node[top];
      if (this.keyText !== null) i = sink.add(parent, this.keyText, line);
      else i = sink.addBytes(parent, this.keyBytes.bytes, 0, this.keyBytes.length, line);
    } else {
      i = sink.add(this.node[top], String(this.nextIndex[top]++), line);
    }
    return i;
  }

  /** A value of `length` bytes inside the container at level `parent` (-1: the top level) ended. */
  private ended(parent: number, length: number): void {
    if (parent >= 0) this.inner[parent] += length;
    else this.rootLength = length;
  }

  private isObjectAt(top: number): boolean {
    return this.objectAt[top] === 1;
  }

  protected open(i: number, object: boolean): void {
    const node = this.addValue();
    const top = this.depth;
    if (top === this.node.length) this.grow();
    this.node[top] = node;
    this.start[top] = this.base + i;
    this.inner[top] = 0;
    this.nextIndex[top] = 0;
    this.objectAt[top] = object ? 1 : 0;
    if (this.scalars) this.scalars[node] = object ? EMPTY_OBJECT : EMPTY_ARRAY;
  }

  protected close(_buf: Buffer, i: number): void {
    const top = this.depth - 1;
    const length = this.base + i + 1 - this.start[top];
    this.sink.ownSize[this.node[top]] = length - this.inner[top];
    this.ended(top - 1, length);
  }

  protected nextItem(): void {}

  protected key(bytes: Uint8Array, q: number, e: number, absQ: number): void {
    if (this.escaped) {
      this.keyText = this.text(bytes, q, e, absQ);
    } else {
      this.keyText = null;
      this.keyBytes.clear();
      this.keyBytes.append(bytes, q + 1, e);
    }
  }

  protected stringValue(bytes: Uint8Array, q: number, e: number, absQ: number): void {
    // Kept as its value (escapes read, RFC 8259 §7) written as JSON, so "\u0061" and "a" are one value
    // and a YAML version's strings compare alike (yaml-values.ts).
    const text = this.scalars ? JSON.stringify(this.text(bytes, q, e, absQ)) : undefined;
    // A list item's `name` member: an object whose container is an array.
    const top = this.depth - 1;
    // Past MOST_ITEM_NAMES none is kept (byNode): no more are read.
    if (
      top >= 1 &&
      this.objectAt[top] === 1 &&
      this.objectAt[top - 1] === 0 &&
      this.namedItems.length <= MOST_ITEM_NAMES &&
      this.keyIsName()
    )
      this.named(this.node[top], this.text(bytes, q, e, absQ));
    this.leaf(e - q + 1, bytes, q, e + 1, text);
  }

  /** The item `node` is named `name`; a repeated key's last value counts, as JSON.parse reads it. */
  private named(node: number, name: string): void {
    const last = this.namedItems.length - 1;
    if (last >= 0 && this.namedItems[last] === node) this.itemNames[last] = name;
    else {
      this.namedItems.push(node);
      this.itemNames.push(name);
    }
  }

  /** Whether the key of the member whose value comes next is `name`. */
  private keyIsName(): boolean {
    if (this.keyText !== null) return this.keyText === "name";
    const { bytes, length } = this.keyBytes;
    // "name" in UTF-8.
    return length === 4 && bytes[0] === 0x6e && bytes[1] === 0x61 && bytes[2] === 0x6d && bytes[3] === 0x65;
  }

  protected number(bytes: Uint8Array, s: number, e: number): void {
    this.leaf(e - s, bytes, s, e);
  }

  protected word(word: Uint8Array): void {
    this.leaf(word.length, word, 0, word.length);
  }

  protected chunkEnd(): void {}

  /** A scalar of `length` bytes, its source text `bytes[s, e)` (kept as `text` when given). */
  private leaf(length: number, bytes: Uint8Array, s: number, e: number, text?: string): void {
    const i = this.addValue();
    this.sink.ownSize[i] = length;
    this.ended(this.depth - 1, length);
    if (this.scalars)
      this.scalars[i] =
        text ?? Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString("utf8", s, e);
  }

  private grow(): void {
    this.node = twice(this.node);
    this.start = twice(this.start);
    this.inner = twice(this.inner);
    this.nextIndex = twice(this.nextIndex);
    this.objectAt = twice(this.objectAt);
  }
}

function twice(a: Float64Array): Float64Array<ArrayBuffer> {
  const grown = new Float64Array(a.length * 2);
  grown.set(a);
  return grown;
}
