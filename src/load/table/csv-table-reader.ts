import { Buffer, isUtf8 } from "node:buffer";
import { EspalierError, quoted, say } from "../../errors.js";
import { asBuffer, codecs } from "../../model/buffer-codecs.js";
import { NamePool, type Names, namesToArray } from "../../model/names.js";
import { hasReplacement } from "../has-replacement.js";
import type { LoadOptions } from "../load-options.js";
import { limitsOf } from "../read-limits.js";
import { CsvScanner, type CsvSink } from "./csv-scanner.js";
import { EarlierRows } from "./earlier-rows.js";
import { withSeparatorHint } from "./separator-hint.js";
import { type NumberCells, numberCell, type Table, type WrittenCell } from "./table.js";

/** The columns a table loader reads. */
export type TableFields = Pick<
  LoadOptions,
  | "nameField"
  | "sizeField"
  | "idField"
  | "parentField"
  | "pathField"
  | "childField"
  | "keepFields"
  | "maxNodes"
  | "limits"
  | "shortRows"
  | "inputBytes"
  | "earlierVersion"
>;

/** How the cells of one kept column are kept. */
const Keeping = {
  /** As strings, in `cells`. */
  Text: 0,
  /** As bytes, in `pool`: the name and id columns, when no other role reads them. */
  Pool: 1,
  /** Sizes and parent ids: plain digits as numbers in `values`, other cells as bytes in `pool`. */
  Numbers: 2,
} as const;
type Keeping = (typeof Keeping)[keyof typeof Keeping];

/** What is kept of one column the loader reads. */
interface Kept {
  name: string;
  keeping: Keeping;
  cells: string[];
  pool: NamePool | null;
  values: Float64Array;
  /**
   * Whether bytes that are no valid UTF-8 go into the pool as their decoded text (U+FFFD for each bad
   * sequence), so that equal bytes are exactly equal text: ids and parent cells, which are compared by
   * their bytes (ByteIdIndex) where they were once compared as strings.
   */
  asText: boolean;
  /** A pooled id or name column read against an earlier version's (see EarlierRows), else undefined. */
  earlier?: "id" | "name";
  /** Whether the column may link rows (the id, parent or path column): its cells not UTF-8 are kept as written. */
  links: boolean;
  /**
   * Of a column that `links`: its cells whose bytes are not UTF-8, by row, and those that write U+FFFD
   * as itself (see Table.writtenCells).
   */
  written?: Map<number, WrittenCell>;
}

/**
 * A CSV or TSV table read from bytes with {@link CsvScanner}, fed in chunks (`write`, then `end`). The
 * first record is the header (names trimmed). Only the columns a loader reads are kept, cell by cell,
 * with no string per row where it can be helped: the name column and the id column, when no other role
 * reads them, as bytes in a name pool each; sizes and parent ids as numbers in a typed array where
 * written as plain digits (a number reads back as the same text; see IdIndex) and as bytes in a pool
 * otherwise ({@link NumberCells}); other cells as strings. A load's passing memory is then the
 * allocator's, not millions of short-lived strings for the engine's collector to copy and promote (the
 * id and parent cells of a 1M-row table were about 100 MiB of them; docs/performance.md). Once more
 * rows than `maxNodes` are known, reading stops.
 */
export class CsvTableReader implements CsvSink {
  private readonly scanner: CsvScanner;
  private readonly wanted: Set<string>;
  private readonly poolNames: boolean;
  private readonly poolIds: boolean;
  private header: string[] | undefined;
  private headerLine = 0;
  private readonly at = new Map<string, number>();
  private kept: Kept[] = [];
  /** For each field of a record, the kept column it goes to, or undefined. */
  private route: (Kept | undefined)[] = [];
  private rows = 0;
  private readonly maxRows: number;
  /** Lines of rows whose line is not the one after the row before (a quoted line break, a blank line). */
  private readonly lines = new RowLines();
  /** Columns (1-based, UTF-16 units) of the header's cells. */
  private headerColumns: number[] = [];
  // A Buffer over the bytes the scanner hands over, for Node's own UTF-8 decoding of one cell.
  private viewOf: Uint8Array | undefined;
  private view: Buffer = Buffer.alloc(0);
  /** With an earlier version of the table given: its rows the records stand for (see EarlierRows). */
  private earlier: EarlierRows | undefined;

