import type { Buffer } from "node:buffer";
import { NamePool } from "../../model/names.js";
import { MOST_KEPT_BYTES, releasableMemory, releaseMemory } from "../table/kept-table.js";

/** A node object that read a name (its `hasNames` share), or one below it. */
export const K_NAMED = 1;
/**
 * A node object whose reading did more than add nodes: keyed by name, `"missing": true`, a children
 * field repeated: its subtree is read again, not taken.
 */
export const K_ODD = 2;
/** Some node below is K_ODD. */
export const K_ODD_BELOW = 4;
/** A node object whose bytes hold a line feed. */
export const K_LINES = 8;
/** A node object whose bytes may hold a byte >= 0x80 (on its last line: its columns are not its bytes). */
export const K_HIGH = 16;

/** How a JSON input of node objects was read: a later version is taken from it only when read alike. */
export interface JsonReadAs {
  readonly nameField: string;
  readonly sizeField: string;
  readonly childrenField: string;
  readonly keepFields: readonly string[];
  readonly maxTokenBytes: number;
  readonly maxDepth: number;
}

/**
 * What the load of a JSON input of node objects kept for the load of a later version of it (a diff's
 * OLD for its NEW, one after the other): the input's bytes, where each node object in a children array
 * starts and ends in them, how many nodes its subtree holds, and the nodes as read (parents, own sizes,
 * names, what was read of each). A node object of the later version whose bytes are those of one here,
 * at the same place in the tree, is then taken with its subtree from here instead of read: its nodes
 * are a function of its bytes, as long as nothing in them did more than add nodes (K_ODD).
 */
export class KeptJson {
  constructor(
    readonly readAs: JsonReadAs,
    /** The input's bytes (on memory from releasableMemory). */
    readonly bytes: Uint8Array,
    /** Nodes read; node 0 the one top-level node object. */
    readonly length: number,
    /** Where node i's object starts in `bytes` (its `{`), for the nodes of a children array; else 0. */
    readonly start: Uint32Array,
    /** Where node i's object ends (after its `}`). */
    readonly end: Uint32Array,
    /** Nodes in node i's subtree, itself included. */
    readonly count: Int32Array,
    /** K_ bits by node. */
    readonly flags: Uint8Array,
    /** Node i's bytes beyond their UTF-16 length, when they hold no line feed (JsonPositions). */
    readonly adjust: Int32Array,
    /** The loader's own bits by node (json-loader.ts `sized`). */
    readonly sized: Uint8Array,
    readonly parentOf: Int32Array,
    /** Own sizes as read (a tree whose sizes were read as totals is not kept). */
    readonly ownSize: Float64Array,
    readonly names: NamePool,
    /** The kept fields' values by node (json-loader.ts `kept`, once ended: "" where a node has none). */
    readonly kept: readonly (string | undefined)[][],
    /** Whether the input holds a line feed (what separates two nodes may). */
    readonly lines: boolean,
  ) {}

  /** Nothing kept: what a load not read against an earlier version holds in its place. */
  static readonly none = new KeptJson(
    { nameField: "", sizeField: "", childrenField: "", keepFields: [], maxTokenBytes: 0, maxDepth: 0 },
    new Uint8Array(0),
    0,
    new Uint32Array(0),
    new Uint32Array(0),
    new Int32Array(0),
    new Uint8Array(0),
    new Int32Array(0),
    new Uint8Array(0),
    new Int32Array(0),
    new Float64Array(0),
    new NamePool(1, 16),
    [],
    false,
  );

  /** Node `i`'s first child, or -1. */
  firstChild(i: number): number {
    return this.count[i] > 1 ? i + 1 : -1;
  }

  /** The child after node `i` under the same parent, or -1. */
  nextSibling(i: number): number {
    const k = i + this.count[i];
    return k < this.length && this.parentOf[k] === this.parentOf[i] ? k : -1;
  }

