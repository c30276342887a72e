import { Buffer } from "node:buffer";
import { EspalierError, quoted, say } from "../errors.js";
import { codecs } from "../model/buffer-codecs.js";
import { ChildTable, doubled, hashStep, mix, seed } from "../model/child-hash.js";
import { NamePool } from "../model/names.js";
import type { NodeSink } from "./node-sink.js";
import { OpenFolders } from "./open-folders.js";

const slash = 47;
const EMPTY = Buffer.alloc(0);

/**
 * Nodes by "/"-separated path, given as UTF-8 bytes, creating missing ancestors (own size 0) on the way.
 * A leading "/" is a top node named "/"; trailing and doubled slashes are ignored; other segments (".",
 * "..") are names. A path may name a node that was created implicitly before; naming the same path
 * twice is DUPLICATE_PATH.
 *
 * Children are found by (parent, name) in one open-addressing hash table of node numbers, hashed on the
 * segment's bytes as it is scanned, so no string is cut for a lookup and no object is made per
 * directory. Listings put related paths next to each other, so the walk starts from the deepest
 * ancestor shared with the previous path (compared four bytes at a time), usually leaving one lookup
 * per path. The bytes must be valid UTF-8, so that equal names are equal bytes.
 *
 * That lookup is first made among the children of the folders on the walk's stack ({@link OpenFolders}):
 * while a folder stays on the stack from when it was made, all its children are there, in a small table
 * of its own. Only a name below a folder the walk came back to after leaving it needs the table of every
 * node, which is filled with the nodes made so far when first needed: a listing that keeps each folder's
 * entries together never makes it.
 */
export class PathPlacer {
  private readonly sink: NodeSink;
  // Each node's own segment, the name it is found by: the sink's names, unless a table may relabel the
  // node there (a name column), in which case a pool of its own.
  private readonly keys: NamePool;
  // Children by (parent, name), hashed on the name's bytes seeded with the parent.
  private readonly table = new ChildTable();
  /** Nodes in `table`; every node below `inTableBelow` (but the root) is there. */
  private inTable = 0;
  private inTableBelow = 0;
  private readonly open = new OpenFolders();
  private explicit = new Uint8Array(1024);
  private created = false;
  // The previous path, prevBytes[prevStart, prevStart + prevLength) (prevView reads the same bytes four
  // at a time), and its nodes: stackNode[d] ends stackEnd[d] bytes in. The caller must not overwrite
  // the previous path's bytes before the next call.
  private prevBytes: Buffer = EMPTY;
  private prevView = viewOf(EMPTY);
  private prevStart = 0;
  private prevLength = 0;
  private stackNode = new Int32Array(64).fill(-1);
  /** stackListed[d]: 1 when a line named one of stackNode[0..d] (a listed folder above the next new node). */
  private stackListed = new Int32Array(64);
  private stackEnd = new Int32Array(64);
  private stackDepth = 0;
  private root = -1;
  /**
   * Paths that added a node below one already listed on a line of its own: a listing that names each
   * folder before its contents (`find`) has many; one that names it after them (`du -a`) has none.
   */
  contentAfterListing = 0;
  /** Paths that named a node made before as an ancestor of an earlier path: folders listed after contents. */
  listedAfterContents = 0;

  // For paths given as text: two buffers taking turns, so the previous path's bytes stay as they are.
  private scratch = [Buffer.allocUnsafe(256), Buffer.allocUnsafe(256)];
  private scratchView = this.scratch.map(viewOf);
  private turn = 0;

  /** `ownKeys`: keep the names found by apart from the sink's, which the caller may change. */
  constructor(sink: NodeSink, ownKeys = false) {
    this.sink = sink;
    this.keys = ownKeys ? new NamePool() : sink.name;
  }

