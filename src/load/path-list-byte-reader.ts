import { Buffer, isUtf8 } from "node:buffer";
import { EspalierError, quoted, say } from "../errors.js";
import { ChildTable, doubled, hashStep, mix, seed } from "../model/child-hash.js";
import type { LinkedNodes } from "../model/linked-nodes.js";
import type { LoadOptions } from "./load-options.js";
import { NodeSink } from "./node-sink.js";
import { parseSize } from "./parse-size.js";

const newline = 10;
const cr = 13;
const tab = 9;
const space = 32;
const slash = 47;
const EMPTY = Buffer.alloc(0);
/** Most bytes, and most names, decoded together. */

/**
 * `PathListReader` over UTF-8 bytes, for a path list read in chunks: the same lines give the same
 * nodes, origins and errors, but no line is decoded. Lines are cut, sizes parsed, each path compared with
 * the previous one and its segments hashed on the bytes themselves; only the name of a new node is
 * decoded, so a listing that repeats each directory on every line below it costs one string per node.
 *
 * Equal names must be equal bytes for the hash table to find them: valid UTF-8 has one spelling per
 * string, and a block with invalid bytes is first decoded (each bad sequence becomes U+FFFD, as the
 * in-memory path decodes it) and encoded again.
 */
export class PathListByteReader {
  private readonly sink: NodeSink;
  private sized: boolean | undefined;
  private firstLine = 0;
  private line = 0;
  // Children by (parent, name), hashed on the name's bytes seeded with the parent.
  private readonly table = new ChildTable();
  private explicit = new Uint8Array(1024);
  private created = false;
  // The previous path, prevBytes[prevStart, prevStart + prevLength) (prevView reads the same bytes four
  // at a time), and its nodes: stackNode[d] ends stackEnd[d] bytes in.
  private prevBytes: Buffer = EMPTY;
  private prevView = viewOf(EMPTY);
  private prevStart = 0;
  private prevLength = 0;
  private stackNode = new Int32Array(64);
  private stackEnd = new Int32Array(64);
  private stackDepth = 0;

  constructor(options: LoadOptions) {
    this.sink = new NodeSink(options.maxNodes, false);
  }

  /**
   * Reads the lines of `bytes[start, end)`, each ended by "\n" (a "\r" before it is dropped); the last
   * line needs no "\n". A caller feeding pieces must cut them after a "\n", which is never inside a
   * multi-byte character. The bytes are not kept past the next call, except the last path's.
   */
  lines(bytes: Buffer, start: number, end: number): void {
    if (!isUtf8(bytes.subarray(start, end))) {
      bytes = Buffer.from(bytes.toString("utf8", start, end), "utf8");
      start = 0;
      end = bytes.length;
    }
    const view = viewOf(bytes);
    while (start < end) {
      let stop = bytes.indexOf(newline, start);
      if (stop === -1 || stop >= end) stop = end;
      this.one(bytes, view, start, stop);
      start = stop + 1;
    }
  }

  /** The nodes, ready for `buildTree`. */
  finish(rootName: string): LinkedNodes {
    const sink = this.sink;
    if (sink.length === 0) throw new EspalierError("INPUT_EMPTY", "the path list names no paths");
    sink.hasSizes = this.sized === true;
    return sink.finish(rootName, new Map());
  }

  /** One line, `bytes[start, end)` without its "\n". */
  private one(bytes: Buffer, view: DataView, start: number, end: number): void {
    const line = ++this.line;
    if (end > start && bytes[end - 1] === cr) end--;
    if (isBlank(bytes, start, end)) return;
    let pathStart = start;
    let size = 0;
    if (this.sized === undefined) {
      const t = bytes.indexOf(tab, start);
      this.sized = t !== -1 && t < end;
      this.firstLine = line;
    }
    if (this.sized) {
      // Fast path: 1 to 15 digits, then the tab (exact in a double).
      let k = start;
      let value = 0;
      for (; k < end && k - start < 16; k++) {
        const d = bytes[k] - 48;
        if (d < 0 || d > 9) break;
        value = value * 10 + d;
      }
      let at = k;
      if (k > start && k - start <= 15 && k < end && bytes[k] === tab) {
        size = value;
      } else {
        at = bytes.indexOf(tab, start);
        if (at === -1 || at >= end) {
          throw new EspalierError(
            "PARSE_PATHS",
            `line ${line} has no size column before a tab, unlike line ${this.firstLine}`,
            { line },
          );
        }
        const text = bytes.toString("utf8", start, at);
        size = parseSize(text);
        if (!(size >= 0)) {
          throw new EspalierError(
            "BAD_SIZE",
            say`the size on line ${line} must be a number from 0 to 2^53 - 1, got ${quoted.value(text)}`,
            { line, column: 1 },
          );
        }
      }
      pathStart = at + 1;
    }
    const i = this.place(bytes, view, pathStart, end, line);
    if (i === -1) {
      // The column counts UTF-16 code units, as in the in-memory reader.
      const column = bytes.toString("utf8", start, pathStart).length + 1;
      throw new EspalierError("PARSE_PATHS", `line ${line} has a size but no path`, { line, column });
    }
    this.sink.ownSize[i] = size;
  }

