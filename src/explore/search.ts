import { EspalierError } from "../errors.js";
import type { Measures } from "../model/measure.js";
import { NamePool } from "../model/names.js";
import { pseudonym } from "../model/pseudonym.js";
import { parseSegment, splitPath } from "../model/segment.js";
import type { Tree } from "../model/tree.js";

/** The nodes a query matches, in pre-order, and whether every name was searched. */
export interface Found {
  readonly matches: Int32Array;
  /** False while pseudonyms are still being computed: only the first `searched` nodes were looked at. */
  readonly complete: boolean;
  /** The query is not a valid pattern (yet): a lone `~`, as a path's escaping reads it. */
  readonly invalid: boolean;
}

/** A name pattern's literal parts (split at `*`), with the KMP failure table of each. */
interface Parts {
  readonly bytes: Uint8Array[];
  readonly fail: Int32Array[];
}

type Step = { any: true } | { any: false; parts: Parts };

const MAX_STEPS = 30;
const encoder = new TextEncoder();

/**
 * Live search over every node's name, as printed: the name, or its pseudonym when a key is set (a
 * search must not find what the screen would not show). Letters A-Z match a-z. A query without `/`
 * or `*` matches names that contain it; with `*` (any run of characters within a name) it matches
 * whole names; with `/` it is a path pattern read as a focus glob is (`**` any number of levels,
 * RFC 6901 escaping, `~0` for `~` and `~1` for `/`).
 *
 * The names are copied once, lower-cased, into one buffer in node order, so a query costs one pass
 * over bytes and no string per node. Pseudonyms cost a keyed hash each: they are computed in slices
 * ({@link advance}), and a query meanwhile searches the nodes done so far.
 */
export class NameSearch {
  private bytes: Uint8Array;
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
      this.bytes = new Uint8Array(Math.max(1, n * 17));
      return;
    }
    const names = tree.name;
    let total = 0;
    if (names instanceof NamePool) for (let i = 0; i < n; i++) total += names.byteLengthOf(i);
    this.bytes = new Uint8Array(Math.max(16, total));
    for (let i = 0; i < n; i++) {
      if (names instanceof NamePool && !names.hasExact) this.put(i, names.bytesOf(i));
      else this.put(i, encoder.encode(names.get(i)));
    }
    this.ready = n;
  }

  /** Share of the nodes searched (1 without a key). */
  get progress(): number {
    return this.tree.length === 0 ? 1 : this.ready / this.tree.length;
  }

  /** Computes up to `count` more pseudonyms; returns whether every name is now searchable. */
  advance(count: number): boolean {
    const key = this.key;
    if (key === undefined) return true;
    const stop = Math.min(this.tree.length, this.ready + count);
    for (let i = this.ready; i < stop; i++) {
      const shown =
        i === 0 && this.tree.syntheticRoot ? this.tree.name.get(i) : pseudonym(key, this.tree.name.get(i));
      this.put(i, encoder.encode(shown));
    }
    this.ready = stop;
    return stop === this.tree.length;
  }

  private put(i: number, src: Uint8Array): void {
    if (this.used + src.length > this.bytes.length) {
      const grown = new Uint8Array(Math.max(this.bytes.length * 2, this.used + src.length));
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

  /** Every node below the root whose name (or path) matches `query`, in pre-order. */
  find(query: string): Found {
    let steps: Step[];
    try {
      steps = compile(query);
    } catch (err) {
      if (err instanceof EspalierError) return { matches: new Int32Array(0), complete: true, invalid: true };
      throw err;
    }
    const complete = this.ready === this.tree.length;
    if (steps.length === 0) return { matches: new Int32Array(0), complete, invalid: false };
    return { matches: this.walk(steps), complete, invalid: false };
  }

  /** One forward pass with a bit set of pattern positions per node, as the focus globs do. */
  private walk(steps: Step[]): Int32Array {
    const accept = 1 << steps.length;
    const closure = (mask: number): number => {
      let m = mask;
      for (let s = 0; s < steps.length; s++) if (m & (1 << s) && steps[s].any) m |= 1 << (s + 1);
      return m;
    };
    const n = this.ready;
    const { parent } = this.tree;
    const { count } = this.measures;
    const state = new Int32Array(n);
    const out: number[] = [];
    const { bytes, start, end } = this;
    if (n > 0) state[0] = closure(1);
    for (let i = 1; i < n; i++) {
      const from = state[parent[i]];
      if (from === 0) {
        i += count[i] - 1; // nothing below can match
        continue;
      }
      let to = 0;
      for (let s = 0; s < steps.length; s++) {
        if (!(from & (1 << s))) continue;
        const step = steps[s];
        if (step.any) to |= 1 << s;
        else if (matches(bytes, start[i], end[i], step.parts)) to |= 1 << (s + 1);
      }
      to = closure(to);
      state[i] = to;
      if (to & accept) out.push(i);
    }
    return Int32Array.from(out);
  }
}

/** A query as path steps: a plain word is `**` then `*word*`, a name pattern is `**` then itself. */
function compile(query: string): Step[] {
  if (query === "") return [];
  const path = query.includes("/");
  const raw = path ? splitPath(query) : ["**", query.includes("*") ? query : `*${query}*`];
  if (raw.length > MAX_STEPS)
    throw new EspalierError("FOCUS_SYNTAX", `a pattern may have at most ${MAX_STEPS} levels`);
  return raw.map((segment): Step => {
    if (segment === "**") return { any: true };
    const { name } = parseSegment(segment.replace(/\*/g, "\u0000"));
    const bytes = name.split("\u0000").map((part) => encoder.encode(lowerAscii(part)));
    return { any: false, parts: { bytes, fail: bytes.map(failureTable) } };
  });
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
function matches(b: Uint8Array, s: number, e: number, parts: Parts): boolean {
  const { bytes, fail } = parts;
  const first = bytes[0];
  if (bytes.length === 1) return e - s === first.length && equalAt(b, s, first);
  if (e - s < first.length || !equalAt(b, s, first)) return false;
  const last = bytes[bytes.length - 1];
  const tail = e - last.length;
  let pos = s + first.length;
  if (tail < pos || !equalAt(b, tail, last)) return false;
  for (let k = 1; k < bytes.length - 1; k++) {
    const at = search(b, pos, tail, bytes[k], fail[k]);
    if (at < 0) return false;
    pos = at + bytes[k].length;
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

/** Leftmost start in [from, to) where `part` lies wholly before `to`, or -1. */
function search(b: Uint8Array, from: number, to: number, part: Uint8Array, fail: Int32Array): number {
  const m = part.length;
  if (m === 0) return from;
  for (let i = from, k = 0; i < to; i++) {
    while (k > 0 && b[i] !== part[k]) k = fail[k - 1];
    if (b[i] === part[k]) k++;
    if (k === m) return i - m + 1;
  }
  return -1;
}
