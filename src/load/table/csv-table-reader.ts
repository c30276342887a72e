import { Buffer, isUtf8 } from "node:buffer";
import { EspalierError, quoted, say } from "../../errors.js";
import { asBuffer, codecs } from "../../model/buffer-codecs.js";
import { NamePool, type Names, namesToArray } from "../../model/names.js";
import { BytesKeeper } from "../earlier-bytes.js";
import { EarlierNames } from "../earlier-names.js";
import { hasReplacement } from "../has-replacement.js";
import type { BytesAt, LoadOptions } from "../load-options.js";
import { otherFields } from "../other-fields.js";
import { limitsOf } from "../read-limits.js";
import { CsvScanner, type CsvSink } from "./csv-scanner.js";
import { EarlierRows } from "./earlier-rows.js";
import { type KeptColumn, type KeptTable, TableKeeper } from "./kept-table.js";
import { RowLines } from "./row-lines.js";
import { withSeparatorHint } from "./separator-hint.js";
import { type NumberCells, numberCell, type Table, type TakenRows, type WrittenCell } from "./table.js";

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
  | "keepOtherFields"
  | "childrenField"
  | "maxNodes"
  | "limits"
  | "shortRows"
  | "inputBytes"
  | "earlierVersion"
>;

/**
 * A table read for a diff's versions one after the other (kept-table.ts): `keep`, keep what a later
 * version's load may read it against (OLD's load); `earlier`, what the earlier version's load kept
 * (NEW's load).
 */
export interface TableReading {
  keep?: boolean;
  /** With `keep`: the later load reads this input's bytes again (LoadOptions.inputReadAgain). */
  readAgain?: boolean;
  earlier?: KeptTable | undefined;
  /** With `earlier`: its input's bytes read again, when its load did not keep them (LoadOptions.earlierInput). */
  earlierInput?: BytesAt | undefined;
}

/** Rows passed at most before looking again for the earlier version's rows (see takeRows). */
const QUIET_ROWS = 64;

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
interface Kept extends KeptColumn {
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
  /** Of a column of numbers: the rows whose cell is no plain number (its text in `pool`), in order. */
  textRows?: number[];
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
  /** Rows (from 0) a kept cell of which is not UTF-8, found where a cell is decoded (see `notUtf8`). */
  private readonly notUtf8Rows = new Set<number>();
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
  /** Keeping the input for a later version's load (see kept-table.ts), else undefined. */
  private keeper: TableKeeper | undefined;
  /**
   * The earlier version's kept table, when this table is read against it: rows whose bytes it has are
   * taken from it (takeRows), not scanned. Its columns by this reader's (`kept`), and the earlier row
   * expected next.
   */
  private against: KeptTable | undefined;
  private againstColumns: readonly KeptColumn[] = [];
  private oldRow = 0;
  // Rows in a row where no earlier one was repeated, and rows to pass before looking again.
  private misses = 0;
  private quiet = 0;
  /**
   * Read against a kept table: rows read so far when takeRows last looked (rows scanned since are the
   * ones after), and the earlier rows by the column (ids, else names) that finds a scanned row's.
   */
  private looked = 0;
  /** Read against a kept table: the runs of rows taken from it (see TakenRows), three numbers a run. */
  private takenRuns = new Int32Array(0);
  private takenCount = 0;
  private rowFinder: { column: Kept; rows: EarlierNames } | undefined;

  constructor(
    private readonly delimiter: "," | "\t",
    private readonly fields: TableFields,
    reading: TableReading = {},
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
    const size = fields.inputBytes;
    const bytes =
      reading.keep && size !== undefined ? new BytesKeeper(size, reading.readAgain === true) : null;
    if (bytes?.keeping) this.keeper = new TableKeeper(bytes);
    this.laterOf = reading.earlier?.readable(reading.earlierInput) === true ? reading.earlier : undefined;
    if (this.laterOf !== undefined) this.scanner.skipper = this.takeHeader;
  }

