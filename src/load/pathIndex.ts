import { EspalierError } from "../errors.js";
import type { NodeSink } from "./nodeSink.js";

const slash = 47;

/**
 * Nodes by "/"-separated path, creating missing ancestors (own size 0) on the way. A leading "/" is a
 * top node named "/"; trailing and doubled slashes are ignored; other segments (".", "..") are names.
 * A path may name a node that was created implicitly before; naming the same path twice is DUPLICATE_PATH.
 *
 * Each node maps its children by name. Listings put related paths next to each other, so the walk starts
 * from the deepest ancestor shared with the previous path, usually leaving one lookup per path.
 */
export class PathIndex {
  private readonly tops = new Map<string, number>();
  private readonly childrenOf: (Map<string, number> | undefined)[] = [];
  private explicit = new Uint8Array(1024);
  private readonly sink: NodeSink;
  private readonly unit: "line" | "row";
  // The previous path, text.slice(prevStart, prevEnd), and its nodes: stackNode[d] ends stackEnd[d] in.
  private prevText = "";
  private prevStart = 0;
  private prevLength = 0;
  private readonly stackNode: number[] = [];
  private readonly stackEnd: number[] = [];
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
    const { sink, stackNode, stackEnd } = this;

    // The deepest node of the previous path whose whole path is a prefix of this one.
    const prev = this.prevText;
    const prevStart = this.prevStart;
    const limit = Math.min(length, this.prevLength);
    let common = 0;
    while (common < limit && text.charCodeAt(start + common) === prev.charCodeAt(prevStart + common))
      common++;
    let depth = stackNode.length;
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
      node = this.child(node, "/", origin);
      created = this.created;
      stackNode[depth] = node;
      stackEnd[depth] = 1;
      depth++;
      at = 1;
    }
    for (;;) {
      while (at < length && text.charCodeAt(start + at) === slash) at++;
      if (at >= length) break;
      let stop = at + 1;
      while (stop < length && text.charCodeAt(start + stop) !== slash) stop++;
      node = this.child(node, text.slice(start + at, start + stop), origin);
      created = this.created;
      stackNode[depth] = node;
      stackEnd[depth] = stop;
      depth++;
      at = stop;
    }
    stackNode.length = depth;
    stackEnd.length = depth;
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
          this.unit === "row" ? { row: origin } : { line: origin },
        );
      }
      sink.origin[node] = origin;
    }
    this.explicit[node] = 1;
    return node;
  }

  /** The child of `parent` named `name`, added when missing; `this.created` says which. */
  private child(parent: number, name: string, origin: number): number {
    let siblings = parent === -1 ? this.tops : this.childrenOf[parent];
    if (siblings === undefined) {
      siblings = new Map();
      this.childrenOf[parent] = siblings;
    }
    const found = siblings.get(name);
    this.created = found === undefined;
    if (found !== undefined) return found;
    const node = this.sink.add(parent, name, origin);
    siblings.set(name, node);
    return node;
  }
}
