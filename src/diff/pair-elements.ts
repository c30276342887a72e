import { EMPTY_ARRAY, EMPTY_OBJECT, ITEM_NAME_FIELD, SCALAR_VALUE_FIELD } from "../load/load-options.js";
import { NamePool } from "../model/names.js";
import type { Tree } from "../model/tree.js";

// Two documents read as values name a list's elements by their index (RFC 6901), so pairing children by
// name pairs elements by position: an element put first pairs every later one with its predecessor, each
// field `edited` to the other's value. A list is a sequence (RFC 8259 §5: an array is an ordered sequence
// of values; YAML 1.2 §3.2.1.1 likewise, and a stream's documents come in order), so its elements are
// aligned as a line diff aligns lines: the longest common subsequence of their keys pairs elements that
// kept their place among the others; between two such pairs, elements without a name pair in their
// order (an element whose value changed is still that element). An element moved elsewhere in the list
// is one removed and one added, as a moved line is: its order is part of the list's value.

/** A document read as values, for aligning its lists: its scalars' text and its elements' names. */
export interface ElementReading {
  readonly tree: Tree;
  readonly count: Int32Array;
  readonly values: readonly string[];
  /** The string `name` member of each element that has one ("" else), when some element has one. */
  readonly items: readonly string[] | undefined;
  /** Whether names are hashed by their bytes (both versions' names are pooled bytes), else as text. */
  readonly nameBytes: boolean;
  /** Each node's value with all below it as a hash (see {@link valueHashes}), made when first asked for. */
  hashes?: Float64Array;
}

/** Both versions as {@link ElementReading}s, when both are documents read as values keeping their scalars; else null. */
export function elementReadings(
  oldTree: Tree,
  oldCount: Int32Array,
  newTree: Tree,
  newCount: Int32Array,
): { old: ElementReading; new: ElementReading } | null {
  // Names hash alike in both versions only when both hash them one way.
  const nameBytes = [oldTree, newTree].every((t) => t.name instanceof NamePool && t.name.byteRuns() !== null);
  const read = (tree: Tree, count: Int32Array): ElementReading | null => {
    const values = tree.reading?.shape === "values" ? tree.fields.get(SCALAR_VALUE_FIELD) : undefined;
    if (values === undefined) return null;
    return { tree, count, values, items: tree.fields.get(ITEM_NAME_FIELD), nameBytes };
  };
  const old = read(oldTree, oldCount);
  const now = read(newTree, newCount);
  return old === null || now === null ? null : { old, new: now };
}

/** Whether node `p` holds a sequence: a list, or the root of a YAML stream of several documents. */
export function isSequence(r: ElementReading, p: number): boolean {
  return r.values[p] === EMPTY_ARRAY || (p === 0 && (r.tree.reading?.documents ?? 0) > 1);
}

/**
 * The most cells (old elements times new ones, once the equal ends are set aside) aligned by a longest
 * common subsequence; past it the rest pair in order, as by index. A bound chosen, not tuned: a list of
 * a thousand changed elements on each side takes 4 MB and a few milliseconds.
 */
const MOST_CELLS = 1_000_000;

/**
 * Pairs the elements of old list `o` and new list `n` (see the top of this file). Returns how many
 * pairs it made.
 */
export function pairElements(
  old: ElementReading,
  o: number,
  now: ElementReading,
  n: number,
  oldToNew: Int32Array,
  newToOld: Int32Array,
): number {
  const oldKids = childrenOf(old.count, o);
  const newKids = childrenOf(now.count, n);
  const oldKeys = oldKids.map((c) => keyOf(old, c));
  const newKeys = newKids.map((c) => keyOf(now, c));
  const anchors = commonSubsequence(oldKeys, newKeys);
  let pairs = 0;
  const pair = (i: number, j: number) => {
    oldToNew[oldKids[i]] = newKids[j];
    newToOld[newKids[j]] = oldKids[i];
    pairs++;
  };
  // Between two anchors (and before the first, after the last), the elements without a name in order.
  let i0 = 0;
  let j0 = 0;
  for (let a = 0; a <= anchors.length; a += 2) {
    const i1 = a < anchors.length ? anchors[a] : oldKeys.length;
    const j1 = a < anchors.length ? anchors[a + 1] : newKeys.length;
    let j = j0;
    for (let i = i0; i < i1; i++) {
      if (named(old, oldKids[i])) continue;
      while (j < j1 && named(now, newKids[j])) j++;
      if (j === j1) break;
      pair(i, j++);
    }
    if (a < anchors.length) pair(i1, j1);
    i0 = i1 + 1;
    j0 = j1 + 1;
  }
  return pairs;
}

/** The children of node `p`, in order. */
function childrenOf(count: Int32Array, p: number): number[] {
  const kids: number[] = [];
  for (let c = p + 1; c < p + count[p]; c += count[c]) kids.push(c);
  return kids;
}

function named(r: ElementReading, c: number): boolean {
  return r.items !== undefined && r.items[c] !== "";
}

/**
 * What tells an element apart, as a number: its `name` when it has one (its other fields may change),
 * else its whole value: a scalar's text, or every name and scalar below an object or a list, in order
 * (see {@link valueHashes}). Two hashes of 32 bits make the number (53 bits kept): elements whose keys
 * are equal by chance are paired, and their members are then compared one by one, so a clash shows
 * their differences as changes, never hides one.
 */