  constructor(
    delimiter: "," | "\t",
    private readonly fields: TableFields,
  ) {
    this.scanner = new CsvScanner(delimiter.charCodeAt(0), this, limitsOf(fields.limits).maxLineBytes, {
      header: true,
      shortRows: fields.shortRows ?? "error",
    });
    this.wanted = new Set([
      fields.idField,
      fields.parentField,
      fields.pathField,
      fields.nameField,
      fields.sizeField,
      ...fields.keepFields,
    ]);
    const others = new Set([fields.parentField, fields.pathField, fields.sizeField, ...fields.keepFields]);
    this.poolNames = !others.has(fields.nameField) && fields.nameField !== fields.idField;
    this.poolIds = !others.has(fields.idField) && fields.nameField !== fields.idField;
    this.maxRows = fields.maxNodes;
  }

  /** Whether enough rows are read (more than maxNodes): what follows need not be read. */
  get full(): boolean {
    return this.scanner.done;
  }

  write(chunk: Uint8Array): void {
    try {
      this.scanner.write(chunk);
    } catch (error) {
      throw withSeparatorHint(error, this.header);
    }
    this.bytesRead += chunk.length;
    if (!this.sized && this.rows > 0) this.sizeColumns();
  }

  private bytesRead = 0;
  private sized = false;

  /**
   * After the first chunk, when the input's length is known: room in every kept column for the rows
   * the input likely has (its bytes over the bytes per row so far, plus 5%), and in a pool of names
   * for their bytes, so that a column is made once at its size rather than doubled a dozen times, each
   * time fresh memory and a copy (docs/performance.md: fresh memory cost about 4 ms per MiB on the
   * bench machine). Never more rows than the bytes left can hold (a row takes at least a byte a field:
   * its delimiters and its line break) or than the reader will keep. Room no row fills is never
   * touched and costs nothing; more rows than estimated grow the columns as before.
   */
  private sizeColumns(): void {
    this.sized = true;
    const total = this.fields.inputBytes;
    if (total === undefined || total <= this.bytesRead) return;
    const rows = this.rows;
    // A short row read with its last fields empty (--short-rows fill) may be one byte and a line break.
    const least = this.fields.shortRows === "fill" ? 2 : Math.max(2, this.route.length);
    // One more for the record cut at the end of the bytes read so far.
    const most = Math.min(this.maxRows + 1, rows + 1 + Math.ceil((total - this.bytesRead) / least));
    const likely = Math.min(most, Math.ceil(((total / this.bytesRead) * rows * 21) / 20));
    for (const keep of this.kept) {
      if (keep.keeping === Keeping.Numbers && keep.values.length < likely)
        keep.values = grown(keep.values, likely);
      else if (keep.keeping === Keeping.Pool) {
        const pool = keep.pool!;
        // A quarter more bytes than the rows so far would take: ids and names often grow longer
        // further down (row 35,000's id has five digits, row 1,000,000's seven).
        pool.makeRoom(likely, Math.ceil((pool.usedBytes / rows) * (likely - rows) * 1.25));
      }
    }
  }

