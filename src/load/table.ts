import { Buffer } from "node:buffer";
import { EspalierError } from "../errors.js";
import type { NamePool } from "../model/names.js";
import { CsvTableReader, type TableFields } from "./csv-table-reader.js";

/** One cell: text from CSV/TSV, any JSON scalar from rows. */
export type Cell = string | number | boolean | null | undefined;

/** Records with named columns, read column by column. Data rows are numbered from 1. */
export interface Table {
  /** Number of data rows. */
  readonly length: number;
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
  /** The column's cells as a name pool, one name per row, when the table kept it so; else undefined. */
  pooledColumn?(name: string): NamePool | undefined;
}

/**
 * A table from CSV (RFC 4180, delimiter ",") or TSV (delimiter "\t") text: the UTF-8 bytes of the text
 * through the byte scanner the streamed loader uses ({@link CsvTableReader}), so both give the same
 * table and the same errors. The first record is the header. TSV has no quoting (IANA
 * text/tab-separated-values: a field cannot hold a tab or line break), so a double quote in TSV is an
 * ordinary character. Blank lines are skipped and are not rows. Reading stops once the table is known
 * to have more than `fields.maxNodes` rows.
 */
export function csvTable(text: string, delimiter: "," | "\t", fields: TableFields): Table {
  const reader = new CsvTableReader(delimiter, fields);
  reader.write(Buffer.from(text, "utf8"));
  return reader.end();
}

/** A table from a parsed JSON array of flat objects (rows); each element must be an object. */
export function rowsTable(rows: readonly unknown[]): Table {
  for (let r = 0; r < rows.length; r++) {
    const row = rows[r];
    if (typeof row !== "object" || row === null || Array.isArray(row)) {
      throw new EspalierError("SHAPE", `row ${r + 1} must be an object`, { row: r + 1 });
    }
  }
  const records = rows as readonly Record<string, unknown>[];
  return {
    length: records.length,
    textCells: false,
    column(name) {
      const cells: Cell[] = new Array(records.length);
      let found = false;
      for (let r = 0; r < records.length; r++) {
        const record = records[r];
        if (!Object.hasOwn(record, name)) {
          cells[r] = undefined;
          continue;
        }
        found = true;
        const value = record[name];
        if (typeof value === "object" && value !== null) {
          throw new EspalierError("SHAPE", `the "${name}" of row ${r + 1} must be a plain value`, {
            row: r + 1,
          });
        }
        cells[r] = value as Cell;
      }
      return found ? cells : undefined;
    },
    columnNames() {
      const names = new Set<string>();
      for (const record of records) for (const key of Object.keys(record)) names.add(key);
      return [...names];
    },
  };
}
