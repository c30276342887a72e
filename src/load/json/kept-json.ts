import type { Buffer } from "node:buffer";
import { NamePool } from "../../model/names.js";
import { BytesKeeper, EarlierBytes } from "../earlier-bytes.js";
import { KeptForLater } from "../kept-for-later.js";
import type { BytesAt } from "../load-options.js";
import { releasableMemory, releaseMemory } from "../releasable-memory.js";

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

/**
 * Shortest input kept for a later version: below it, keeping costs OLD's load more than NEW's saves
 * (a second load of a small input is cheap anyway, its code compiled by the first). Measured on one
 * machine (docs/performance.md, thirteenth session): 2.9 MB, OLD +15 to 27 ms, NEW no faster; 37.7 MB,
 * OLD +38 ms, NEW -77 ms.
 */
export const LEAST_KEPT_BYTES = 16 * 2 ** 20;

/** How a JSON input of node objects was read: a later version is taken from it only when read alike. */
export interface JsonReadAs {
  readonly nameField: string;
  readonly sizeField: string;
  readonly childrenField: string;
  readonly keepFields: readonly string[];
  /**
   * Read keeping the node objects' other fields (LoadOptions.keepOtherFields): those kept, in the
   * order of their columns after `keepFields`'; absent when not kept.
   */
  readonly otherFields?: readonly string[];
  readonly maxTokenBytes: number;
  readonly maxDepth: number;
}

/**
 * What the load of a JSON input of node objects kept for the load of a later version of it (a diff's
 * OLD for its NEW, one after the other): where each node object in a children array starts and ends
 * in the input's bytes, how many nodes its subtree holds, and the nodes as read (parents, own sizes,
 * names, what was read of each); the bytes themselves, or the input read again (`readAgain`: a regular
 * file, read by the later load a window at a time, where keeping them would be fresh memory as big as
 * the file). A node object of the later version whose bytes are those of one here, at the same place in
 * the tree, is then taken with its subtree from here instead of read: its nodes are a function of its
 * bytes, as long as nothing in them did more than add nodes (K_ODD).
 */
export class KeptJson {
  constructor(
    readonly readAs: JsonReadAs,
    /** The input's bytes as its load kept them, or read again (earlier-bytes.ts). */
    private readonly bytes: EarlierBytes,
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
    /**
     * Node i's bytes beyond their UTF-16 length, when they hold no line feed (JsonPositions), for those
     * with a byte >= 0x80 (K_HIGH); empty when none has.
     */
    private readonly adjusts: Int32Array,
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
    /** Whether some node has a name (json-loader.ts `hasNames`). */
    readonly named: boolean,
  ) {}

  /** Nothing kept: what a load not read against an earlier version holds in its place. */
  static readonly none = new KeptJson(
    { nameField: "", sizeField: "", childrenField: "", keepFields: [], maxTokenBytes: 0, maxDepth: 0 },
    new EarlierBytes(null),
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
    false,
  );

  /** Shortest input kept (LEAST_KEPT_BYTES; tests read small inputs against their earlier versions). */
  static leastBytes = LEAST_KEPT_BYTES;

  /**
   * Whether the bytes can be compared with: kept, or read again through `readAgain` (the input as the
   * earlier load read it: LoadOptions.earlierInput).
   */
  readable(readAgain: BytesAt | undefined): boolean {
    return this.bytes.readable(readAgain);
  }

  /** Node `i`'s bytes beyond their UTF-16 length (see `adjusts`). */
  adjust(i: number): number {
    return (this.flags[i] & K_HIGH) === 0 ? 0 : this.adjusts[i];
  }

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
  sameAt(k: number, buf: Buffer, i: number, anchor = true): number {
    if ((this.flags[k] & (K_ODD | K_ODD_BELOW)) !== 0) return -1;
    const s = this.start[k];
    const e = this.end[k];
    if (s === 0 || i + (e - s) > buf.length || !this.same(s, e, buf, i, 64, anchor)) return -1;
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
    let bits = flags[k];
    let adjust = this.adjust(k);
    for (let group = 1; group > 0; ) {
      let g = last;
      let m = 0;
      let more = 0;
      let groupBits = 0;
      let groupAdjust = 0;
      while (m < group) {
        const next = this.nextSibling(g);
        if (next < 0 || (flags[next] & (K_ODD | K_ODD_BELOW)) !== 0) break;
        g = next;
        m++;
        more += this.count[next];
        groupBits |= flags[next];
        groupAdjust += this.adjust(next);
      }
      if (m === 0) break;
      const to = at + (end[g] - end[last]);
      if (nodes + more <= room && to <= buf.length && this.same(end[last], end[g], buf, at, 8, true)) {
        last = g;
        at = to;
        nodes += more;
        bits |= groupBits;
        adjust += groupAdjust;
        group *= 2;
      } else group = m === group ? group >>> 1 : m >>> 1;
    }
    this.runBits = bits;
    this.runAdjust = adjust;
    return last;
  }

