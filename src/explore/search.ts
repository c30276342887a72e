import { EspalierError } from "../errors.js";
import type { Measures } from "../model/measure.js";
import { pooledBytes } from "../model/merged-names.js";
import { NamePool } from "../model/names.js";
import { printedNameOf } from "../model/printed-names.js";
import { parseSegment, splitPath } from "../model/segment.js";
import type { Tree } from "../model/tree.js";

/** A compiled query: what a node's name (or path) must match. */
export interface Pattern {
  readonly query: string;
  /** Every node below the root matches (`*`, `**`). */
  readonly all: boolean;
  /** Bytes every matching name contains (lower-cased), to find candidates fast; null: test every node. */
  readonly literal: Uint8Array | null;
  /** Where the literal lies in a matching name: at its start, at its end, or anywhere. */
  readonly anchor: "start" | "end" | "inside";
  readonly steps: readonly Step[];
}

/** A literal part of a name pattern, with its KMP failure table. */
interface Part {
  readonly bytes: Uint8Array;
  readonly fail: Int32Array;
}

type Step = { readonly any: true } | { readonly any: false; readonly parts: readonly Part[] };

const MAX_STEPS = 30;
const encoder = new TextEncoder();

/**
 * Live search over every node's name, as printed: the name, or its pseudonym when a key is set (a
 * search must not find what the screen would not show). Letters A-Z match a-z. A query without `/`
 * or `*` matches names that contain it; with `*` (any run of characters within a name) it matches
 * whole names; with `/` it is a path pattern read as a focus glob is (`**` any number of levels,
 * RFC 6901 escaping, `~0` for `~` and `~1` for `/`).
 *
 * The names are copied once, lower-cased, into one buffer in node order, so a search for the next
 * match is a native byte search for the pattern's longest literal part (then a check of the node it
 * falls in), and costs no string per node: the first match shows at once however big the tree, and
 * counting them all can go in slices ({@link countIn}). Pseudonyms cost a keyed hash each: they are
 * computed in slices ({@link advance}), and a search meanwhile covers the nodes done so far.
 */
export class NameSearch {
  private bytes: Buffer;
  private readonly start: Uint32Array;
  private readonly end: Uint32Array;
  /** Nodes whose names are in `bytes` (all of them without a key). */
  private ready = 0;
  private used = 0;

  constructor(
    private readonly tree: Tree,
    private readonly measures: Measures,
    private readonly key?: string,
  ) {
    const n = tree.length;
    this.start = new Uint32Array(n);
    this.end = new Uint32Array(n);
    if (key !== undefined) {
      // "anon-" and 12 hex digits: 17 bytes a name.
      this.bytes = Buffer.alloc(Math.max(16, n * 17));
      return;
    }
    const names = tree.name;
    // Pooled names (a diff's combined names too: each from its version's pool) are copied as bytes.
    const pooled = pooledBytes(names);
    let total = 0;
    if (names instanceof NamePool) for (let i = 0; i < n; i++) total += names.byteLengthOf(i);
    else if (pooled !== null) for (let i = 0; i < n; i++) total += pooled(i).length;
    this.bytes = Buffer.alloc(Math.max(16, total));
    for (let i = 0; i < n; i++) this.put(i, pooled !== null ? pooled(i) : encoder.encode(names.get(i)));
    this.ready = n;
  }

  /** Share of the nodes searched (1 without a key). */
  get progress(): number {
    return this.tree.length === 0 ? 1 : this.ready / this.tree.length;
  }

  /** Nodes searchable so far (a prefix in node order). */
  get searchable(): number {
    return this.ready;
  }

  /** Computes up to `count` more pseudonyms; returns whether every name is now searchable. */
  advance(count: number): boolean {
    if (this.key === undefined) return true;
    const { tree } = this;
    const nameOf = printedNameOf(tree, this.key);
    const stop = Math.min(tree.length, this.ready + count);
    for (let i = this.ready; i < stop; i++) this.put(i, encoder.encode(nameOf(i)));
    this.ready = stop;
    return stop === tree.length;
  }

