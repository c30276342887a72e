import { EspalierError } from "../errors.js";
import { codecs } from "./buffer-codecs.js";
import { hashBytes } from "./child-hash.js";

/**
 * The names of a tree's nodes, read one at a time. A whole tree's names are kept as UTF-8 bytes in one
 * pool ({@link NamePool}) rather than as millions of strings: the engine's collector then has almost
 * nothing to trace or copy while a big input loads, and a name costs its bytes plus eight. Only the
 * names a view or a lookup asks for become strings, and those die young.
 */
export interface Names {
  readonly length: number;
  /** The name of node `i`, decoded (invalid UTF-8 as U+FFFD, as the WHATWG decoder does it). */
  get(i: number): string;
  /** The first node named `text` (not empty), or -1, when these names can tell faster than by reading each. */
  indexOf?(text: string): number;
}

/** Names kept as strings: small hand-made trees and derived trees. */
export class StringNames implements Names {
  constructor(private readonly list: readonly string[]) {}

  get length(): number {
    return this.list.length;
  }

  get(i: number): string {
    return this.list[i];
  }
}

/** A {@link NamePool} as plain data. */
export interface NamePoolParts {
  length: number;
  bytes: Uint8Array;
  start: Uint32Array;
  size: Uint32Array;
  exact: [number, string][];
}

/** `first`, then the names of `rest`: a tree put under a new root. */
export class PrefixedNames implements Names {
  constructor(
    readonly first: string,
    readonly rest: Names,
  ) {}

  get length(): number {
    return this.rest.length + 1;
  }

  get(i: number): string {
    return i === 0 ? this.first : this.rest.get(i - 1);
  }
}

/** Whether name `i` of `a` equals name `j` of `b`; compares pooled bytes without decoding when it can. */
export function sameName(a: Names, i: number, b: Names, j: number): boolean {
  if (a instanceof NamePool && b instanceof NamePool) {
    const verdict = a.sameBytes(i, b, j);
    if (verdict !== undefined) return verdict;
  }
  return a.get(i) === b.get(j);
}

/**
 * For two pools, whether name `i` of the first and name `j` of the second are the same non-empty bytes
 * (then the same name), compared in the caller's loop without a call per name; false otherwise, and
 * always when either is no pool or keeps some name as a string: `sameName` then decides.
 */
export function bytesCompare(a: Names, b: Names): (i: number, j: number) => boolean {
  const aRuns = a instanceof NamePool ? a.byteRuns() : null;
  const bRuns = b instanceof NamePool ? b.byteRuns() : null;
  if (aRuns === null || bRuns === null) return () => false;
  const { bytes: aBytes, start: aStart, size: aSize } = aRuns;
  const { bytes: bBytes, start: bStart, size: bSize } = bRuns;
  // Pools reading one buffer (a table read against an earlier version, see readingBytes): a name at the
  // same place in both is the same bytes.
  const oneBuffer = aBytes === bBytes;
  return (i, j) => {
    const length = aSize[i];
    if (length !== bSize[j] || length === 0) return false;
    if (oneBuffer && aStart[i] === bStart[j]) return true;
    for (let x = aStart[i], y = bStart[j], end = x + length; x < end; x++, y++)
      if (aBytes[x] !== bBytes[y]) return false;
    return true;
  };
}

/** Whether name `i` is the empty string. */
export function isEmptyName(names: Names, i: number): boolean {
  return names instanceof NamePool ? names.byteLengthOf(i) === 0 : names.get(i) === "";
}

/** The first node whose name is `text` (not empty), or -1. Compares bytes in a pool: nothing decoded. */
export function indexOfName(names: Names, text: string): number {
  if (text === "") return -1;
  if (names.indexOf !== undefined) return names.indexOf(text);
  if (names instanceof NamePool && text.isWellFormed()) {
    return names.indexOfBytes(Buffer.from(text, "utf8"));
  }
  for (let i = 0; i < names.length; i++) if (names.get(i) === text) return i;
  return -1;
}