  /** Of the siblings `lastRepeated` found last: their K_ bits, or-ed, and their adjustments, summed. */
  runBits = 0;
  runAdjust = 0;

  /**
   * Whether the input's bytes `[from, to)` are those of `b` from `at` on (which has them all): from the
   * window, moved where the looks go on (`anchor`: the counterpart's child at the cursor and the
   * siblings after it), or read apart (the child after it, tried in case the cursor's was removed).
   */
  private same(from: number, to: number, b: Buffer, at: number, first: number, anchor: boolean): boolean {
    const kept = this.bytes;
    if (anchor) {
      if (!kept.holds(from, to)) return false;
      return sameFrom(kept.window, from - kept.windowAt, to - kept.windowAt, b, at, first);
    }
    const part = kept.apart(from, to);
    return part !== null && sameFrom(part, 0, to - from, b, at, first);
  }

  /** Gives the memory of the bytes and offsets back now: read no more. */
  release(): void {
    this.bytes.release();
    releaseMemory(this.start.buffer);
    releaseMemory(this.end.buffer);
    releaseMemory(this.count.buffer);
    releaseMemory(this.flags.buffer);
    releaseMemory(this.adjusts.buffer);
  }
}

/**
 * Whether `a[x0, x1)` are the bytes of `b` from `at` on (which has them all): the `first` bytes one by
 * one (where a node that differs mostly does: its name; a leaf is mostly shorter than 64), then the
 * rest in native code.
 */
function sameFrom(a: Uint8Array, x0: number, x1: number, b: Buffer, at: number, first: number): boolean {
  const head = Math.min(x1, x0 + first);
  for (let x = x0, y = at; x < head; x++, y++) if (a[x] !== b[y]) return false;
  return x1 === head || b.compare(a, head, x1, at + (head - x0), at + (x1 - x0)) === 0;
}

/** Longest input whose node objects' places are kept for a later version read again (offsets in 32 bits). */

/**
 * The loader's side of a {@link KeptJson}: keeps the nodes' places while they are read, and the input's
 * bytes (up to MOST_KEPT_BYTES) unless the later load reads them again.
 */
export class JsonKeeper {
  /** The input's bytes kept, or counted (earlier-bytes.ts). */
  private readonly bytes: BytesKeeper;
  start = new Uint32Array(releasableMemory(4 * 1024));
  end = new Uint32Array(releasableMemory(4 * 1024));
  count = new Int32Array(releasableMemory(4 * 1024));
  flags = new Uint8Array(releasableMemory(1024));
  /** By node, for those with a byte >= 0x80 and no line feed (see KeptJson.adjusts): made at the first. */
  private adjusts = new Int32Array(0);
  /** False once the input is longer than kept, or nothing is to be kept. */
  keeping: boolean;

  /** `readAgain`: the later load reads the input's bytes again (LoadOptions.inputReadAgain). */
  constructor(inputBytes: number, readAgain: boolean) {
    const kept = inputBytes > 0 && inputBytes >= KeptJson.leastBytes;
    this.bytes = new BytesKeeper(kept ? inputBytes : 0, readAgain);
    this.keeping = kept && this.bytes.keeping;
    if (!this.keeping) this.bytes.drop();
  }

  /** The next chunk of the input. */
  write(chunk: Uint8Array): void {
    if (this.keeping && !this.bytes.write(chunk)) this.drop();
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
    if (this.adjusts.length > 0)
      this.adjusts = grown(this.adjusts, new Int32Array(releasableMemory(4 * length)));
  }

  /** Node `i` holds a byte >= 0x80, and no line feed: `adjust` bytes beyond their UTF-16 length. */
  high(i: number, adjust: number): void {
    if (this.adjusts.length === 0) this.adjusts = new Int32Array(releasableMemory(4 * this.count.length));
    this.flags[i] |= K_HIGH;
    this.adjusts[i] = adjust;
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
    this.bytes.drop();
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
    named: boolean,
  ): KeptJson | undefined {
    if (!this.keeping || length === 0) {
      this.release();
      return undefined;
    }
    return new KeptJson(
      readAs,
      this.bytes.earlier(),
      length,
      this.start,
      this.end,
      this.count,
      this.flags,
      this.adjusts,
      sized,
      parentOf,
      ownSize,
      names,
      kept,
      lines,
      named,
    );
  }

  private release(): void {
    this.drop();
    for (const a of [this.start, this.end, this.count, this.flags, this.adjusts]) releaseMemory(a.buffer);
  }
}

function grown<T extends Uint32Array | Int32Array | Uint8Array>(from: T, to: T): T {
  to.set(from);
  releaseMemory(from.buffer);
  return to;
}

/** Kept JSON by the tree its load built: kept by the JSON loader's caller, taken by a later version's load. */
export const keptJsons = new KeptForLater<KeptJson>();
