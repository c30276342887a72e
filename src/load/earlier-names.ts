import type { ByteRuns } from "./table/byte-id-index.js";

/**
 * Nodes looked at on either side of the one expected when a name is not there; twice as many with each
 * look in a row that found nothing, up to 8 times.
 */
const AHEAD = 16;
/** Most names set without a look after looks in a row that found nothing (an input in another order). */
const QUIET = 64;

/**
 * For a document read after an earlier version of itself (a diff's NEW after its OLD, one after the
 * other): which of the earlier version's nodes holds the bytes of the name being set, so that the name
 * is placed where the earlier version keeps them instead of copied (both versions' names then in one
 * buffer: memory touched once, docs/performance.md). Nodes come in document order in both, and most
 * keep their place: the node expected is the one after the last (a name not found counts as found
 * there); when its name differs, the {@link AHEAD} nodes on either side are looked at (nodes removed or
 * added since; further after looks that found nothing: a moved subtree shifts the rest by its size);
 * after two or more such looks in a row the next 1, 3, 7, ... names (at most {@link QUIET}) pass
 * without one, so an input in another order costs about a comparison a name. Equal bytes are the same
 * name whichever node holds them, so a wrong guess costs nothing but the look: a name not found is
 * copied as before, and the tree read is the same.
 */
export class EarlierNames {
  private next = 0;
  private quiet = 0;
  // Looks in a row that found nothing.
  private misses = 0;

  constructor(
    /** The earlier version's names, by its node order (a tree's name pool). */
    readonly names: ByteRuns,
    /** How many nodes the earlier version has. */
    private readonly length: number,
  ) {}

  /** The node expected next. */
  get expected(): number {
    return this.next;
  }

  /** The next name is expected to be node `k`'s, after names that were: no looks to pass. */
  expect(k: number): void {
    this.next = k;
    this.misses = 0;
    this.quiet = 0;
  }

  /** The earlier node whose name is the bytes `cell[s, e)`, looked for near the one expected; or -1. */
  find(cell: Uint8Array, s: number, e: number): number {
    const names = this.names;
    const c = this.next;
    // A name not found is taken to stand where the expected one did (a node renamed or added).
    this.next = c + 1;
    if (c < this.length && sameAt(names, c, cell, s, e)) {
      this.misses = 0;
      return c;
    }
    if (this.quiet > 0) {
      this.quiet--;
      return -1;
    }
    // Nodes removed since (the name further on) or added (further back), nearest first; after looks
    // that found nothing, further (a moved subtree shifts the rest by its size).
    const reach = AHEAD << Math.min(this.misses, 3);
    for (let d = 1; d <= reach; d++) {
      for (const k of [c + d, c - d]) {
        if (k < 0 || k >= this.length || !sameAt(names, k, cell, s, e)) continue;
        this.next = k + 1;
        this.misses = 0;
        return k;
      }
    }
    this.misses++;
    this.quiet = Math.min(QUIET, 2 ** (this.misses - 1) - 1);
    return -1;
  }
}

/** Whether entry `k` of `runs` is spelled by the bytes `cell[s, e)`. */
export function sameAt(runs: ByteRuns, k: number, cell: Uint8Array, s: number, e: number): boolean {
  const n = e - s;
  if (runs.size[k] !== n) return false;
  const bytes = runs.bytes;
  for (let x = runs.start[k], y = s; y < e; x++, y++) if (bytes[x] !== cell[y]) return false;
  return true;
}