/**
 * Sets name `k` of `out` to name `i` of `names`: the bytes are copied from a pool (nothing decoded),
 * through a tree put under a new root too; other names go through their text.
 */
export function copyName(out: NamePool, k: number, names: Names, i: number): void {
  if (names instanceof NamePool) out.copyFrom(k, names, i);
  else if (names instanceof PrefixedNames && i > 0) copyName(out, k, names.rest, i - 1);
  else out.setString(k, names.get(i));
}

/** Every name, in node order. */
export function namesToArray(names: Names): string[] {
  const out: string[] = new Array(names.length);
  for (let i = 0; i < names.length; i++) out[i] = names.get(i);
  return out;
}

const LONGEST_POOL = 2 ** 32 - 1;
/** Places of a name's bytes in the pool beyond which {@link NamePool.indexOfBytes} compares names one by one. */
const MOST_PLACES = 64;

/**
 * Names as UTF-8 bytes appended to one growing pool, with each node's start and byte length. Names may
 * be set in any order and set again (the later bytes win; the earlier ones stay unused in the pool).
 * A string that UTF-8 cannot carry exactly (a lone surrogate, which JSON's `\ud800` can spell) is kept
 * as the string itself, so a name always reads back as it was set.
 */
export class NamePool implements Names {
  length = 0;
  private bytes: Buffer;
  private used = 0;
  private start: Uint32Array;
  private size: Uint32Array;
  private exact: Map<number, string> | null = null;
  // Set when another pool reads these bytes too (see reordered): an append copies them first unless
  // this pool wrote last (`written`).
  private shared = false;
  /**
   * Where the bytes some pool wrote in this pool's buffer end: one record for all the pools reading the
   * buffer. A pool whose own end is that end wrote last (or none has written since they began to
   * share), so the room past it is free and it may append there; any other pool copies the bytes first.
   * A pool alone has a record of its own, kept at its end, and runs the same code as a shared one: a
   * pool read against an earlier version's (a diff's NEW) then meets no branch that OLD's load never ran,
   * and the engine keeps the code it compiled for it (docs/performance.md).
   */
  private written = { end: 0 };
  // Bytes at the start of this pool's that another pool's names are in (see readingBytes): 0 when none.
  private sharedEnd = 0;

  constructor(capacity = 1024, poolBytes = 1 << 16) {
    this.start = new Uint32Array(Math.max(1, capacity));
    this.size = new Uint32Array(Math.max(1, capacity));
    this.bytes = Buffer.allocUnsafe(Math.max(16, poolBytes));
  }

  get(i: number): string {
    if (this.exact !== null) {
      const text = this.exact.get(i);
      if (text !== undefined) return text;
    }
    const s = this.start[i];
    return codecs.utf8Slice(this.bytes, s, s + this.size[i]);
  }

  /** Makes room for nodes up to index `length - 1`; new nodes have the empty name. */
  setLength(length: number): void {
    if (length > this.start.length) this.growNodes(length);
    if (length < this.length) {
      this.start.fill(0, length, this.length);
      this.size.fill(0, length, this.length);
      if (this.exact !== null) for (const k of this.exact.keys()) if (k >= length) this.exact.delete(k);
    }
    this.length = length;
  }

  /** Sets node `i`'s name to the UTF-8 bytes `src[s, e)` (copied; they need not be valid UTF-8). */
  setBytes(i: number, src: Uint8Array, s: number, e: number): void {
    const n = e - s;
    const at = this.reserve(n);
    const bytes = this.bytes;
    // A loop, not set(src.subarray(...)): a name is short, and a view object per name costs more.
    if (n <= 64) for (let k = 0; k < n; k++) bytes[at + k] = src[s + k];
    else bytes.set(src.subarray(s, e), at);
    this.commit(at + n);
    this.place(i, at, n);
  }

  /** Bytes the names set so far take in the pool (names set again included). */
  get usedBytes(): number {
    return this.used;
  }

