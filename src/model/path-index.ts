import { hashBytes, mix, seed } from "./child-hash.js";
import type { Measures } from "./measure.js";
import { NamePool } from "./names.js";
import { escapeSegment, type Segment } from "./segment.js";
import type { Tree } from "./tree.js";

/** A parent with at least this many children finds them by a table of name hashes, not a Map of names. */
export const NAME_TABLE_MIN = 256;

/** How many recently built paths {@link PathIndex.path} remembers. */
const RECENT_PATHS = 1 << 16;

/**
 * Printable, re-readable paths of nodes, and the reverse lookup. Per-parent name indexes are built
 * lazily, only for parents whose children are looked up, so the whole tree never pays for them.
 */
export class PathIndex {
  private readonly byParent = new Map<number, Map<string, number[]>>();
  // Wide parents' children by the hash of their pooled name bytes (open addressing, child + 1 per slot):
  // no string per child, so a parent with a million children costs the collector nothing.
  private readonly tables = new Map<number, Int32Array>();
  // Paths built lately, by node: a path is its parent's plus one segment, so the paths of a shown
  // subtree built in pre-order cost one segment each, not a walk to the root each (a chain a million
  // deep would otherwise take a million squared steps). Two generations: when `recent` is full it
  // becomes `older`, so the path just built is always kept. Both are dropped when `base` changes.
  private recent = new Map<number, string>();
  private older = new Map<number, string>();
  private recentBase: ((j: number) => string) | undefined;

  constructor(
    readonly tree: Tree,
    readonly measures: Measures,
  ) {}

  /** Children of `p` grouped by name, in input order. */
  childrenByName(p: number): Map<string, number[]> {
    let map = this.byParent.get(p);
    if (map) return map;
    map = new Map();
    const { count } = this.measures;
    const end = p + count[p];
    for (let c = p + 1; c < end; c += count[c]) {
      const key = this.tree.name.get(c);
      const list = map.get(key);
      if (list) list.push(c);
      else map.set(key, [c]);
    }
    this.byParent.set(p, map);
    return map;
  }

  /** The child of `p` that a parsed segment names, or -1. */
  child(p: number, seg: Segment): number {
    const { count } = this.measures;
    if (count[p] === 1) return -1;
    if (count[p] === count[p + 1] + 1)
      return this.tree.name.get(p + 1) === seg.name && seg.rank === 1 ? p + 1 : -1;
    const table = this.wideTable(p);
    if (table) {
      // The pool holds only well-formed text (no exact strings), so an ill-formed name matches nothing.
      if (!seg.name.isWellFormed()) return -1;
      const bytes = Buffer.from(seg.name, "utf8");
      const list = this.sameNamed(p, table, bytes);
      return seg.rank <= list.length ? list[seg.rank - 1] : -1;
    }
    const list = this.childrenByName(p).get(seg.name);
    return list && seg.rank <= list.length ? list[seg.rank - 1] : -1;
  }

  /** Builds `p`'s name table now (at load time) if it is wide, so no focus pays for it. */
  warm(p: number): void {
    this.wideTable(p);
  }

  /** The hash table of a wide parent's children, built on first use; null for other parents. */
  private wideTable(p: number): Int32Array | null {
    const names = this.tree.name;
    if (!(names instanceof NamePool) || names.hasExact || this.measures.children[p] < NAME_TABLE_MIN)
      return null;
    let table = this.tables.get(p);
    if (table) return table;
    let size = 1;
    while (size < this.measures.children[p] * 2) size *= 2;
    table = new Int32Array(size);
    const mask = size - 1;
    const { count } = this.measures;
    for (let c = p + 1, end = p + count[p]; c < end; c += count[c]) {
      let h = mix(names.hashFrom(c, seed(p))) & mask;
      while (table[h] !== 0) h = (h + 1) & mask;
      table[h] = c + 1;
    }
    this.tables.set(p, table);
    return table;
  }

  /** The children of wide parent `p` whose name is spelled by `bytes`, in input order. */
  private sameNamed(p: number, table: Int32Array, bytes: Uint8Array): number[] {
    const names = this.tree.name as NamePool;
    const mask = table.length - 1;
    const found: number[] = [];
    for (let h = mix(hashBytes(seed(p), bytes, 0, bytes.length)) & mask; table[h] !== 0; h = (h + 1) & mask) {
      const c = table[h] - 1;
      if (names.equalsBytes(c, bytes, 0, bytes.length)) found.push(c);
    }
    return found.length > 1 ? found.sort((a, b) => a - b) : found;
  }

  /** The escaped segment of node `i` (with `~~N` when it is the N-th sibling of its name). */
  segment(i: number, base = escapeSegment(this.tree.name.get(i))): string {
    const p = this.tree.parent[i];
    if (p < 0) return base;
    // An only child has no sibling to share its name with: no name index needed (saves one per level).
    if (this.measures.count[p] === this.measures.count[i] + 1) return base;
    const table = this.wideTable(p);
    const list = table
      ? this.sameNamed(p, table, (this.tree.name as NamePool).bytesOf(i))
      : this.childrenByName(p).get(this.tree.name.get(i))!;
    if (list.length === 1 || list[0] === i) return base;
    return `${base}~~${list.indexOf(i) + 1}`;
  }

  /**
   * The path of node `i`: segments below the root joined by "/"; "" for the root. `base` may replace
   * each node's escaped name (pseudonyms); the sibling rank still comes from the real names.
   */
  path(i: number, base?: (j: number) => string): string {
    if (base !== this.recentBase) {
      this.recent.clear();
      this.older.clear();
      this.recentBase = base;
    } else if (this.recent.size >= RECENT_PATHS) {
      this.older = this.recent;
      this.recent = new Map();
    }
    const parts: string[] = [];
    let known: string | undefined;
    for (let c = i; this.tree.parent[c] >= 0; c = this.tree.parent[c]) {
      known = this.recent.get(c) ?? this.older.get(c);
      if (known !== undefined) break;
      parts.push(base ? this.segment(c, base(c)) : this.segment(c));
    }
    parts.reverse();
    let path: string;
    if (known !== undefined) {
      path = parts.length === 0 ? known : `${known}/${parts.join("/")}`;
    } else {
      const joined = parts.join("/");
      // A first segment that is empty needs the RFC 6901 form with a leading "/" to be read back.
      path = parts.length > 0 && parts[0] === "" ? `/${joined}` : joined;
    }
    this.recent.set(i, path);
    return path;
  }
}
