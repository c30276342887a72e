import { Buffer } from "node:buffer";
import type { NamePool } from "../../model/names.js";
import type { BytesKeeper, EarlierBytes } from "../earlier-bytes.js";
import { KeptForLater } from "../kept-for-later.js";
import type { BytesAt } from "../load-options.js";
import { releasableMemory, releaseMemory } from "../releasable-memory.js";
import type { ByteIdIndex } from "./byte-id-index.js";
import type { RowLines } from "./row-lines.js";

export { MOST_KEPT_BYTES } from "../earlier-bytes.js";

const LF = 0x0a;

/** One column as a table reader keeps it (csv-table-reader.ts): what a later version's rows may copy. */
export interface KeptColumn {
  readonly name: string;
  readonly keeping: number;
  readonly pool: NamePool | null;
  readonly values: Float64Array;
  readonly cells: string[];
  readonly asText: boolean;
  readonly links: boolean;
}

/**
 * What a CSV/TSV table's load kept for the load of a later version of it (a diff's OLD for its NEW, one
 * after the other): the input's bytes, where each data row starts in them, the line it starts on, and
 * the cells as the reader kept them. The later table's rows whose bytes are these bytes are then taken
 * from here instead of scanned (csv-table-reader.ts), and read the same: a row's cells are a function of
 * its bytes, and its end of its bytes and the byte after them. The bytes kept, or (`readable`) the input
 * read again a window at a time (a regular file: LoadOptions.inputReadAgain, earlierInput), where keeping
 * them would be fresh memory as big as the file.
 */
export class KeptTable {
  constructor(
    /** The input's bytes as its load kept them, or read again (earlier-bytes.ts). */
    private readonly bytes: EarlierBytes,
    /**
     * Where data row r (from 0) starts in `bytes`; at `rows`, where the last row's record ends (on memory
     * from {@link releasableMemory}).
     */
    readonly start: Uint32Array,
    /** Data rows. */
    readonly rows: number,
    /** The line each row starts on. */
    readonly lines: RowLines,
    /** The line after the last row's record. */
    readonly endLine: number,
    readonly delimiter: number,
    readonly header: readonly string[],
    /** The line the header starts on, and the column (1-based, UTF-16 units) of each of its cells. */
    readonly headerLine: number,
    readonly headerColumns: readonly number[],
    readonly columns: readonly KeptColumn[],
    /** The rows (in order) whose cell is no plain number, by column (of numbers; empty for others). */
    readonly textRows: readonly (readonly number[])[],
    /** The longest record the reader took (read-limits.ts). */
    readonly maxLineBytes: number,
  ) {}

  /**
   * The rows by id, as the table's link indexed them (link-table.ts), kept for a later version read
   * against this table: its rows that were not taken whole are found by id there (read-as-earlier.ts).
   */
  rowsById: ByteIdIndex | undefined;

  /**
   * Gives the memory of the bytes and the rows' starts back now, not whenever the collector finds them
   * (they are old by then, and a full collection may not come before the diff's own stage, whose memory
   * would then come on top of them): their memory resized to nothing. The table is read no more.
   */
  release(): void {
    this.bytes.release();
    releaseMemory(this.start.buffer);
  }

  /** Whether the bytes can be compared with: kept, or read again through `readAgain`. */
  readable(readAgain: BytesAt | undefined): boolean {
    return this.bytes.readable(readAgain);
  }

  /**
   * Whether an input whose first bytes are `bytes[0, n)` begins with this table's bytes before its first
   * row (a byte order mark, the header, blank lines) and ends them as this table did: the byte after
   * them is there and, after a carriage return, the same (a line feed or not).
   */
  startsAs(bytes: Uint8Array, n: number): boolean {
    if (this.rows === 0) return false;
    const end = this.start[0];
    const kept = this.bytes;
    if (end >= n || !kept.holds(0, end + 1)) return false;
    const old = kept.window;
    const o = kept.windowAt;
    if (Buffer.compare(old.subarray(-o, end - o), bytes.subarray(0, end)) !== 0) return false;
    return old[end - 1 - o] === LF || old[end - o] === bytes[end];
  }

  /** The line row `r` (from 0; `rows` for the end) starts on. */
  lineOf(r: number): number {
    return r === this.rows ? this.endLine : this.lines.lineOf(r + 1);
  }