  /**
   * Makes room for names up to node `nodes - 1` and `bytes` more bytes of them, once, where appending
   * name by name would grow the pool many times over (each growth fresh memory and a copy): for a
   * loader that can tell how many names are coming. A hint: nothing is refused by it.
   */
  makeRoom(nodes: number, bytes: number): void {
    if (nodes > this.start.length) this.growNodes(nodes);
    const need = Math.min(LONGEST_POOL, this.used + bytes);
    if (need <= this.bytes.length || this.shared) return;
    const grown = Buffer.allocUnsafe(need);
    this.bytes.copy(grown, 0, 0, this.used);
    this.bytes = grown;
  }

  /** Sets node `i`'s name to `text`. */
  setString(i: number, text: string): void {
    if (text.length === 0) {
      this.place(i, 0, 0);
      return;
    }
    const at = this.reserve(text.length * 3);
    const n = codecs.utf8Write(this.bytes, text, at, text.length * 3);
    this.commit(at + n);
    this.place(i, at, n);
    if (!text.isWellFormed()) {
      this.exact ??= new Map();
      this.exact.set(i, text);
    }
  }

  /** Whether some name is kept as a string that UTF-8 cannot carry (see the class comment). */
  get hasExact(): boolean {
    return this.exact !== null && this.exact.size > 0;
  }

  /** Sets node `k`'s name to name `i` of `src`, copying its bytes. */
  copyFrom(k: number, src: NamePool, i: number): void {
    const text = src.exact?.get(i);
    if (text !== undefined) {
      this.setString(k, text);
      return;
    }
    const n = src.size[i];
    const at = this.reserve(n);
    const from = src.start[i];
    const a = this.bytes;
    const b = src.bytes;
    for (let d = 0; d < n; d++) a[at + d] = b[from + d];
    this.commit(at + n);
    this.place(k, at, n);
  }

  /** `hash` stepped over name `i`'s bytes (FNV-1a, child-hash.ts), as the loaders hash names. */
  hashFrom(i: number, hash: number): number {
    const at = this.start[i];
    return hashBytes(hash, this.bytes, at, at + this.size[i]);
  }

  /** Name `i`'s UTF-8 bytes (a view into the pool, valid until the pool next grows). */
  bytesOf(i: number): Uint8Array {
    const s = this.start[i];
    return this.bytes.subarray(s, s + this.size[i]);
  }

  /** Bytes of name `i` in UTF-8 (0 exactly for the empty name). */
  byteLengthOf(i: number): number {
    return this.size[i];
  }

  /** Whether node `i`'s name is spelled by the bytes `src[s, e)`. */
  equalsBytes(i: number, src: Uint8Array, s: number, e: number): boolean {
    const n = this.size[i];
    if (n !== e - s || this.exact?.has(i)) return false;
    const bytes = this.bytes;
    for (let k = 0, at = this.start[i]; k < n; k++, at++) if (bytes[at] !== src[s + k]) return false;
    return true;
  }

  /**
   * The first node whose name is spelled by `target`, or -1. The runtime's byte search finds where
   * those bytes occur in the pool; then a node matches when its name starts at one of those places and
   * is as long, so a lookup among millions of names reads their starts (and the lengths of those that
   * start there), not their bytes.
   * A target found in very many places (a short, common name) is compared with each name instead.
   */
  indexOfBytes(target: Uint8Array): number {
    const n = target.length;
    const pool = this.bytes.subarray(0, this.used);
    const places: number[] = [];
    if (n > 0)
      for (let at = pool.indexOf(target); at !== -1; at = pool.indexOf(target, at + 1)) {
        if (places.length === MOST_PLACES) return this.indexOfBytesByScan(target);
        places.push(at);
      }
    else return this.indexOfBytesByScan(target);
    // The first node starting at each place, by the runtime's search of the starts (several times
    // faster than a loop here, which on a graph reads millions of starts: one per slot).
    const starts = this.start.subarray(0, this.length);
    const size = this.size;
    let first = -1;
    for (const at of places) {
      for (
        let i = starts.indexOf(at);
        i !== -1 && (first === -1 || i < first);
        i = starts.indexOf(at, i + 1)
      ) {
        if (size[i] === n && this.exact?.has(i) !== true) {
          first = i;
          break;
        }
      }
    }
    return first;
  }