  /** The table, after the last chunk. */
  end(): Table {
    try {
      this.scanner.end();
    } catch (error) {
      throw withSeparatorHint(error, this.header);
    }
    const header = this.header;
    if (header === undefined) throw new EspalierError("INPUT_EMPTY", "the table has no header row");
    const { at, headerLine, headerColumns, lines } = this;
    let kept = this.kept;
    // As before streaming existed: no further than one row over the limit.
    const length = Math.min(this.rows, this.maxRows + 1);
    const filledRows = this.scanner.filled;
    let spelledOut = false;
    return {
      length,
      textCells: true,
      ...(filledRows > 0 ? { filledRows } : {}),
      column(name) {
        const c = at.get(name);
        if (c === undefined) return undefined;
        if (header.indexOf(name, c + 1) !== -1) {
          throw new EspalierError(
            "PARSE_CSV",
            say`the header names the column ${quoted.name(name)} more than once`,
            { line: headerLine, column: headerColumns[header.indexOf(name, c + 1)] },
          );
        }
        const column = kept.find((k) => k.name === name);
        if (!column) throw new Error(`column "${name}" was not kept while reading`);
        if (column.keeping === Keeping.Pool) return namesToArray(column.pool!).slice(0, length);
        if (column.keeping === Keeping.Numbers) {
          const numbers = numbersOf(column);
          const cells: (number | string)[] = new Array(length);
          for (let r = 0; r < length; r++) cells[r] = numberCell(numbers, r);
          return cells;
        }
        return column.cells.length > length ? column.cells.slice(0, length) : column.cells;
      },
      columnNames: () => header,
      pooledColumn(name) {
        const c = at.get(name);
        if (c === undefined || header.indexOf(name, c + 1) !== -1) return undefined;
        const column = kept.find((k) => k.name === name);
        return column?.keeping === Keeping.Pool ? column.pool! : undefined;
      },
      numberColumn(name) {
        const c = at.get(name);
        if (c === undefined || header.indexOf(name, c + 1) !== -1) return undefined;
        const column = kept.find((k) => k.name === name);
        return column?.keeping === Keeping.Numbers ? numbersOf(column) : undefined;
      },
      writtenCells(name) {
        // Cells that write U+FFFD as itself are looked for only when some linking cell is no UTF-8:
        // else equal text is equal bytes, and the valid input pays nothing for the search.
        if (!spelledOut) {
          spelledOut = true;
          if (kept.some((k) => k.links && k.written !== undefined))
            for (const k of kept) if (k.links && k.pool !== null) keepSpelledReplacements(k, length);
        }
        return kept.find((k) => k.name === name)?.written;
      },
      release() {
        kept = [];
        at.clear();
      },
      // The line a row starts on; a cell's column needs the bytes again (see locate-cell.ts), but for
      // the row's first field, which starts the line: column 1.
      place: (row, field) => {
        if (row < 1 || row > length) return undefined;
        const line = lines.lineOf(row);
        return field === undefined || header.indexOf(field) === 0 ? { line, column: 1 } : { line };
      },
    };
  }

  field(column: number, bytes: Uint8Array, start: number, end: number): void {
    if (this.header === undefined) {
      this.headerCells[column] = this.text(bytes, start, end);
      this.headerColumns[column] = this.scanner.fieldPosition(column).column;
      return;
    }
    const keep = this.route[column];
    if (keep === undefined) return;
    const row = this.rows;
    if (keep.keeping === Keeping.Numbers) {
      if (row === keep.values.length) keep.values = grown(keep.values, 2 * row);
      const value = plainNumber(bytes, start, end);
      if (value !== undefined) keep.values[row] = value;
      else {
        keep.values[row] = Number.NaN;
        this.pooled(keep, row, bytes, start, end);
      }
    } else if (keep.keeping === Keeping.Pool) {
      if (keep.earlier === undefined || !this.placedAsEarlier(keep, row, bytes, start, end))
        this.pooled(keep, row, bytes, start, end);
    } else {
      const text = this.text(bytes, start, end);
      // Not UTF-8, or U+FFFD written as itself: both read as U+FFFD (see writtenCells).
      if (keep.links && text.includes("\uFFFD")) keepWrittenCell(keep, row, text, bytes, start, end);
      keep.cells.push(text);
    }
  }