  /** The earlier version's kept table this one may be read against, until the header is read. */
  private laterOf: KeptTable | undefined;

  /** Whether enough rows are read (more than maxNodes): what follows need not be read. */
  get full(): boolean {
    return this.scanner.done;
  }

  write(chunk: Uint8Array): void {
    this.keeper?.write(chunk);
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
    this.keeper?.makeRoom(likely);
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
    const taken = this.takenRows();
    // The earlier version's kept table is read no more (and nothing else reads it).
    this.against?.release();
    this.against = undefined;
    this.againstColumns = [];
    this.scanner.skipper = null;
    const header = this.header;
    if (header === undefined) throw new EspalierError("INPUT_EMPTY", "the table has no header row");
    const { at, headerLine, headerColumns, lines } = this;
    let kept = this.kept;
    // As before streaming existed: no further than one row over the limit.
    const length = Math.min(this.rows, this.maxRows + 1);
    const filledRows = this.scanner.filled;
    let spelledOut = false;
    const keptForLater = this.keptTable(length, filledRows);
    const notUtf8Rows = this.notUtf8Rows;
    return {
      length,
      textCells: true,
      notUtf8() {
        return notUtf8Of(kept, length, notUtf8Rows);
      },
      ...(keptForLater ? { keptForLater } : {}),
      ...(taken ? { taken } : {}),
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
        textRow(keep, row);
        this.pooled(keep, row, bytes, start, end);
      }
    } else if (keep.keeping === Keeping.Pool) {
      if (keep.earlier === undefined || !this.placedAsEarlier(keep, row, bytes, start, end))
        this.pooled(keep, row, bytes, start, end);
    } else {
      const text = this.text(bytes, start, end);
      // Not UTF-8, or U+FFFD written as itself: both read as U+FFFD (see writtenCells).
      if (text.includes("\uFFFD")) {
        if (keep.links) keepWrittenCell(keep, row, text, bytes, start, end);
        if (!isUtf8(bytes.subarray(start, end))) this.notUtf8Rows.add(row);
      }
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
      this.notUtf8Rows.add(row);
      pool.setString(row, text);
    } else pool.setBytes(row, bytes, start, end);
  }

  record(fields: number, line: number): boolean {
    if (this.header === undefined) {
      this.startTable(this.headerCells, fields, line);
      this.headerCells = [];
      return false;
    }
    const scanner = this.scanner;
    this.keeper?.row(this.rows, scanner.recordAt, scanner.recordEndAt, scanner.nextLine);
    this.rows++;
    this.lines.add(this.rows, line);
    this.earlier?.endRecord();
    return this.rows > this.maxRows;
  }

  /**
   * Takes the header as the earlier version's kept table read it (RecordSkipper, csv-scanner.ts), when
   * everything before its first row is this input's too and read alike (the same delimiter and longest
   * record): the same header cells on the same line. The first record is then not scanned, and the
   * records this table scans all go through the code a table read alone runs for its rows (the header,
   * read first, is read before the engine keeps type feedback, and met again in code compiled without
   * it, that code is thrown away; docs/performance.md). Returns where the first row starts, or `p`.
   */
  private readonly takeHeader = (bytes: Uint8Array, p: number, n: number): number => {
    const scanner = this.scanner;
    scanner.skipper = null;
    const kept = this.laterOf;
    if (
      kept === undefined ||
      kept.delimiter !== this.delimiter.charCodeAt(0) ||
      kept.maxLineBytes !== limitsOf(this.fields.limits).maxLineBytes ||
      !kept.startsAs(bytes, n)
    )
      return p;
    scanner.tookFirst(kept.header.length, kept.lineOf(0) - 1);
    this.headerColumns = [...kept.headerColumns];
    this.startTable([...kept.header], kept.header.length, kept.headerLine);
    return kept.start[0];
  };

  /**
   * Takes the rows from `bytes[p]` on that repeat the earlier version's rows from the one expected
   * (RecordSkipper, csv-scanner.ts): their cells as that version read them, each row's line as many
   * lines after the first as there. Returns where they end, or `p` when they are not the earlier ones.
   */
  private readonly takeRows = (bytes: Uint8Array, p: number, n: number): number => {
    if (this.rows > this.looked) this.scannedSince();
    if (this.quiet > 0) {
      this.quiet--;
      return p;
    }
    const against = this.against!;
    const from = this.oldRow;
    const room = this.maxRows - this.rows;
    if (from >= against.rows || room <= 0) return p;
    const to = against.rowsRepeated(bytes, p, n, from, room);
    if (to === from) {
      // Looks in a row that found nothing, of rows not found by id either, make the next ones rarer
      // (rows added since, or an input in another order).
      this.misses++;
      if (this.misses > 1) this.quiet = Math.min(QUIET_ROWS, 2 ** (this.misses - 1) - 1);
      return p;
    }
    this.misses = 0;
    this.copyRows(against, from, to);
    return p + against.start[to] - against.start[from];
  };

  /**
   * Rows were scanned since takeRows last looked: the earlier row expected next is the one after the row
   * of the last one's id (or name), else the one expected before (a row added since); with no column to
   * find rows by, the one after as many rows as were scanned. Here, not as each record ends, so that a
   * record is read by the same code as in a table read alone, whose compiled code then holds (the
   * engine compiles a function again where it meets a branch it never ran; docs/performance.md).
   */
  private scannedSince(): void {
    const finder = this.rowFinder;
    if (finder === undefined) this.oldRow += this.rows - this.looked;
    else {
      const runs = finder.column.pool!.byteRuns()!;
      const r = this.rows - 1;
      const found = finder.rows.find(runs.bytes, runs.start[r], runs.start[r] + runs.size[r]);
      if (found !== -1) {
        this.oldRow = found + 1;
        // Found where it was looked for: the rows after it are likely the earlier ones again.
        this.misses = 0;
      }
    }
    this.looked = this.rows;
  }

  /** The runs of rows taken from the earlier version's kept table, when this table was read against one. */
  private takenRows(): TakenRows | undefined {
    const from = this.against;
    if (from === undefined) return undefined;
    return {
      runs: this.takenRuns,
      count: this.takenCount,
      earlierRows: from.rows,
      rowsById: from.rowsById,
    };
  }

  /** Notes the run of earlier rows `from` to `to - 1` taken at this table's row `row`. */
  private noteRun(row: number, from: number, to: number): void {
    const at = 3 * this.takenCount;
    if (at + 3 > this.takenRuns.length) {
      const grown = new Int32Array(Math.max(3 * 256, 2 * this.takenRuns.length));
      grown.set(this.takenRuns);
      this.takenRuns = grown;
    }
    this.takenRuns[at] = row;
    this.takenRuns[at + 1] = from;
    this.takenRuns[at + 2] = to - from;
    this.takenCount++;
  }

  /** Appends the earlier version's rows `from` to `to - 1` as they were read there. */
  private copyRows(against: KeptTable, from: number, to: number): void {
    const count = to - from;
    const row = this.rows;
    this.noteRun(row, from, to);
    const columns = this.againstColumns;
    for (let c = 0; c < this.kept.length; c++) {
      const keep = this.kept[c];
      const old = columns[c];
      if (keep.keeping === Keeping.Pool) keep.pool!.placeSharedRun(row, old.pool!, from, count);
      else if (keep.keeping === Keeping.Numbers) {
        if (row + count > keep.values.length)
          keep.values = grown(keep.values, Math.max(2 * row, row + count));
        keep.values.set(old.values.subarray(from, to), row);
        // Only the rows written down as text: a loop over every row copied was most of a run's work.
        const texts = against.textRows[c];
        if (texts.length > 0) copyTexts(keep, row - from, old.pool!, texts, from, to);
      } else for (let k = from; k < to; k++) keep.cells.push(old.cells[k]);
    }
    const scanner = this.scanner;
    this.lines.addRun(against.lines, from + 1, to + 1, row + 1, scanner.nextLine);
    scanner.skipped(count, against.lineOf(to) - against.lineOf(from));
    this.rows += count;
    this.looked = this.rows;
    this.rowFinder?.rows.expect(to);
    this.oldRow = to;
  }

  /**
   * What this table keeps for a later version's load (kept-table.ts), when asked to and when its rows
   * read the same by their bytes alone: no cell kept as read and as written (not UTF-8), no short row
   * filled, no name kept as a string.
   */
  private keptTable(length: number, filledRows: number): KeptTable | undefined {
    const keeper = this.keeper;
    if (keeper === undefined || this.header === undefined) return undefined;
    this.keeper = undefined;
    const plain = this.kept.every(
      (k) => k.written === undefined && (k.pool === null || readableBytes(k.pool) !== null),
    );
    if (!plain || filledRows > 0 || this.fields.shortRows === "fill") return undefined;
    const textRows = this.kept.map((k) => k.textRows ?? []);
    return keeper.table(
      length,
      this.lines,
      this.delimiter.charCodeAt(0),
      this.header,
      this.headerLine,
      this.headerColumns,
      this.kept,
      textRows,
      limitsOf(this.fields.limits).maxLineBytes,
    );
  }

  /**
   * The earlier version's kept table, when this table reads as it did: the same delimiter, header,
   * columns kept the same way, longest record and no short rows filled. Null otherwise.
   */
  private readsAs(
    kept: KeptTable | undefined,
    columns: readonly Kept[],
    header: string[],
  ): KeptColumn[] | null {
    if (kept === undefined || this.fields.shortRows === "fill") return null;
    if (kept.delimiter !== this.delimiter.charCodeAt(0)) return null;
    if (kept.maxLineBytes !== limitsOf(this.fields.limits).maxLineBytes) return null;
    if (kept.header.length !== header.length || kept.header.some((h, k) => h !== header[k])) return null;
    if (kept.columns.length !== columns.length) return null;
    const same = columns.every((c, k) => {
      const o = kept.columns[k];
      return (
        o.name === c.name &&
        o.keeping === c.keeping &&
        o.asText === c.asText &&
        o.links === c.links &&
        (o.keeping !== Keeping.Pool || readableBytes(o.pool) !== null)
      );
    });
    return same ? [...kept.columns] : null;
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
    // Every other column kept as well, when asked (LoadOptions.keepOtherFields), as text.
    if (this.fields.keepOtherFields === true)
      for (const name of otherFields(header, this.fields) ?? []) this.wanted.add(name);
    for (const [name, index] of this.at) {
      if (!this.wanted.has(name)) continue;
      const { fields } = this;
      const keeping: Keeping =
        name === fields.sizeField || name === fields.parentField
          ? Keeping.Numbers
          : (this.poolNames && name === fields.nameField) || (this.poolIds && name === fields.idField)
            ? Keeping.Pool
            : Keeping.Text;
      const keep: Kept = {
        name,
        keeping,
        cells: [],
        pool: null,
        values: new Float64Array(keeping === Keeping.Numbers ? 1024 : 0),
        asText: keeping === Keeping.Numbers || name === fields.idField,
        links: [fields.idField, fields.parentField, fields.pathField, fields.childField].includes(name),
      };
      this.kept.push(keep);
      this.route[index] = keep;
    }
    // Read against the earlier version's kept table when this one reads as it did (its rows are then
    // taken from it where their bytes are its), else against the earlier version's tree, if any.
    const kept = this.laterOf;
    this.laterOf = undefined;
    const againstColumns = this.readsAs(kept, this.kept, header);
    if (againstColumns !== null) {
      this.against = kept;
      this.againstColumns = againstColumns;
      this.scanner.skipper = this.takeRows;
    }
    const poolOf = (name: string) =>
      againstColumns?.find((c) => c.name === name && c.keeping === Keeping.Pool)?.pool ?? undefined;
    const earlier = this.fields.earlierVersion;
    // The earlier version's pools of ids and names, whose bytes this table's may read (see EarlierRows).
    const earlierIds = this.poolIds
      ? readableBytes(againstColumns ? poolOf(this.fields.idField) : earlier?.ids)
      : null;
    const earlierNames = this.poolNames
      ? readableBytes(againstColumns ? poolOf(this.fields.nameField) : earlier?.name)
      : null;
    let findBy: Kept | undefined;
    for (const keep of this.kept) {
      if (keep.keeping === Keeping.Text) continue;
      const id = keep.name === this.fields.idField;
      const from = keep.keeping !== Keeping.Pool ? null : id ? earlierIds : earlierNames;
      const shared = from === null ? null : from.readingBytes();
      keep.pool = shared ?? new NamePool();
      if (shared === null) continue;
      // Read against a kept table, a row's cells are read as in a table read alone (rows whose bytes
      // the earlier version had are taken whole); the ids (else names) find a scanned row's earlier row.
      if (againstColumns === null) keep.earlier = id ? "id" : "name";
      else if (id || findBy === undefined) findBy = keep;
    }
    if (findBy !== undefined && kept !== undefined) {
      const runs = (findBy.name === this.fields.idField ? earlierIds : earlierNames)!.byteRuns()!;
      this.rowFinder = { column: findBy, rows: new EarlierNames(runs, kept.rows) };
    }
    const ids = this.kept.some((k) => k.earlier === "id") ? earlierIds!.byteRuns() : null;
    const names = this.kept.some((k) => k.earlier === "name") ? earlierNames!.byteRuns() : null;
    const rows = earlier?.name.length;
    if (rows !== undefined && (ids !== null || names !== null))
      this.earlier = new EarlierRows(ids, names, rows);
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
 * The rows of the first `length` a kept cell of which is not UTF-8: those found as their cells were
 * decoded (`rows`), and those of a pool kept as bytes (names), found by one validation of its bytes,
 * the rows looked at only when it fails. How many, and the first (from 1); undefined when none.
 */
function notUtf8Of(
  kept: readonly Kept[],
  length: number,
  rows: ReadonlySet<number>,
): { count: number; first: number } | undefined {
  const all = new Set<number>();
  for (const r of rows) if (r < length) all.add(r);
  for (const keep of kept) {
    const pool = keep.pool;
    if (keep.asText || pool === null) continue;
    const runs = pool.byteRuns();
    if (runs === null || isUtf8(runs.bytes.subarray(0, pool.usedBytes))) continue;
    const { bytes, start, size } = runs;
    for (let r = 0, n = Math.min(length, pool.length); r < n; r++)
      if (!isUtf8(bytes.subarray(start[r], start[r] + size[r]))) all.add(r);
  }
  if (all.size === 0) return undefined;
  let first = length;
  for (const r of all) first = Math.min(first, r);
  return { count: all.size, first: first + 1 };
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

/**
 * Copies the cells of `texts` (rows of an earlier column of numbers whose cell is text, in order) from
 * `from` to `to - 1` into `keep`'s pool, each at its row plus `shift`.
 */
function copyTexts(
  keep: Kept,
  shift: number,
  pool: NamePool,
  texts: readonly number[],
  from: number,
  to: number,
): void {
  let lo = 0;
  let hi = texts.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (texts[mid] < from) lo = mid + 1;
    else hi = mid;
  }
  for (let k = lo; k < texts.length && texts[k] < to; k++) {
    keep.pool!.copyFrom(texts[k] + shift, pool, texts[k]);
    textRow(keep, texts[k] + shift);
  }
}

/** Row `row` of a kept column of numbers is text. */
function textRow(keep: Kept, row: number): void {
  keep.textRows ??= [];
  keep.textRows.push(row);
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