  private indexOfBytesByScan(target: Uint8Array): number {
    for (let i = 0; i < this.length; i++) if (this.equalsBytes(i, target, 0, target.length)) return i;
    return -1;
  }

  /**
   * The pool's bytes with each node's start and byte length, for a loop that compares many names at
   * once (equal bytes are the same name); null when some name is kept as a string (see the class
   * comment), whose bytes do not spell it. Valid until the pool next grows.
   */
  byteRuns(): { bytes: Uint8Array; start: Uint32Array; size: Uint32Array } | null {
    if (this.exact !== null && this.exact.size > 0) return null;
    return { bytes: this.bytes, start: this.start, size: this.size };
  }

  /**
   * Whether name `i` here and name `j` of `other` are the same text, judged from the bytes: true when the
   * bytes are equal, false when they differ and are all ASCII; undefined when only decoding can tell
   * (different bytes beyond ASCII may decode alike when invalid, or a name is kept as a string).
   */
  sameBytes(i: number, other: NamePool, j: number): boolean | undefined {
    if (this.exact?.has(i) || other.exact?.has(j)) return undefined;
    const bt = other.start[j];
    const bEnd = bt + other.size[j];
    if (this.equalsBytes(i, other.bytes, bt, bEnd)) return true;
    const at = this.start[i];
    return isAscii(this.bytes, at, at + this.size[i]) && isAscii(other.bytes, bt, bEnd) ? false : undefined;
  }

  /**
   * A new pool sharing these bytes whose node k has the name of node `from[k]` here, or `extra` where
   * `from[k]` is -1 (a root espalier adds). `places`, when given: two arrays of `from.length` numbers,
   * whatever they hold, that the new pool takes for its names' places (start and byte length).
   */
  reordered(from: Int32Array, extra: string, places?: { start: Uint32Array; size: Uint32Array }): NamePool {
    // The extra name goes into this pool first; after that both pools read the same bytes.
    const extraAt = this.used;
    const extraSize = extra === "" ? 0 : Buffer.byteLength(extra, "utf8");
    if (extraSize > 0) {
      const at = this.reserve(extraSize);
      this.commit(at + codecs.utf8Write(this.bytes, extra, at, extraSize));
    }
    if (places !== undefined && (places.start.length !== from.length || places.size.length !== from.length))
      throw new Error(`reordered: places for ${places.start.length} names, not ${from.length}`);
    // With places given, no arrays of the pool's own: made and dropped, they were fresh memory to clear.
    const out = this.sharedPool(places === undefined ? from.length : 1);
    out.length = from.length;
    if (places !== undefined) {
      out.start = places.start;
      out.size = places.size;
    }
    // The arrays in locals, not read through `this` and `out` each time round.
    const { start, size } = this;
    const outStart = out.start;
    const outSize = out.size;
    for (let k = 0; k < from.length; k++) {
      const o = from[k];
      outStart[k] = o === -1 ? extraAt : start[o];
      outSize[k] = o === -1 ? extraSize : size[o];
    }
    const exactExtra = !extra.isWellFormed();
    if (this.exact !== null || exactExtra)
      for (let k = 0; k < from.length; k++) {
        const text = from[k] === -1 ? (exactExtra ? extra : undefined) : this.exact?.get(from[k]);
        if (text !== undefined) {
          out.exact ??= new Map();
          out.exact.set(k, text);
        }
      }
    return out;
  }