  private put(i: number, src: Uint8Array): void {
    if (this.used + src.length > this.bytes.length) {
      const grown = Buffer.alloc(Math.max(this.bytes.length * 2, this.used + src.length));
      grown.set(this.bytes.subarray(0, this.used));
      this.bytes = grown;
    }
    const b = this.bytes;
    const at = this.used;
    for (let k = 0; k < src.length; k++) {
      const c = src[k];
      b[at + k] = c >= 0x41 && c <= 0x5a ? c + 0x20 : c;
    }
    this.start[i] = at;
    this.end[i] = at + src.length;
    this.used = at + src.length;
  }

  /**
   * The first node below the root after `from` (dir 1) or before it (dir -1) in pre-order that matches,
   * or -1; no wrapping, and not past `until` (before it going forwards, after it going backwards). Only
   * searchable nodes are looked at.
   */
  next(pattern: Pattern, from: number, dir: 1 | -1, until?: number): number {
    const n = this.ready;
    if (dir === 1) {
      const first = Math.max(1, from + 1);
      const stop = Math.min(n, until ?? n);
      return first < stop ? this.scan(pattern, first, stop) : -1;
    }
    const last = Math.min(from - 1, n - 1);
    const floor = Math.max(1, (until ?? 0) + 1);
    return last >= floor ? this.scanBack(pattern, floor, last) : -1;
  }

  /** Matches among the nodes [from, to) (clamped to the searchable ones). */
  countIn(pattern: Pattern, from: number, to: number): number {
    const stop = Math.min(to, this.ready);
    let count = 0;
    const first = Math.max(1, from);
    if (!pattern.all && (pattern.literal === null || pattern.literal.length === 0)) {
      // One walk for the whole range, counting as it goes.
      this.walk(pattern, first, stop, () => {
        count++;
      });
      return count;
    }
    for (let i = first; i < stop; i++) {
      i = this.scan(pattern, i, stop);
      if (i < 0) break;
      count++;
    }
    return count;
  }

  /** Every match, in pre-order (a whole scan: for checks and small trees). */
  find(query: string): Int32Array {
    const pattern = compilePattern(query);
    if (pattern === null) return new Int32Array(0);
    const out: number[] = [];
    for (let i = this.next(pattern, 0, 1); i >= 0; i = this.next(pattern, i, 1)) out.push(i);
    return Int32Array.from(out);
  }

  /** First match in the nodes [from, to), or -1. */
  private scan(pattern: Pattern, from: number, to: number): number {
    if (pattern.all) return from < to ? from : -1;
    const { literal } = pattern;
    if (literal === null || literal.length === 0) return this.walk(pattern, from, to);
    const { bytes, start, end } = this;
    if (pattern.anchor !== "inside") {
      // The literal begins or ends the name: one look at each name, no search.
      const m = literal.length;
      const c0 = literal[0];
      const atStart = pattern.anchor === "start";
      for (let i = from; i < to; i++) {
        const at = atStart ? start[i] : end[i] - m;
        // The first byte, inline, settles most names without a call.
        if (end[i] - start[i] < m || bytes[at] !== c0) continue;
        if (equalAt(bytes, at, literal) && this.test(pattern, i)) return i;
      }
      return -1;
    }
    const stopAt = end[to - 1];
    let pos = start[from];
    let node = from;
    while (pos < stopAt) {
      const hit = bytes.indexOf(literal, pos);
      if (hit < 0 || hit + literal.length > stopAt) return -1;
      node = this.nodeAt(hit, node, to);
      if (node < 0) return -1;
      if (hit + literal.length > end[node]) {
        pos = hit + 1; // the hit spans two names
        continue;
      }
      if (this.test(pattern, node)) return node;
      // The test reads the whole name (and path): no other hit in this name can pass it.
      pos = Math.max(hit + 1, end[node]);
    }
    return -1;
  }