  /**
   * The root, named by an empty path at `origin` (a listing's start, a lock file's `""`): a node of its
   * own, empty-named until the caller names it, that every top-level node goes below in
   * {@link adoptTopLevel}. A second empty path is DUPLICATE_PATH.
   */
  placeRoot(origin: number): number {
    const sink = this.sink;
    if (this.root !== -1) {
      const unit = sink.originIsRow ? "row" : "line";
      throw new EspalierError(
        "DUPLICATE_PATH",
        `${unit} ${origin} repeats the empty path (the root) of ${unit} ${sink.origin[this.root]}`,
        sink.originIsRow ? { row: origin } : { line: origin, column: 1 },
        sink.originIsRow ? { firstRow: sink.origin[this.root] } : { firstLine: sink.origin[this.root] },
      );
    }
    if (sink.length > 0) this.listedAfterContents++;
    this.root = sink.add(-1, "", origin);
    if (this.keys !== sink.name) this.keys.setString(this.root, "");
    return this.root;
  }

  /** Once every path is placed: puts the top-level nodes below the root, if one was named; the root or -1. */
  adoptTopLevel(): number {
    const { root, sink } = this;
    if (root !== -1) {
      const { parentOf } = sink;
      for (let i = 0; i < sink.length; i++) {
        if (parentOf[i] !== -1 || i === root) continue;
        parentOf[i] = root;
      }
      // Every node goes below the root: one made after the root's line is content listed after it.
      if (sink.length - 1 > root) this.contentAfterListing++;
    }
    return root;
  }

  /** Room for flags of `nodes` nodes at once (see `NodeSink.makeRoom`). */
  makeRoom(nodes: number): void {
    if (nodes <= this.explicit.length) return;
    const grown = new Uint8Array(nodes);
    grown.set(this.explicit);
    this.explicit = grown;
  }

  /** Whether the node was named by a path of its own (or is the root an empty path named), not only made as an ancestor. */
  isListed(node: number): boolean {
    return node === this.root || (node < this.explicit.length && this.explicit[node] === 1);
  }

  /** As {@link place}, for the path `text` (as UTF-8: a lone surrogate becomes U+FFFD). */
  placeText(text: string, origin: number): number {
    const turn = this.turn;
    const most = text.length * 3;
    if (this.scratch[turn].length < most) {
      this.scratch[turn] = Buffer.allocUnsafe(Math.max(most, this.scratch[turn].length * 2));
      this.scratchView[turn] = viewOf(this.scratch[turn]);
    }
    const length = codecs.utf8Write(this.scratch[turn], text, 0, most);
    this.turn = 1 - turn;
    return this.place(this.scratch[turn], this.scratchView[turn], 0, length, origin);
  }