  /**
   * A new pool sharing these bytes whose node k has the name of node `from[k]` here or, where `from[k]`
   * is -1, name `otherFrom[k]` of `other`. Those other names are appended to this pool first (where it
   * has room and no other pool wrote there, in place; else its bytes are copied once), so this pool's
   * names stay as they are and only the other names' bytes are copied: a diff's combined tree takes
   * the new version's names and the removed nodes' from the old.
   */
  mergedWith(from: Int32Array, other: Names, otherFrom: Int32Array): NamePool {
    const total = from.length;
    const out = new NamePool(total, 16);
    let exact: Map<number, string> | null = null;
    for (let k = 0; k < total; k++) {
      if (from[k] !== -1) continue;
      // Through a tree put under a new root to the pool below, as copyName does.
      let names = other;
      let o = otherFrom[k];
      while (names instanceof PrefixedNames && o > 0) {
        names = names.rest;
        o--;
      }
      const pool = names instanceof NamePool ? names : null;
      const text = pool === null ? names.get(o) : pool.exact?.get(o);
      let at: number;
      let n: number;
      if (text === undefined) {
        n = pool!.size[o];
        at = this.reserve(n);
        const a = this.bytes;
        const b = pool!.bytes;
        for (let d = 0, s = pool!.start[o]; d < n; d++) a[at + d] = b[s + d];
      } else {
        at = this.reserve(text.length * 3);
        n = codecs.utf8Write(this.bytes, text, at, text.length * 3);
        if (!text.isWellFormed()) {
          exact ??= new Map();
          exact.set(k, text);
        }
      }
      this.commit(at + n);
      out.start[k] = at;
      out.size[k] = n;
    }
    this.share(out);
    out.length = total;
    for (let k = 0; k < total; k++) {
      const i = from[k];
      if (i === -1) continue;
      out.start[k] = this.start[i];
      out.size[k] = this.size[i];
    }
    if (this.exact !== null)
      for (let k = 0; k < total; k++) {
        const text = from[k] === -1 ? undefined : this.exact.get(from[k]);
        if (text !== undefined) {
          exact ??= new Map();
          exact.set(k, text);
        }
      }
    out.exact = exact;
    return out;
  }

  /**
   * A new pool, empty, reading this pool's bytes: its names may be placed where this pool holds equal
   * bytes ({@link placeShared}), others appended as by {@link setBytes} (after this pool's bytes, where
   * there is room and no other pool wrote there; else the bytes are copied first). Null when some name
   * here is kept as a string (see the class comment), whose bytes do not spell it.
   */
  readingBytes(): NamePool | null {
    if (this.exact !== null && this.exact.size > 0) return null;
    const out = new NamePool(1024, 16);
    this.share(out);
    out.length = 0;
    out.sharedEnd = this.used;
    return out;
  }

  /**
   * Sets node `i`'s name to the `n` bytes at `at` of the pool this one was made from by
   * {@link readingBytes} (its start and byte length of a name there): nothing copied. These bytes stay
   * at the start of this pool's, copied or not.
   */
  placeShared(i: number, at: number, n: number): void {
    if (at + n > this.sharedEnd)
      throw new Error(`placeShared: bytes ${at}+${n} past the shared ${this.sharedEnd}`);
    this.place(i, at, n);
  }

  /**
   * Sets the names of nodes `i` to `i + count - 1` to those of nodes `from` to `from + count - 1` of
   * `src`, the pool this one was made from by {@link readingBytes}: nothing copied but their places.
   */
  placeSharedRun(i: number, src: NamePool, from: number, count: number): void {
    if (src.used > this.sharedEnd || src.hasExact)
      throw new Error(`placeSharedRun: not the pool these bytes are shared with`);
    const end = i + count;
    if (end > this.start.length) this.growNodes(end);
    if (end > this.length) this.length = end;
    if (count <= 16) {
      // A few names (a JSON subtree taken from the earlier version): two views each cost more.
      const start = this.start;
      const size = this.size;
      for (let t = 0; t < count; t++) {
        start[i + t] = src.start[from + t];
        size[i + t] = src.size[from + t];
      }
    } else {
      this.start.set(src.start.subarray(from, from + count), i);
      this.size.set(src.size.subarray(from, from + count), i);
    }
    if (this.exact !== null) for (let k = i; k < end; k++) this.exact.delete(k);
  }

