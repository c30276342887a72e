import type { SourcePos } from "../../errors.js";
import type { NamePool } from "../../model/names.js";
import type { ByteIdIndex } from "./byte-id-index.js";
import type { KeptTable } from "./kept-table.js";

/** One cell: text from CSV/TSV, any JSON scalar from rows. */
export type Cell = string | number | boolean | null | undefined;

/** Records with named columns, read column by column. Data rows are numbered from 1. */
export interface Table {
  /** Number of data rows. */
  readonly length: number;
  /** Rows that were short and read with their missing last fields empty (`--short-rows fill`), when any. */
  readonly filledRows?: number;
  /** Whether cells are text that still needs parsing (CSV/TSV), so "12" is a size. */
  readonly textCells: boolean;
  /** The column's cells, one per row, or undefined when no row has that column. */
  column(name: string): readonly Cell[] | undefined;
  /**
   * A kept column's cells as text, one per row ("" where a row has none), or undefined when no row has
   * it: JSON or YAML rows give a nested value as its JSON text (a kept field is compared and shown as
   * text, as the nested loaders keep one) where `column` refuses it. Tables without it keep `column`'s
   * cells as text.
   */
  keptText?(name: string): string[] | undefined;
  /** The columns that exist, for messages. */
  columnNames(): string[];
  /** JSON or YAML rows: the first row as parsed, for the hints of a message (see rows-inside.ts). */
  readonly firstRecord?: Readonly<Record<string, unknown>>;
  /**
   * Lets go of the cells (columns read before stay valid; the table answers no more). The engine may
   * keep a parser's closure alive in compiled code long after the load, and with it every cell.
   */
  release?(): void;
  /**
   * Where data row `row` (1-based) is in the input: its line and column as far as the table knows them
   * (the cell of column `field` when it can say), or undefined. It outlives `release`.
   */
  place?(row: number, field?: string): SourcePos | undefined;
  /** The column's cells as a name pool, one name per row, when the table kept it so; else undefined. */
  pooledColumn?(name: string): NamePool | undefined;
  /** The column's cells as numbers and bytes ({@link NumberCells}), when the table kept it so; else undefined. */
  numberColumn?(name: string): NumberCells | undefined;
  /**
   * The cells of an id, parent or path column whose bytes are not UTF-8, by row (from 0): as read (every
   * bad sequence one U+FFFD) and as written (the bytes as Latin-1, one character each); undefined when
   * none (see load/written-paths.ts). When there are any, the cells that write U+FFFD as itself are
   * among them too: they read as the others do.
   */
  writtenCells?(name: string): ReadonlyMap<number, WrittenCell> | undefined;
  /**
   * How many rows hold a read cell whose bytes are not UTF-8 (each bad sequence read as U+FFFD), and the
   * first of them (from 1); undefined when none, or when the table was read from text.
   */
  notUtf8?(): { count: number; first: number } | undefined;
  /** What the table's load kept for a later version's (LoadOptions.keepForLaterVersion), when it did. */
  readonly keptForLater?: KeptTable;
  /** Read against an earlier version's kept table: the rows it took from there (see {@link TakenRows}). */
  readonly taken?: TakenRows;
}

/**
 * The rows a table read against an earlier version's kept table (kept-table.ts) took whole from there:
 * runs of rows whose bytes are the earlier rows', each as three numbers (this table's first row, the
 * earlier table's first row, how many), in this table's order; and what the earlier version's link
 * kept to find its rows by id.
 */
export interface TakenRows {
  readonly runs: Int32Array;
  readonly count: number;
  /** The earlier table's data rows. */
  readonly earlierRows: number;
  /**
   * The earlier version's rows by id, when its link kept them (KeptTable.rowsById); let go of once
   * read (read-as-earlier.ts), as the table may be held long after.
   */
  rowsById: ByteIdIndex | undefined;
}

/** A cell whose bytes are not UTF-8: its text as read, and its bytes as Latin-1 (one character a byte). */
export interface WrittenCell {
  readonly read: string;
  readonly written: string;
}

/**
 * A column of text cells (sizes, parent ids) with no string per row: a cell written as plain digits
 * (1 to 15 of them, no leading zero, or "0") as its number, which reads back as the same text; any
 * other cell as its bytes. `column` gives the same cells as numbers and strings.
 */
export interface NumberCells {
  /** Row r's number (r from 0), or NaN where the cell is no plain number and its text is in `texts`. */
  readonly values: Float64Array;
  /** The cells that are no plain number, as UTF-8 text, at their rows (rows holding a number are empty). */
  readonly texts: NamePool;
}

/** Cell `r` of a column kept as {@link NumberCells}: its number, or its text. */
export function numberCell(cells: NumberCells, r: number): number | string {
  const value = cells.values[r];
  if (!Number.isNaN(value)) return value;
  return r < cells.texts.length ? cells.texts.get(r) : "";
}

/** A cell as text; an empty cell is "". */
export function cellText(cell: Cell): string {
  if (cell === undefined || cell === null) return "";
  return typeof cell === "string" ? cell : String(cell);
}