  /**
   * The node named by the path `bytes[start, end)`, (as PathPlacer.place does for a table's path column): the walk starts
   * from the deepest node of the previous path whose whole path is a prefix of this one.
   */
  place(bytes: Buffer, view: DataView, start: number, end: number, origin: number): number {
    const length = end - start;
    const sink = this.sink;
    let { stackNode, stackEnd, stackListed } = this;

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
      node = this.child(depth, node, bytes, start, start + 1, hashStep(seed(node), slash), origin);
      created = this.created;
      if (created || stackNode[depth] !== node) this.open.open(depth + 1, created);
      stackNode[depth] = node;
      stackEnd[depth] = 1;
      stackListed[depth] = this.listedAt(node);
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
      node = this.child(depth, node, bytes, start + at, start + stop, hash, origin);
      created = this.created;
      // A node made below a folder some line already named: content listed after its folder.
      if (created && depth > 0 && stackListed[depth - 1] === 1) this.contentAfterListing++;
      if (depth === stackNode.length) {
        this.growStack();
        ({ stackNode, stackEnd, stackListed } = this);
      }
      // A folder new at this depth: its children's level starts again (whole, when the folder is new).
      if (created || stackNode[depth] !== node) this.open.open(depth + 1, created);
      stackNode[depth] = node;
      stackEnd[depth] = stop;
      stackListed[depth] = depth > 0 && stackListed[depth - 1] === 1 ? 1 : this.listedAt(node);
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
        const text = bytes.toString("utf8", start, end);
        const shown = quoted.path(text);
        const unit = sink.originIsRow ? "row" : "line";
        throw new EspalierError(
          "DUPLICATE_PATH",
          [
            ...say`${unit} ${origin} repeats the path ${shown} of ${unit} ${sink.origin[node]}`,
            ...(text.includes("\uFFFD") ? [NOT_UTF8] : []),
          ],
          sink.originIsRow ? { row: origin } : { line: origin, column: 1 },
          sink.originIsRow ? { firstRow: sink.origin[node] } : { firstLine: sink.origin[node] },
        );
      }
      sink.origin[node] = origin;
      this.listedAfterContents++;
    }
    this.explicit[node] = 1;
    // The path's node is the top of the walk's stack.
    stackListed[depth - 1] = 1;
    return node;
  }

  /**
   * The child of `parent` (the folder at depth `depth - 1`) named by `bytes[s, e)`, whose hash is `hash`,
   * added when missing; `this.created` says which.
   */
  private child(
    depth: number,
    parent: number,
    bytes: Buffer,
    s: number,
    e: number,
    hash: number,
    origin: number,
  ): number {
    const { sink, open } = this;
    if (open.isWhole(depth)) {
      const found = open.find(depth, hash, this.keys, bytes, s, e);
      if (found !== -1) {
        this.created = false;
        return found;
      }
      this.created = true;
      const node = sink.addBytes(parent, bytes, s, e, origin);
      if (this.keys !== sink.name) this.keys.setBytes(node, bytes, s, e);
      open.add(depth, node, hash);
      return node;
    }
    if (this.inTableBelow < sink.length) this.fillTable();
    const { entries } = this.table;
    const mask = (entries.length >> 1) - 1;
    let h = mix(hash) & mask;
    for (let slot = entries[2 * h]; slot !== 0; slot = entries[2 * h]) {
      const node = slot - 1;
      if (entries[2 * h + 1] === hash && sink.parentOf[node] === parent) {
        // Valid UTF-8 (see the class comment) has one spelling per name, so equal names are equal bytes.
        if (this.keys.equalsBytes(node, bytes, s, e)) {
          this.created = false;
          return node;
        }
      }
      h = (h + 1) & mask;
    }
    this.created = true;
    const node = sink.addBytes(parent, bytes, s, e, origin);
    if (this.keys !== sink.name) this.keys.setBytes(node, bytes, s, e);
    this.table.add(node, hash, h, ++this.inTable);
    this.inTableBelow = sink.length;
    return node;
  }

  /** Puts the nodes made since the table was last filled (the root named by an empty path apart) in it. */
  private fillTable(): void {
    const { keys, table, root } = this;
    const { parentOf, length } = this.sink;
    for (let i = this.inTableBelow; i < length; i++)
      if (i !== root) table.insert(i, keys.hashFrom(i, seed(parentOf[i])), ++this.inTable);
    this.inTableBelow = length;
  }

  /** 1 when a line named the node, else 0. */
  private listedAt(node: number): number {
    return node < this.explicit.length && this.explicit[node] === 1 ? 1 : 0;
  }

  private growStack(): void {
    this.stackNode = doubled(this.stackNode);
    this.stackEnd = doubled(this.stackEnd);
    this.stackListed = doubled(this.stackListed);
    this.stackNode.fill(-1, this.stackNode.length / 2);
  }
}

/** A view reading the bytes four at a time (at any offset). */
export function viewOf(bytes: Buffer): DataView {
  return new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}

/**
 * Why two lines that differ can repeat a path: bytes that are not UTF-8 (a Latin-1 name, `caf\xe9`)
 * are read as U+FFFD, as the WHATWG decoder reads them, so names that differ only in such bytes are one.
 */
const NOT_UTF8 =
  "; the path holds U+FFFD, which bytes that are not UTF-8 are read as, so names that differ only in such bytes are the same name here: list the names converted to UTF-8 first (iconv -f LATIN1 -t UTF-8, when they are Latin-1)";