  /** A pool for `total` names reading this pool's bytes (its names still to be placed). */
  private sharedPool(total: number): NamePool {
    const out = new NamePool(total, 16);
    this.share(out);
    out.length = total;
    return out;
  }

  /** Makes `out` read this pool's bytes: from now on both pools share them (see `written`). */
  private share(out: NamePool): void {
    this.shared = true;
    out.bytes = this.bytes;
    out.used = this.used;
    out.shared = true;
    out.written = this.written;
  }

  /** A pool of these strings, in order (a missing one is ""). */
  static from(list: readonly string[]): NamePool {
    const pool = new NamePool(list.length, list.length * 8);
    for (let i = 0; i < list.length; i++) pool.setString(i, list[i] ?? "");
    return pool;
  }

  /** The pool as plain data (copied), for sending to another thread. */
  toParts(): NamePoolParts {
    return {
      length: this.length,
      bytes: this.bytes.subarray(0, this.used),
      start: this.start.subarray(0, this.length),
      size: this.size.subarray(0, this.length),
      exact: this.exact === null ? [] : [...this.exact],
    };
  }

  /** A pool from {@link toParts}'s data (as another thread received it). */
  static fromParts(parts: NamePoolParts): NamePool {
    const pool = new NamePool(1, 16);
    pool.bytes = Buffer.from(parts.bytes.buffer, parts.bytes.byteOffset, parts.bytes.byteLength);
    pool.used = parts.bytes.byteLength;
    // The received bytes are exactly full: the next append copies them.
    pool.shared = true;
    pool.written = { end: pool.used };
    // Adopted, not copied: they arrived as this thread's own (copied or moved); growing replaces them.
    if (parts.length > 0) {
      pool.start = parts.start;
      pool.size = parts.size;
    }
    pool.length = parts.length;
    if (parts.exact.length > 0) pool.exact = new Map(parts.exact);
    return pool;
  }

  private place(i: number, at: number, n: number): void {
    if (i >= this.start.length) this.growNodes(i + 1);
    if (i >= this.length) this.length = i + 1;
    this.start[i] = at;
    this.size[i] = n;
    if (this.exact !== null) this.exact.delete(i);
  }

  /** Ends this pool's bytes at `end` (past what it just wrote at its end). */
  private commit(end: number): void {
    this.used = end;
    this.written.end = end;
  }

  /**
   * Where `n` more bytes can go: this pool's end, when they fit and no other pool reading these bytes
   * wrote past it; else the bytes are copied to a larger buffer of this pool's own first.
   */
  private reserve(n: number): number {
    const need = this.used + n;
    if (need <= this.bytes.length && this.written.end === this.used) return this.used;
    if (need > LONGEST_POOL) {
      throw new EspalierError(
        "LIMIT_EXCEEDED",
        "the names of the input take more than 4 GiB; load a smaller part of it",
      );
    }
    const grown = Buffer.allocUnsafe(Math.min(LONGEST_POOL, Math.max(need, this.bytes.length * 2)));
    this.bytes.copy(grown, 0, 0, this.used);
    this.bytes = grown;
    this.shared = false;
    this.written = { end: this.used };
    return this.used;
  }

  private growNodes(atLeast: number): void {
    const capacity = Math.max(atLeast, this.start.length * 2);
    const start = new Uint32Array(capacity);
    start.set(this.start);
    this.start = start;
    const size = new Uint32Array(capacity);
    size.set(this.size);
    this.size = size;
  }
}

function isAscii(bytes: Uint8Array, s: number, e: number): boolean {
  for (let k = s; k < e; k++) if (bytes[k] >= 0x80) return false;
  return true;
}
