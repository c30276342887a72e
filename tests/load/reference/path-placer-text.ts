import { EspalierError } from "../../../src/errors.js";
import type { NodeSink } from "../../../src/load/node-sink.js";
import { ChildTable, doubled, hashStep, mix, seed } from "../../../src/model/child-hash.js";

// The path placer on text (UTF-16 code units) espalier had before paths were placed as UTF-8 bytes
// (src/load/path-placer.ts), kept for the reference path-list reader.

const slash = 47;

/**
 * Nodes by "/"-separated path, creating missing ancestors (own size 0) on the way. A leading "/" is a
 * top node named "/"; trailing and doubled slashes are ignored; other segments (".", "..") are names.
 * A path may name a node that was created implicitly before; naming the same path twice is DUPLICATE_PATH.
 *
 * Children are found by (parent, name) in one open-addressing hash table of node numbers, hashed while
 * the segment is scanned, so no string is cut for a lookup and no object is made per directory.
 * Listings put related paths next to each other, so the walk starts from the deepest ancestor shared
 * with the previous path, usually leaving one lookup per path.
 */
export class PathPlacer {
  private readonly table = new ChildTable();
  // Each node's own segment, the name it is found by (a table may relabel the node in the sink).
  private readonly keys: string[] = [];
  private explicit = new Uint8Array(1024);
  private readonly sink: NodeSink;
  private readonly unit: "line" | "row";
  // The previous path, text.slice(prevStart, prevStart + prevLength), and its nodes: stackNode[d]
  // ends stackEnd[d] characters in.
  private prevText = "";
  private prevStart = 0;
  private prevLength = 0;
  private stackNode = new Int32Array(64);
  private stackEnd = new Int32Array(64);
  private stackDepth = 0;
  private created = false;

  constructor(sink: NodeSink) {
    this.sink = sink;
    this.unit = sink.originIsRow ? "row" : "line";
  }

  /**
   * The node named by the path `text.slice(start, end)`, its origin set to `origin`; -1 for a path with
   * no segments. Offsets, not a sliced string, so a whole listing is read in place.
   */
  place(text: string, start: number, end: number, origin: number): number {
    const length = end - start;
    const sink = this.sink;
    let { stackNode, stackEnd } = this;

    // The deepest node of the previous path whose whole path is a prefix of this one.
    const prev = this.prevText;
    const prevStart = this.prevStart;
    const limit = Math.min(length, this.prevLength);
    let common = 0;
    while (common < limit && text.charCodeAt(start + common) === prev.charCodeAt(prevStart + common))
      common++;
    let depth = this.stackDepth;
    while (depth > 0) {
      const e = stackEnd[depth - 1];
      const boundary =
        e === length || text.charCodeAt(start + e) === slash || (e === 1 && text.charCodeAt(start) === slash);
      if (e <= common && boundary) break;
      depth--;
    }

    let node = depth > 0 ? stackNode[depth - 1] : -1;
    let at = depth > 0 ? stackEnd[depth - 1] : 0;
    let created = false;
    if (at === 0 && length > 0 && text.charCodeAt(start) === slash) {
      node = this.child(node, text, start, start + 1, hashStep(seed(node), slash), origin);
      created = this.created;
      stackNode[depth] = node;
      stackEnd[depth] = 1;
      depth++;
      at = 1;
    }
    for (;;) {
      while (at < length && text.charCodeAt(start + at) === slash) at++;
      if (at >= length) break;
      let hash = seed(node);
      let stop = at;
      for (; stop < length; stop++) {
        const c = text.charCodeAt(start + stop);
        if (c === slash) break;
        hash = hashStep(hash, c);
      }
      node = this.child(node, text, start + at, start + stop, hash, origin);
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
    this.prevText = text;
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
        const shown = JSON.stringify(text.slice(start, end));
        throw new EspalierError(
          "DUPLICATE_PATH",
          `${this.unit} ${origin} repeats the path ${shown} of ${this.unit} ${sink.origin[node]}`,
          this.unit === "row" ? { row: origin } : { line: origin, column: 1 },
        );
      }
      sink.origin[node] = origin;
    }
    this.explicit[node] = 1;
    return node;
  }

  /**
   * The child of `parent` named `text.slice(s, e)`, whose hash is `hash`, added when missing;
   * `this.created` says which.
   */
  private child(parent: number, text: string, s: number, e: number, hash: number, origin: number): number {
    const { sink } = this;
    const { entries } = this.table;
    const mask = (entries.length >> 1) - 1;
    const length = e - s;
    let h = mix(hash) & mask;
    for (let slot = entries[2 * h]; slot !== 0; slot = entries[2 * h]) {
      const node = slot - 1;
      if (entries[2 * h + 1] === hash && sink.parentOf[node] === parent) {
        const name = this.keys[node];
        if (name.length === length) {
          let k = 0;
          while (k < length && name.charCodeAt(k) === text.charCodeAt(s + k)) k++;
          if (k === length) {
            this.created = false;
            return node;
          }
        }
      }
      h = (h + 1) & mask;
    }
    this.created = true;
    const name = detach(text.slice(s, e));
    const node = sink.add(parent, name, origin);
    this.keys[node] = name;
    this.table.add(node, hash, h, this.keys.length);
    return node;
  }

  private growStack(): void {
    this.stackNode = doubled(this.stackNode);
    this.stackEnd = doubled(this.stackEnd);
  }
}

/**
 * A copy of a name that no longer refers to the text it was cut from. V8 makes a slice of 13 or more
 * characters a view into its parent string, so keeping such names would keep the whole listing (or every
 * chunk of a stream) alive; joining and slicing again copies just the name.
 */
function detach(name: string): string {
  return name.length < 13 ? name : ` ${name}`.slice(1);
}