  /**
   * Places a cell's bytes where the earlier version keeps the same bytes, when its row there has them
   * (see EarlierRows); false when not. An id read as text keeps its bytes too: the earlier version
   * keeps an id's bytes as UTF-8 text, so bytes equal to them are valid UTF-8 and read as they are.
   */
  private placedAsEarlier(keep: Kept, row: number, bytes: Uint8Array, start: number, end: number): boolean {
    const earlier = this.earlier!;
    const id = keep.earlier === "id";
    const runs = id ? earlier.ids! : earlier.names!;
    const at = id ? earlier.idRow(bytes, start, end) : earlier.nameRow(bytes, start, end);
    if (at === -1) return false;
    keep.pool!.placeShared(row, runs.start[at], runs.size[at]);
    return true;
  }

  /** Puts a cell's bytes in the column's pool at `row` (as its decoded text when asked and not UTF-8). */
  private pooled(keep: Kept, row: number, bytes: Uint8Array, start: number, end: number): void {
    const pool = keep.pool!;
    if (keep.asText && !isAscii(bytes, start, end) && !isUtf8(bytes.subarray(start, end))) {
      const text = this.text(bytes, start, end);
      if (keep.links) keepWrittenCell(keep, row, text, bytes, start, end);
      pool.setString(row, text);
    } else pool.setBytes(row, bytes, start, end);
  }

  record(fields: number, line: number): boolean {
    if (this.header === undefined) {
      this.startTable(this.headerCells, fields, line);
      this.headerCells = [];
      return false;
    }
    this.rows++;
    this.lines.add(this.rows, line);
    this.earlier?.endRecord();
    return this.rows > this.maxRows;
  }

  private headerCells: string[] = [];

  private startTable(cells: string[], fields: number, line: number): void {
    const header = cells.slice(0, fields).map((name) => name.trim());
    this.header = header;
    this.headerLine = line;
    header.forEach((name, c) => {
      if (!this.at.has(name)) this.at.set(name, c);
    });
    this.route = new Array(fields).fill(undefined);
    const earlier = this.fields.earlierVersion;
    // The earlier version's pools of ids and names, whose bytes this table's may read (see EarlierRows).
    const earlierIds = this.poolIds ? readableBytes(earlier?.ids) : null;
    const earlierNames = this.poolNames ? readableBytes(earlier?.name) : null;
    for (const [name, index] of this.at) {
      if (!this.wanted.has(name)) continue;
      const { fields } = this;
      const keeping: Keeping =
        name === fields.sizeField || name === fields.parentField
          ? Keeping.Numbers
          : (this.poolNames && name === fields.nameField) || (this.poolIds && name === fields.idField)
            ? Keeping.Pool
            : Keeping.Text;
      const from = keeping !== Keeping.Pool ? null : name === fields.idField ? earlierIds : earlierNames;
      const shared = from === null ? null : from.readingBytes();
      const keep: Kept = {
        name,
        keeping,
        cells: [],
        pool: keeping === Keeping.Text ? null : (shared ?? new NamePool()),
        values: new Float64Array(keeping === Keeping.Numbers ? 1024 : 0),
        asText: keeping === Keeping.Numbers || name === fields.idField,
        links: [fields.idField, fields.parentField, fields.pathField, fields.childField].includes(name),
      };
      if (shared !== null) keep.earlier = name === fields.idField ? "id" : "name";
      this.kept.push(keep);
      this.route[index] = keep;
    }
    const ids = this.kept.some((k) => k.earlier === "id") ? earlierIds!.byteRuns() : null;
    const names = this.kept.some((k) => k.earlier === "name") ? earlierNames!.byteRuns() : null;
    if (earlier !== undefined && (ids !== null || names !== null))
      this.earlier = new EarlierRows(ids, names, earlier.name.length);
  }