  /**
   * First match in the nodes [from, to) for a pattern with no literal to look for: a walk in pre-order
   * that carries each node's set of pattern positions down from its parent, as the focus globs do, and
   * skips a subtree where no position is left. With `each`, every match goes to it and the walk runs on.
   */
  private walk(pattern: Pattern, from: number, to: number, each?: (i: number) => void): number {
    const n = this.tree.length;
    if (this.masks.length < n) {
      this.masks = new Int32Array(n);
      this.stamps = new Uint32Array(n);
    }
    const { masks, stamps } = this;
    const stamp = ++this.stamp;
    const { parent } = this.tree;
    const { count } = this.measures;
    const accept = 1 << pattern.steps.length;
    for (let i = from; i < to; i++) {
      const p = parent[i];
      const above = stamps[p] === stamp ? masks[p] : this.maskOf(pattern, p);
      const mask = this.step(pattern, above, i);
      masks[i] = mask;
      stamps[i] = stamp;
      if (mask & accept) {
        if (each === undefined) return i;
        each(i);
      }
      if (mask === 0) i += count[i] - 1; // nothing below can match
    }
    return -1;
  }

  private masks = new Int32Array(0);
  private stamps = new Uint32Array(0);
  private stamp = 0;

  /** The pattern positions reached at node `i` (from the root down). */
  private maskOf(pattern: Pattern, i: number): number {
    const { parent, depth } = this.tree;
    let mask = closure(pattern, 1);
    const chain = new Int32Array(depth[i]);
    for (let a = i, k = depth[i] - 1; k >= 0; a = parent[a], k--) chain[k] = a;
    for (const node of chain) {
      mask = this.step(pattern, mask, node);
      if (mask === 0) break;
    }
    return mask;
  }

  /** The pattern positions at node `i`, given those at its parent. */
  private step(pattern: Pattern, above: number, i: number): number {
    const { steps } = pattern;
    let to = 0;
    for (let s = 0; s < steps.length; s++) {
      if (!(above & (1 << s))) continue;
      const step = steps[s];
      if (step.any) to |= 1 << s;
      else if (matches(this.bytes, this.start[i], this.end[i], step.parts)) to |= 1 << (s + 1);
    }
    return closure(pattern, to);
  }

  /** Last match in the nodes [from, to], or -1 (nodes tested backwards; candidates by the literal). */
  private scanBack(pattern: Pattern, from: number, to: number): number {
    if (pattern.all) return to >= from ? to : -1;
    const { literal } = pattern;
    if (literal === null || literal.length === 0) {
      for (let i = to; i >= from; i--) if (this.test(pattern, i)) return i;
      return -1;
    }
    const { bytes, start, end } = this;
    let pos = end[to] - literal.length;
    const floor = start[from];
    while (pos >= floor) {
      const hit = bytes.lastIndexOf(literal, pos);
      if (hit < floor || hit < 0) return -1;
      const node = this.nodeAt(hit, from, to + 1);
      if (node >= 0 && hit + literal.length <= end[node] && this.test(pattern, node)) return node;
      pos = hit - 1;
    }
    return -1;
  }

  /** The node among [lo, hi) whose name holds byte `at` (names lie in node order), or -1. */
  private nodeAt(at: number, lo: number, hi: number): number {
    const { start, end } = this;
    let a = lo;
    let b = hi - 1;
    if (a > b || at < start[a]) return -1;
    while (a < b) {
      const mid = (a + b + 1) >> 1;
      if (start[mid] <= at) a = mid;
      else b = mid - 1;
    }
    // Empty names share their start with the next name: step to the one that holds the byte.
    while (a < hi - 1 && end[a] <= at) a++;
    return a;
  }

  /** Whether node `i` matches: its name, or for a path pattern its whole path, level by level. */
  private test(pattern: Pattern, i: number): boolean {
    const { steps } = pattern;
    if (steps.length === 2 && steps[0].any && !steps[1].any)
      return matches(this.bytes, this.start[i], this.end[i], steps[1].parts);
    return (this.maskOf(pattern, i) & (1 << steps.length)) !== 0;
  }
}

/** Positions after `mask` once every `**` step is also taken as matching nothing. */
function closure(pattern: Pattern, mask: number): number {
  const { steps } = pattern;
  let m = mask;
  for (let s = 0; s < steps.length; s++) if (m & (1 << s) && steps[s].any) m |= 1 << (s + 1);
  return m;
}

/**
 * A query as path steps (a plain word is `**` then `*word*`, a name pattern `**` then itself), or null
 * for the empty query. A trailing `/` is dropped: it starts the level the user is about to type. A `~` not followed by 0 or 1 is FOCUS_SYNTAX, as in a focus path.
 */