  /**
   * The earlier rows from `r` on that `bytes[p, n)` repeats whole, at most `most` of them: the row
   * after the last one, or `r` when none. A row counts when every byte of it is repeated and its end
   * is settled by them: it ends with a line feed, or the byte after it is repeated too.
   */
  rowsRepeated(bytes: Uint8Array, p: number, n: number, r: number, most: number): number {
    const start = this.start;
    const last = Math.min(this.rows, r + most);
    if (r >= last) return r;
    const shift = p - start[r];
    // The first row byte by byte: a look that finds nothing mostly ends there, with no call out.
    const firstEnd = start[r + 1];
    const kept = this.bytes;
    if (firstEnd + shift > n || !kept.holds(start[r], firstEnd)) return r;
    const old = kept.window;
    const o = kept.windowAt;
    for (let i = start[r]; i < firstEnd; i++) if (old[i - o] !== bytes[i + shift]) return r;
    // Then whole rows a group at a time in native code (Buffer.compare, where a loop over every byte
    // was compiled in every diff; docs/performance.md), the group doubling while its rows repeat and
    // halving where they do not, down to one row.
    let k = r + 1;
    for (let group = 2; group > 0 && k < last; ) {
      const to = Math.min(last, k + group);
      const end = start[to] + shift;
      if (
        end <= n &&
        kept.holds(start[k], start[to]) &&
        sameBytes(kept.window, start[k] - kept.windowAt, start[to] - kept.windowAt, bytes, start[k] + shift)
      ) {
        k = to;
        group *= 2;
      } else group >>>= 1;
    }
    // The last row's end, when no line feed: settled by the byte after it, repeated too.
    const end = start[k];
    if (!kept.holds(end - 1, end)) return k - 1;
    if (kept.window[end - 1 - kept.windowAt] !== LF) {
      const after = end + shift;
      if (k === this.rows || after >= n || !kept.holds(end, end + 1)) return k - 1;
      if (kept.window[end - kept.windowAt] !== bytes[after]) k--;
    }
    return k;
  }
}

/** Whether `a[from, to)` are the bytes of `b` from `at` on (which has them all), compared in native code. */
export function sameBytes(a: Uint8Array, from: number, to: number, b: Uint8Array, at: number): boolean {
  // Views made by the typed array constructor: a Buffer's own subarray is JavaScript, and slower.
  const x = new Uint8Array(a.buffer, a.byteOffset + from, to - from);
  const y = new Uint8Array(b.buffer, b.byteOffset + at, to - from);
  return Buffer.compare(x, y) === 0;
}

/** Kept tables by the tree their load built: kept by the table reader's caller, taken by a later version's load. */
export const keptTables = new KeptForLater<KeptTable>();

/**
 * Keeps a table's bytes and where its rows start while it is read, up to {@link MOST_KEPT_BYTES}: the
 * reader's side of a {@link KeptTable}.
 */
export class TableKeeper {
  private start = new Uint32Array(releasableMemory(4 * 1024));
  private rows = 0;
  private end = 0;
  private endLine = 0;
  /** False once the input is longer than kept or something else rules a later reading out. */
  keeping = true;

  /** `bytes`: the input's bytes kept, or counted (earlier-bytes.ts). */
  constructor(private readonly bytes: BytesKeeper) {}

  /** The next chunk of the input. */
  write(chunk: Uint8Array): void {
    if (this.keeping && !this.bytes.write(chunk)) this.drop();
  }

  /** Data row `row` (from 0, in order) starts at `at` and its record ends at `end`, before line `nextLine`. */
  row(row: number, at: number, end: number, nextLine: number): void {
    if (!this.keeping) return;
    if (row + 1 >= this.start.length) this.growStart(2 * this.start.length);
    this.start[row] = at;
    this.rows = row + 1;
    this.end = end;
    this.endLine = nextLine;
  }

  /** Room for `rows` rows' starts, once, where the reader can tell how many are coming. */
  makeRoom(rows: number): void {
    if (this.keeping && rows + 1 > this.start.length) this.growStart(rows + 1);
  }

  private growStart(length: number): void {
    const grown = new Uint32Array(releasableMemory(4 * length));
    grown.set(this.start.subarray(0, this.rows));
    releaseMemory(this.start.buffer);
    this.start = grown;
  }

  /** Lets go of what is kept: no later reading against this table. */
  drop(): void {
    this.keeping = false;
    this.bytes.drop();
    releaseMemory(this.start.buffer);
    this.start = new Uint32Array(1);
  }

  /** The kept table over `rows` rows, or undefined when nothing is kept. */
  table(
    rows: number,
    lines: RowLines,
    delimiter: number,
    header: readonly string[],
    headerLine: number,
    headerColumns: readonly number[],
    columns: readonly KeptColumn[],
    textRows: readonly (readonly number[])[],
    maxLineBytes: number,
  ): KeptTable | undefined {
    if (!this.keeping || rows !== this.rows) return undefined;
    if (this.start.length < rows + 1) this.makeRoom(rows);
    this.start[rows] = this.end;
    return new KeptTable(
      this.bytes.earlier(),
      this.start,
      rows,
      lines,
      this.endLine,
      delimiter,
      header,
      headerLine,
      headerColumns,
      columns,
      textRows,
      maxLineBytes,
    );
  }
}