  /**
   * The node named by the path `bytes[start, end)`, as PathPlacer.place finds it in text: the walk starts
   * from the deepest node of the previous path whose whole path is a prefix of this one.
   */
  private place(bytes: Buffer, view: DataView, start: number, end: number, origin: number): number {
    const length = end - start;
    const sink = this.sink;
    let { stackNode, stackEnd } = this;

    // The length of the prefix shared with the previous path: four bytes at a time, then one.
    const prev = this.prevBytes;
    const prevView = this.prevView;
    const prevStart = this.prevStart;
    const limit = Math.min(length, this.prevLength);
    let common = 0;
    while (common + 4 <= limit && view.getInt32(start + common) === prevView.getInt32(prevStart + common))
      common += 4;
    while (common < limit && bytes[start + common] === prev[prevStart + common]) common++;
    let depth = this.stackDepth;
    while (depth > 0) {
      const e = stackEnd[depth - 1];
      const boundary = e === length || bytes[start + e] === slash || (e === 1 && bytes[start] === slash);
      if (e <= common && boundary) break;
      depth--;
    }

    let node = depth > 0 ? stackNode[depth - 1] : -1;
    let at = depth > 0 ? stackEnd[depth - 1] : 0;
    let created = false;
    if (at === 0 && length > 0 && bytes[start] === slash) {
      node = this.child(node, bytes, start, start + 1, hashStep(seed(node), slash), origin);
      created = this.created;
      stackNode[depth] = node;
      stackEnd[depth] = 1;
      depth++;
      at = 1;
    }
    for (;;) {
      while (at < length && bytes[start + at] === slash) at++;
      if (at >= length) break;
      let hash = seed(node);
      let stop = at;
      for (; stop < length; stop++) {
        const c = bytes[start + stop];
        if (c === slash) break;
        hash = hashStep(hash, c);
      }
      node = this.child(node, bytes, start + at, start + stop, hash, origin);
      created = this.created;
      if (depth === stackNode.length) {
        this.growStack();
        ({ stackNode, stackEnd } = this);
      }
      stackNode[depth] = node;
      stackEnd[depth] = stop;
      depth++;
      at = stop;
    }
    this.stackDepth = depth;
    this.prevBytes = bytes;
    this.prevView = view;
    this.prevStart = start;
    this.prevLength = length;
    if (node === -1) return -1;

    if (node >= this.explicit.length) {
      const grown = new Uint8Array(Math.max(this.explicit.length * 2, node + 1));
      grown.set(this.explicit);
      this.explicit = grown;
    }
    if (!created) {
      if (this.explicit[node] === 1) {
        const shown = quoted.path(bytes.toString("utf8", start, end));
        throw new EspalierError(
          "DUPLICATE_PATH",
          say`line ${origin} repeats the path ${shown} of line ${sink.origin[node]}`,
          { line: origin },
        );
      }
      sink.origin[node] = origin;
    }
    this.explicit[node] = 1;
    return node;
  }

  /**
   * The child of `parent` named by `bytes[s, e)`, whose hash is `hash`,
   * added when missing; `this.created` says which.
   */
  private child(parent: number, bytes: Buffer, s: number, e: number, hash: number, origin: number): number {
    const { sink } = this;
    const { slots, hashes } = this.table;
    const mask = slots.length - 1;
    let h = mix(hash) & mask;
    for (let slot = slots[h]; slot !== 0; slot = slots[h]) {
      const node = slot - 1;
      if (hashes[node] === hash && sink.parentOf[node] === parent) {
        // The bytes are valid UTF-8 (see `lines`), so equal names are equal bytes.
        if (sink.name.equalsBytes(node, bytes, s, e)) {
          this.created = false;
          return node;
        }
      }
      h = (h + 1) & mask;
    }
    this.created = true;
    const node = sink.addBytes(parent, bytes, s, e, origin);
    this.table.add(node, hash, h, sink.length);
    return node;
  }

  private growStack(): void {
    this.stackNode = doubled(this.stackNode);
    this.stackEnd = doubled(this.stackEnd);
  }
}

/** A view reading the bytes four at a time (at any offset). */
function viewOf(bytes: Buffer): DataView {
  return new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}

function isBlank(bytes: Buffer, start: number, end: number): boolean {
  for (let k = start; k < end; k++) {
    const c = bytes[k];
    if (c !== space && c !== tab) return false;
  }
  return true;
}