function keyOf(r: ElementReading, c: number): number {
  if (named(r, c)) return joined(text(NAMED_A, r.items?.[c] ?? ""), text(NAMED_B, r.items?.[c] ?? ""));
  const v = r.values[c];
  if (v !== EMPTY_OBJECT && v !== EMPTY_ARRAY) return joined(text(OFFSET_A, v), text(OFFSET_B, v));
  r.hashes ??= valueHashes(r);
  return r.hashes[c];
}

/**
 * Each node's value with everything below it as a number of two 32-bit hashes: its scalar text (or
 * `{}`, `[]`), then each child's name and hash, folded in by two mixers (FNV-1a's, and a multiply and
 * rotate as MurmurHash3 does), so two elements hash alike when their values are equal (an element's own
 * name, its index, is its parent's to hash). One pass up the tree in reverse pre-order, every child
 * before its parent (the last child first); each name and scalar is read once.
 */
function valueHashes(r: ElementReading): Float64Array {
  const { tree, values } = r;
  const n = tree.length;
  const a = new Uint32Array(n);
  const b = new Uint32Array(n);
  for (let i = 0; i < n; i++) {
    const h = text(OFFSET_A, values[i]);
    a[i] = h;
    b[i] = h ^ OFFSET_B;
  }
  const runs = r.nameBytes ? (tree.name as NamePool).byteRuns() : null;
  const { parent } = tree;
  for (let i = n - 1; i > 0; i--) {
    const p = parent[i];
    const name =
      runs !== null
        ? bytesHash(OFFSET_A, runs.bytes, runs.start[i], runs.size[i])
        : text(OFFSET_A, tree.name.get(i));
    a[p] = word(word(a[p], name), a[i]);
    b[p] = mix(mix(b[p], name), b[i]);
  }
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = joined(a[i], b[i]);
  return out;
}

const OFFSET_A = 0x811c9dc5;
const OFFSET_B = 0x050c5d1f;
const NAMED_A = 0x1b873593;
const NAMED_B = 0x6b43a9b5;

/** Two 32-bit hashes as one number of 53 bits (exact in a double). */
function joined(a: number, b: number): number {
  return a * 0x200000 + (b >>> 11);
}

/** MurmurHash3's step for one 32-bit word (its constants), from `h`. */
function mix(h: number, w: number): number {
  let k = Math.imul(w, 0xcc9e2d51);
  k = Math.imul((k << 15) | (k >>> 17), 0x1b873593);
  const x = h ^ k;
  return (Math.imul((x << 13) | (x >>> 19), 5) + 0xe6546b64) >>> 0;
}

/** FNV-1a (32 bits) of `s`'s UTF-16 code units, from `h`. */
function text(h: number, s: string): number {
  let x = h;
  for (let k = 0; k < s.length; k++) x = Math.imul(x ^ s.charCodeAt(k), 0x01000193) >>> 0;
  return x;
}

/** FNV-1a (32 bits) of `size` bytes from `start`, from `h`. */
function bytesHash(h: number, bytes: Uint8Array, start: number, size: number): number {
  let x = h;
  for (let k = start; k < start + size; k++) x = Math.imul(x ^ bytes[k], 0x01000193) >>> 0;
  return x;
}

/** FNV-1a's step for a 32-bit word, from `h`. */
function word(h: number, w: number): number {
  return Math.imul(h ^ w, 0x01000193) >>> 0;
}

/**
 * A longest common subsequence of two key lists, as index pairs (i, j, i, j, … ascending): the equal
 * ends first, then the middle by the textbook table of common-subsequence lengths when it has at most
 * {@link MOST_CELLS} cells; else the middle has no pair in it (its elements pair in order, as by index).
 */
export function commonSubsequence<T>(a: readonly T[], b: readonly T[]): number[] {
  let start = 0;
  while (start < a.length && start < b.length && a[start] === b[start]) start++;
  let endA = a.length;
  let endB = b.length;
  while (endA > start && endB > start && a[endA - 1] === b[endB - 1]) {
    endA--;
    endB--;
  }
  const out: number[] = [];
  for (let k = 0; k < start; k++) out.push(k, k);
  const m = endA - start;
  const n = endB - start;
  if (m > 0 && n > 0 && m * n <= MOST_CELLS) {
    // table[i * (n + 1) + j]: the length of a longest common subsequence of a[start + i ..] and b[start + j ..].
    const w = n + 1;
    const table = new Int32Array((m + 1) * w);
    for (let i = m - 1; i >= 0; i--) {
      for (let j = n - 1; j >= 0; j--) {
        table[i * w + j] =
          a[start + i] === b[start + j]
            ? table[(i + 1) * w + j + 1] + 1
            : Math.max(table[(i + 1) * w + j], table[i * w + j + 1]);
      }
    }
    for (let i = 0, j = 0; i < m && j < n; ) {
      if (a[start + i] === b[start + j]) {
        out.push(start + i, start + j);
        i++;
        j++;
      } else if (table[(i + 1) * w + j] >= table[i * w + j + 1]) i++;
      else j++;
    }
  }
  for (let k = 0; k < a.length - endA; k++) out.push(endA + k, endB + k);
  return out;
}
