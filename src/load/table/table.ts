import type { SourcePos } from "../../errors.js";
import type { NamePool } from "../../model/names.js";

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
  /** The columns that exist, for messages. */
  columnNames(): string[];
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
}
