import type { ByteRuns } from "./byte-id-index.js";

/** Rows looked at past the one expected when a row's id is not there (a few rows removed since). */
const AHEAD = 16;
/** Rows read without looking ahead after a look ahead found nothing (rows added, or another order). */
const QUIET = 64;

/**
 * For a table read after an earlier version of itself (a diff's NEW after its OLD, one after the other):
 * which of the earlier version's rows the record being read stands for, so that a cell whose bytes are
 * that row's too can be placed where the earlier version keeps them instead of copied (NEW's name and
 * id pools then read OLD's bytes: memory touched once for both versions, docs/performance.md). Most
 * rows keep their place between two exports of one table: the row expected is the one after the last
 * found; when the id is not there, the next {@link AHEAD} rows are looked at (rows removed since), and
 * after a look that found nothing none is made for {@link QUIET} rows, so a table in another order
 * costs a comparison a cell. Only ever a guess, checked byte for byte: a cell not found is copied as
 * before, and the table read is the same either way.
 */
export class EarlierRows {
  private next = 0;
  private row = -1;
  private quietUntil = 0;
  private records = 0;

  constructor(
    /** The earlier version's ids, by its node order (a tree's ids pool), or null. */
    readonly ids: ByteRuns | null,
    /** The earlier version's names, by the same order, or null. */
    readonly names: ByteRuns | null,
    /** How many nodes the earlier version has. */
    private readonly length: number,
  ) {}

  /** The earlier row whose id is the bytes `cell[s, e)`, looked for near the one expected; or -1. */
  idRow(cell: Uint8Array, s: number, e: number): number {
    const ids = this.ids!;
    const c = this.next;
    if (c < this.length && sameAt(ids, c, cell, s, e)) {
      this.row = c;
      return c;
    }
    if (this.records < this.quietUntil) return -1;
    const last = Math.min(this.length - 1, c + AHEAD);
    for (let k = c + 1; k <= last; k++) {
      if (!sameAt(ids, k, cell, s, e)) continue;
      this.row = k;
      return k;
    }
    this.quietUntil = this.records + QUIET;
    return -1;
  }

  /**
   * The earlier row whose name is the bytes `cell[s, e)`: the row the record's id was found at (or,
   * before its id cell or with none found, the row expected), when its name is those bytes; else -1.
   */
  nameRow(cell: Uint8Array, s: number, e: number): number {
    const c = this.row !== -1 ? this.row : this.next;
    return c < this.length && sameAt(this.names!, c, cell, s, e) ? c : -1;
  }

  /** The record ends: the row after the one found is expected next (with none found, the same). */
  endRecord(): void {
    if (this.row !== -1) this.next = this.row + 1;
    else if (this.ids === null) this.next++;
    this.row = -1;
    this.records++;
  }
}

/** Whether entry `k` of `runs` is spelled by the bytes `cell[s, e)`. */
function sameAt(runs: ByteRuns, k: number, cell: Uint8Array, s: number, e: number): boolean {
  const n = e - s;
  if (runs.size[k] !== n) return false;
  const bytes = runs.bytes;
  for (let x = runs.start[k], y = s; y < e; x++, y++) if (bytes[x] !== cell[y]) return false;
  return true;
}