  /**
   * The byte length of node `k`'s object when its subtree may be taken and `buf[i, n)` begins with its
   * bytes; else -1.
   */
  sameAt(k: number, buf: Buffer, i: number): number {
    if ((this.flags[k] & (K_ODD | K_ODD_BELOW)) !== 0) return -1;
    const s = this.start[k];
    const e = this.end[k];
    if (s === 0 || i + (e - s) > buf.length || !same(this.bytes, s, e, buf, i)) return -1;
    return e - s;
  }

  /**
   * After node `k`, whose bytes `buf` repeats up to `at`: the last of the siblings after it that may be
   * taken and whose bytes, with what separates them, `buf` repeats from `at` on, with at most `room`
   * nodes in all (k's subtree's included); `k` when none. Whole groups of siblings are compared, the
   * group doubling while they repeat and halving where they do not, down to one.
   */
  lastRepeated(k: number, buf: Buffer, at: number, room: number): number {
    const end = this.end;
    const flags = this.flags;
    let last = k;
    let nodes = this.count[k];
    for (let group = 1; group > 0; ) {
      let g = last;
      let m = 0;
      let more = 0;
      while (m < group) {
        const next = this.nextSibling(g);
        if (next < 0 || (flags[next] & (K_ODD | K_ODD_BELOW)) !== 0) break;
        g = next;
        m++;
        more += this.count[next];
      }
      if (m === 0) break;
      const to = at + (end[g] - end[last]);
      if (nodes + more <= room && to <= buf.length && same(this.bytes, end[last], end[g], buf, at)) {
        last = g;
        at = to;
        nodes += more;
        group *= 2;
      } else group = m === group ? group >>> 1 : m >>> 1;
    }
    return last;
  }

  /** Gives the memory of the bytes and offsets back now: read no more. */
  release(): void {
    releaseMemory(this.bytes.buffer);
    releaseMemory(this.start.buffer);
    releaseMemory(this.end.buffer);
    releaseMemory(this.count.buffer);
    releaseMemory(this.flags.buffer);
    releaseMemory(this.adjust.buffer);
  }
}

/** Whether `a[from, to)` are the bytes of `b` from `at` on (which has them all). */
function same(a: Uint8Array, from: number, to: number, b: Buffer, at: number): boolean {
  // The first bytes one by one (a different node mostly differs there; a leaf is mostly shorter), then
  // the rest in native code.
  const head = Math.min(to, from + 64);
  for (let x = from, y = at; x < head; x++, y++) if (a[x] !== b[y]) return false;
  return to === head || b.compare(a, head, to, at + (head - from), at + (to - from)) === 0;
}

/**
 * The loader's side of a {@link KeptJson}: keeps the input's bytes (up to MOST_KEPT_BYTES) and the
 * nodes' places while they are read.
 */
export class JsonKeeper {
  private bytes: Uint8Array;
  private used = 0;
  start = new Uint32Array(releasableMemory(4 * 1024));
  end = new Uint32Array(releasableMemory(4 * 1024));
  count = new Int32Array(releasableMemory(4 * 1024));
  flags = new Uint8Array(releasableMemory(1024));
  /** Made at the first node that needs it (most inputs are ASCII: none does). */
  adjust = new Int32Array(releasableMemory(4));
  /** False once the input is longer than kept. */
  keeping = true;

  constructor(inputBytes: number) {
    this.bytes = new Uint8Array(releasableMemory(Math.min(inputBytes, MOST_KEPT_BYTES)));
  }

  /** The next chunk of the input, copied (a stream may hand out the same memory again). */
  write(chunk: Uint8Array): void {
    if (!this.keeping) return;
    const need = this.used + chunk.length;
    if (need > MOST_KEPT_BYTES) {
      this.drop();
      return;
    }
    if (need > this.bytes.length) {
      const grown = new Uint8Array(
        releasableMemory(Math.min(MOST_KEPT_BYTES, Math.max(need, 2 * this.bytes.length))),
      );
      grown.set(this.bytes.subarray(0, this.used));
      releaseMemory(this.bytes.buffer);
      this.bytes = grown;
    }
    this.bytes.set(chunk, this.used);
    this.used = need;
  }