  private text(bytes: Uint8Array, start: number, end: number): string {
    if (bytes !== this.viewOf) {
      this.viewOf = bytes;
      this.view = asBuffer(bytes);
    }
    return codecs.utf8Slice(this.view, start, end);
  }
}

/**
 * The line each data row starts on, kept sparsely: a row on the line after the row before costs
 * nothing; only a row after a quoted line break or a blank line is written down.
 */
class RowLines {
  private readonly rows: number[] = [];
  private readonly shifts: number[] = [];
  private shift = 0;
  private first = -1;

  add(row: number, line: number): void {
    if (this.first === -1) this.first = line - row;
    const shift = line - row - this.first;
    if (shift !== this.shift) {
      this.rows.push(row);
      this.shifts.push(shift);
      this.shift = shift;
    }
  }

  lineOf(row: number): number {
    // The last written row at or before `row`.
    let lo = 0;
    let hi = this.rows.length;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (this.rows[mid] <= row) lo = mid + 1;
      else hi = mid;
    }
    return row + this.first + (lo === 0 ? 0 : this.shifts[lo - 1]);
  }
}

/** Keeps a linking cell as read and as written (see Table.writtenCells). */
function keepWrittenCell(
  keep: Kept,
  row: number,
  read: string,
  bytes: Uint8Array,
  start: number,
  end: number,
): void {
  keep.written ??= new Map();
  keep.written.set(row, { read, written: asBuffer(bytes).toString("latin1", start, end) });
}

/**
 * Adds to a pooled linking column's written cells those of its first `rows` rows that are UTF-8 and
 * write U+FFFD as itself (EF BF BD): such a cell reads as one written in bytes that are not UTF-8 (a
 * literal U+FFFD id and a parent cell `\xff` were one id, linking a row to another's row, exit 0). One
 * byte search over the pool; the rows are read only when it finds one.
 */
function keepSpelledReplacements(keep: Kept, rows: number): void {
  const pool = keep.pool!;
  const runs = pool.byteRuns();
  if (runs === null || !hasReplacement(runs.bytes, 0, pool.usedBytes)) return;
  const numbers = keep.keeping === Keeping.Numbers ? keep.values : null;
  const { bytes, start, size } = runs;
  for (let r = 0, n = Math.min(rows, pool.length); r < n; r++) {
    if ((numbers !== null && !Number.isNaN(numbers[r])) || keep.written?.has(r)) continue;
    const s = start[r];
    const e = s + size[r];
    if (hasReplacement(bytes, s, e)) keepWrittenCell(keep, r, pool.get(r), bytes, s, e);
  }
}

/** An earlier version's ids or names when they are a pool whose bytes spell them all; else null. */
function readableBytes(names: Names | null | undefined): NamePool | null {
  return names instanceof NamePool && names.byteRuns() !== null ? names : null;
}

/** A kept column of numbers as the table gives it. */
function numbersOf(column: Kept): NumberCells {
  return { values: column.values, texts: column.pool! };
}

/** `values` in an array of `length` (at least 1024). */
function grown(values: Float64Array, length: number): Float64Array {
  const out = new Float64Array(Math.max(1024, length));
  out.set(values);
  return out;
}

function isAscii(bytes: Uint8Array, start: number, end: number): boolean {
  for (let k = start; k < end; k++) if (bytes[k] >= 0x80) return false;
  return true;
}

/** The number a cell of 1 to 15 digits without a leading zero (or "0") stands for; else undefined. */
function plainNumber(bytes: Uint8Array, start: number, end: number): number | undefined {
  const n = end - start;
  if (n === 0 || n > 15 || (n > 1 && bytes[start] === 0x30)) return undefined;
  let value = 0;
  for (let k = start; k < end; k++) {
    const d = bytes[k] - 0x30;
    if (d < 0 || d > 9) return undefined;
    value = value * 10 + d;
  }
  return value;
}
