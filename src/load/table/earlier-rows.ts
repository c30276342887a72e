import { EarlierNames, sameAt } from "../earlier-names.js";
import type { ByteRuns } from "./byte-id-index.js";

/**
 * For a table read after an earlier version of itself (a diff's NEW after its OLD, one after the other):
 * which of the earlier version's rows the record being read stands for, so that a cell whose bytes are
 * that row's too can be placed where the earlier version keeps them instead of copied (NEW's name and
 * id pools then read OLD's bytes: memory touched once for both versions, docs/performance.md). The row
 * is found by its id near the one expected ({@link EarlierNames} over the ids), and a name is looked for
 * in that row; without ids, a name is looked for near the one expected as in a nested document. Only
 * ever a guess, checked byte for byte: a cell not found is copied as before, and the table read is the
 * same either way.
 */
export class EarlierRows {
  private readonly byId: EarlierNames | null;
  private readonly byName: EarlierNames | null;
  private row = -1;

  constructor(
    /** The earlier version's ids, by its node order (a tree's ids pool), or null. */
    readonly ids: ByteRuns | null,
    /** The earlier version's names, by the same order, or null. */
    readonly names: ByteRuns | null,
    /** How many nodes the earlier version has. */
    private readonly length: number,
  ) {
    this.byId = ids === null ? null : new EarlierNames(ids, length);
    this.byName = ids === null && names !== null ? new EarlierNames(names, length) : null;
  }

  /** The earlier row whose id is the bytes `cell[s, e)`, looked for near the one expected; or -1. */
  idRow(cell: Uint8Array, s: number, e: number): number {
    this.row = this.byId!.find(cell, s, e);
    return this.row;
  }

  /**
   * The earlier row whose name is the bytes `cell[s, e)`: the row of the record's id when its name is
   * those bytes (with no ids, a row near the one expected); else -1.
   */
  nameRow(cell: Uint8Array, s: number, e: number): number {
    if (this.byName !== null) {
      this.row = this.byName.find(cell, s, e);
      return this.row;
    }
    // Before the record's id cell (a name column ahead of the id column), the row expected.
    const c = this.row !== -1 ? this.row : this.byId!.expected;
    return c < this.length && sameAt(this.names!, c, cell, s, e) ? c : -1;
  }

  /** The earlier row the record's id (or, with no ids, its name) was found in so far, or -1. */
  get found(): number {
    return this.row;
  }

  /** The record ends. */
  endRecord(): void {
    this.row = -1;
  }

  /** The next record is expected to stand for earlier row `row` (the rows before it were taken whole). */
  expect(row: number): void {
    this.byId?.expect(row);
    this.byName?.expect(row);
  }
}