  /**
   * Room for node `i`'s places: doubled, or at once for about `expected` nodes (the loader's estimate
   * from the input's length), so that they are made once at their size rather than doubled a dozen
   * times, each time fresh memory and a copy (docs/performance.md).
   */
  room(i: number, expected = 0): void {
    if (i < this.count.length && expected <= this.count.length) return;
    let length = Math.max(this.count.length * 2, expected);
    while (length <= i) length *= 2;
    this.start = grown(this.start, new Uint32Array(releasableMemory(4 * length)));
    this.end = grown(this.end, new Uint32Array(releasableMemory(4 * length)));
    this.count = grown(this.count, new Int32Array(releasableMemory(4 * length)));
    this.flags = grown(this.flags, new Uint8Array(releasableMemory(length)));
    if (this.adjust.length > 4)
      this.adjust = grown(this.adjust, new Int32Array(releasableMemory(4 * length)));
  }

  /** Node `i`'s bytes beyond their UTF-16 length (see KeptJson.adjust). */
  setAdjust(i: number, adjust: number): void {
    if (this.adjust.length < this.count.length)
      this.adjust = grown(this.adjust, new Int32Array(releasableMemory(4 * this.count.length)));
    this.adjust[i] = adjust;
  }

  /** Node `i` did more than add nodes (K_ODD): so did a node below each of its ancestors. */
  odd(i: number, parentOf: Int32Array): void {
    const flags = this.flags;
    flags[i] |= K_ODD;
    for (let p = parentOf[i]; p >= 0 && (flags[p] & K_ODD_BELOW) === 0; p = parentOf[p])
      flags[p] |= K_ODD_BELOW;
  }

  /** Lets go of what is kept. */
  drop(): void {
    this.keeping = false;
    releaseMemory(this.bytes.buffer);
    this.bytes = new Uint8Array(0);
  }

  /** What is kept, over the nodes as the loader read them; undefined when nothing is. */
  kept(
    readAs: JsonReadAs,
    length: number,
    sized: Uint8Array,
    parentOf: Int32Array,
    ownSize: Float64Array,
    names: NamePool,
    kept: readonly (string | undefined)[][],
    lines: boolean,
  ): KeptJson | undefined {
    if (!this.keeping || length === 0) {
      this.release();
      return undefined;
    }
    // Nodes with no adjustment read 0 (see KeptJson.adjust).
    if (this.adjust.length < this.count.length) this.setAdjust(0, 0);
    return new KeptJson(
      readAs,
      this.bytes.subarray(0, this.used),
      length,
      this.start,
      this.end,
      this.count,
      this.flags,
      this.adjust,
      sized,
      parentOf,
      ownSize,
      names,
      kept,
      lines,
    );
  }

  private release(): void {
    this.drop();
    for (const a of [this.start, this.end, this.count, this.flags, this.adjust]) releaseMemory(a.buffer);
  }
}

function grown<T extends Uint32Array | Int32Array | Uint8Array>(from: T, to: T): T {
  to.set(from);
  releaseMemory(from.buffer);
  return to;
}

/** Kept JSON by the tree its load built (see {@link keepJson}). */
const keptFor = new WeakMap<object, KeptJson>();

/** Keeps `kept` for the load of a later version read against `tree` (LoadOptions.earlierVersion). */
export function keepJson(tree: object, kept: KeptJson): void {
  keptFor.set(tree, kept);
}

/** The JSON kept for `tree`, no longer kept: a later version's load takes it once. */
export function takeKeptJson(tree: object): KeptJson | undefined {
  const kept = keptFor.get(tree);
  keptFor.delete(tree);
  return kept;
}