export function compilePattern(query: string): Pattern | null {
  // A trailing "/" is the next level about to be typed: until it is, the query is what comes before.
  const text = query.length > 1 && query.endsWith("/") ? query.slice(0, -1) : query;
  if (text === "" || text === "/") return null;
  const path = text.includes("/");
  const raw = path ? splitPath(text) : ["**", text.includes("*") ? text : `*${text}*`];
  if (raw.length > MAX_STEPS)
    throw new EspalierError("FOCUS_SYNTAX", `a pattern may have at most ${MAX_STEPS} levels`);
  const steps = raw.map((segment): Step => {
    if (segment === "**") return { any: true };
    const { name } = parseSegment(segment.replace(/\*/g, "\u0000"));
    const parts = name
      .split("\u0000")
      .map((part) => encoder.encode(lowerAscii(part)))
      .map((bytes) => ({ bytes, fail: failureTable(bytes) }));
    return { any: false, parts };
  });
  const all = steps.every(
    (s) => s.any || (s.parts.length === 2 && s.parts.every((p) => p.bytes.length === 0)),
  );
  const lastStep = steps[steps.length - 1];
  let literal: Uint8Array | null = null;
  let anchor: Pattern["anchor"] = "inside";
  // Candidates come from the last level's longest literal part: a matching node's own name holds it.
  if (!lastStep.any) {
    const { parts } = lastStep;
    for (let k = 0; k < parts.length; k++) {
      if (parts[k].bytes.length <= (literal?.length ?? 0)) continue;
      literal = parts[k].bytes;
      anchor = k === 0 ? "start" : k === parts.length - 1 ? "end" : "inside";
    }
  }
  // "*" and "**" (every node) need no test; "*" under a path (a/*) does.
  return { query: text, all: all && !path, literal, anchor, steps };
}

function lowerAscii(text: string): string {
  return text.replace(/[A-Z]/g, (c) => c.toLowerCase());
}

/**
 * Whether bytes [s, e) match a `*` pattern: the first part at the start, the last at the end, the others
 * leftmost-first in between, each found by Knuth-Morris-Pratt ("Fast pattern matching in strings",
 * SIAM J. Comput. 6(2), 1977), so a test is linear in the name whatever the pattern. UTF-8 synchronises
 * itself: the bytes of a whole character sequence only match on character boundaries.
 */
function matches(b: Uint8Array, s: number, e: number, parts: readonly Part[]): boolean {
  const first = parts[0].bytes;
  if (parts.length === 1) return e - s === first.length && equalAt(b, s, first);
  if (e - s < first.length || !equalAt(b, s, first)) return false;
  const last = parts[parts.length - 1].bytes;
  const tail = e - last.length;
  let pos = s + first.length;
  if (tail < pos || !equalAt(b, tail, last)) return false;
  for (let k = 1; k < parts.length - 1; k++) {
    const at = search(b, pos, tail, parts[k]);
    if (at < 0) return false;
    pos = at + parts[k].bytes.length;
  }
  return true;
}

function equalAt(b: Uint8Array, at: number, part: Uint8Array): boolean {
  for (let k = 0; k < part.length; k++) if (b[at + k] !== part[k]) return false;
  return true;
}

/** KMP failure table: fail[k] is the longest proper border of part[0..k]. */
function failureTable(part: Uint8Array): Int32Array {
  const fail = new Int32Array(part.length);
  for (let i = 1, k = 0; i < part.length; i++) {
    while (k > 0 && part[i] !== part[k]) k = fail[k - 1];
    if (part[i] === part[k]) k++;
    fail[i] = k;
  }
  return fail;
}

/** Leftmost start in [from, to) where the part lies wholly before `to`, or -1. */
function search(b: Uint8Array, from: number, to: number, part: Part): number {
  const { bytes, fail } = part;
  const m = bytes.length;
  if (m === 0) return from;
  for (let i = from, k = 0; i < to; i++) {
    while (k > 0 && b[i] !== bytes[k]) k = fail[k - 1];
    if (b[i] === bytes[k]) k++;
    if (k === m) return i - m + 1;
  }
  return -1;
}
