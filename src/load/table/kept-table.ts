import { Buffer } from "node:buffer";
import type { NamePool } from "../../model/names.js";
import type { RowLines } from "./row-lines.js";

/**
 * Longest input whose bytes a table keeps for a later version's load (LoadOptions.keepForLaterVersion):
 * they are held, with where each row starts and the columns of numbers, until that load ends. Above
 * it the later version is read as any table is (about 8 million rows of the benchmark's table).
 */
export const MOST_KEPT_BYTES = 256 * 2 ** 20;

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
 * its bytes, and its end of its bytes and the byte after them.
 */
export class KeptTable {
  constructor(
    /** The input's bytes, whole. */
    readonly bytes: Buffer,
    /** Where data row r (from 0) starts in `bytes`; at `rows`, where the last row's record ends. */
    readonly start: Uint32Array,
    /** Data rows. */
    readonly rows: number,
    /** The line each row starts on. */
    readonly lines: RowLines,
    /** The line after the last row's record. */
    readonly endLine: number,
    readonly delimiter: number,
    readonly header: readonly string[],
    readonly columns: readonly KeptColumn[],
    /** Whether a column of numbers holds a cell that is no plain number, by column. */
    readonly hasTexts: readonly boolean[],
    /** The longest record the reader took (read-limits.ts). */
    readonly maxLineBytes: number,
  ) {}

  /**
   * Gives the memory of the bytes and the rows' starts back now, not whenever the collector finds
   * them (they are old by then, and a full collection may not come before the diff's own stage, whose
   * memory would then come on top of them): moved into a new buffer nothing holds, which the next minor
   * collection frees. The table is read no more.
   */
  release(): void {
    for (const buffer of [this.bytes.buffer, this.start.buffer])
      if (buffer instanceof ArrayBuffer && buffer.byteLength > 0)
        structuredClone(buffer, { transfer: [buffer] });
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
    const from = start[r];
    const same = sameLength(this.bytes, from, start[this.rows], bytes, p, n);
    let k = r;
    const last = Math.min(this.rows, r + most);
    while (k < last && start[k + 1] - from <= same) k++;
    if (k > r && start[k] - from === same && this.bytes[start[k] - 1] !== LF) k--;
    return k;
  }
}

/** Bytes compared one by one before comparing in blocks: a row's worth. */
const FIRST = 64;
/** The first block compared at once; each after it twice as long. */
const BLOCK = 4096;

/** How many bytes from `a[i]` and `b[j]` on are the same (at most to `aEnd` and `bEnd`). */
function sameLength(a: Buffer, i: number, aEnd: number, b: Uint8Array, j: number, bEnd: number): number {
  const most = Math.min(aEnd - i, bEnd - j);
  const head = Math.min(most, FIRST);
  let m = 0;
  while (m < head && a[i + m] === b[j + m]) m++;
  if (m < head || m === most) return m;
  const other = b instanceof Buffer ? b : Buffer.from(b.buffer, b.byteOffset, b.byteLength);
  for (let size = BLOCK; m < most; size *= 2) {
    const take = Math.min(size, most - m);
    if (a.compare(other, j + m, j + m + take, i + m, i + m + take) === 0) {
      m += take;
      continue;
    }
    // The first difference is in [m, m + take): halve until a row's worth is left, then byte by byte.
    let hi = m + take;
    while (hi - m > FIRST) {
      const mid = m + ((hi - m) >>> 1);
      if (a.compare(other, j + m, j + mid, i + m, i + mid) === 0) m = mid;
      else hi = mid;
    }
    while (m < hi && a[i + m] === b[j + m]) m++;
    return m;
  }
  return m;
}

/** Kept tables by the tree their load built (see {@link keepTable}). */
const keptFor = new WeakMap<object, KeptTable>();

/** Keeps `table` for the load of a later version read against `tree` (LoadOptions.earlierVersion). */
export function keepTable(tree: object, table: KeptTable): void {
  keptFor.set(tree, table);
}

/** The table kept for `tree`, no longer kept: a later version's load takes it once. */
export function takeKeptTable(tree: object): KeptTable | undefined {
  const table = keptFor.get(tree);
  keptFor.delete(tree);
  return table;
}

/**
 * Keeps a table's bytes and where its rows start while it is read, up to {@link MOST_KEPT_BYTES}: the
 * reader's side of a {@link KeptTable}.
 */
export class TableKeeper {
  private bytes: Buffer;
  private used = 0;
  private start = new Uint32Array(1024);
  private rows = 0;
  private end = 0;
  private endLine = 0;
  /** False once the input is longer than kept or something else rules a later reading out. */
  keeping = true;

  constructor(inputBytes: number) {
    this.bytes = Buffer.allocUnsafeSlow(inputBytes);
  }

  /** The next chunk of the input, copied (a stream may hand out the same memory again). */
  write(chunk: Uint8Array): void {
    if (!this.keeping) return;
    const need = this.used + chunk.length;
    if (need > MOST_KEPT_BYTES) {
      this.drop();
      return;
    }
    if (need > this.bytes.length) {
      const grown = Buffer.allocUnsafeSlow(Math.min(MOST_KEPT_BYTES, Math.max(need, 2 * this.bytes.length)));
      this.bytes.copy(grown, 0, 0, this.used);
      this.bytes = grown;
    }
    this.bytes.set(chunk, this.used);
    this.used = need;
  }

  /** Data row `row` (from 0, in order) starts at `at` and its record ends at `end`, before line `nextLine`. */
  row(row: number, at: number, end: number, nextLine: number): void {
    if (!this.keeping) return;
    if (row + 1 >= this.start.length) {
      const grown = new Uint32Array(2 * this.start.length);
      grown.set(this.start);
      this.start = grown;
    }
    this.start[row] = at;
    this.rows = row + 1;
    this.end = end;
    this.endLine = nextLine;
  }

  /** Room for `rows` rows' starts, once, where the reader can tell how many are coming. */
  makeRoom(rows: number): void {
    if (this.keeping && rows + 1 > this.start.length) {
      const grown = new Uint32Array(rows + 1);
      grown.set(this.start.subarray(0, this.rows));
      this.start = grown;
    }
  }

  /** Lets go of what is kept: no later reading against this table. */
  drop(): void {
    this.keeping = false;
    this.bytes = Buffer.alloc(0);
    this.start = new Uint32Array(1);
  }

  /** The kept table over `rows` rows, or undefined when nothing is kept. */
  table(
    rows: number,
    lines: RowLines,
    delimiter: number,
    header: readonly string[],
    columns: readonly KeptColumn[],
    hasTexts: readonly boolean[],
    maxLineBytes: number,
  ): KeptTable | undefined {
    if (!this.keeping || rows !== this.rows) return undefined;
    if (this.start.length < rows + 1) this.makeRoom(rows);
    this.start[rows] = this.end;
    const bytes = this.bytes.subarray(0, this.used);
    return new KeptTable(
      bytes,
      this.start,
      rows,
      lines,
      this.endLine,
      delimiter,
      header,
      columns,
      hasTexts,
      maxLineBytes,
    );
  }
}
