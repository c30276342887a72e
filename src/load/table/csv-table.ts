import { EspalierError } from "../../errors.js";
import { NamePool, namesToArray } from "../../model/names.js";
import type { LoadOptions } from "../load-options.js";
import { limitsOf } from "../read-limits.js";
import { type CsvRecordSink, readCsvBytes, readCsvStream } from "./csv-records.js";
import type { Table } from "./table.js";

type Fields = Pick<
  LoadOptions,
  "nameField" | "sizeField" | "idField" | "parentField" | "pathField" | "keepFields" | "maxNodes" | "limits"
>;

/** A CSV (RFC 4180, delimiter ",") or TSV (delimiter "\t", no quoting) table from bytes held whole. */
export function csvTableFromBytes(bytes: Uint8Array, delimiter: "," | "\t", fields: Fields): Table {
  const builder = new CsvTableBuilder(fields);
  readCsvBytes(bytes, delimiter, builder, limitsOf(fields.limits).maxLineBytes);
  return builder.table();
}

/** The same table read from a byte stream, in chunks. */
export async function csvTableFromStream(
  chunks: AsyncIterable<Uint8Array>,
  delimiter: "," | "\t",
  fields: Fields,
): Promise<Table> {
  const builder = new CsvTableBuilder(fields);
  await readCsvStream(chunks, delimiter, builder, limitsOf(fields.limits).maxLineBytes);
  return builder.table();
}

interface KeptColumn {
  name: string;
  index: number;
  cells: (string | number)[];
  numbers: boolean;
  pool: NamePool | null;
}

/**
 * A table built from CSV/TSV records as they are parsed: the first record is the header. Only the
 * columns a loader reads (id, parent, path, name, size and kept fields) are kept, cell by cell, so the
 * records themselves are never all held; sizes and parent ids written as plain digits are kept as
 * numbers (see `IdIndex.get`). Wants no more records once the table is known to have more than
 * `maxNodes` rows.
 */
class CsvTableBuilder implements CsvRecordSink {
  private readonly fields: Fields;
  private readonly wanted: Set<string>;
  private readonly poolNames: boolean;
  private header: string[] | undefined;
  private headerLine = 0;
  private readonly at = new Map<string, number>();
  private kept: KeptColumn[] = [];
  private rows = 0;

  constructor(fields: Fields) {
    this.fields = fields;
    this.wanted = new Set([
      fields.idField,
      fields.parentField,
      fields.pathField,
      fields.nameField,
      fields.sizeField,
      ...fields.keepFields,
    ]);
    // The name column, when no other role reads it, goes straight into a name pool: a name per row then
    // costs its bytes, not a string kept until the table is linked.
    const others = new Set([
      fields.idField,
      fields.parentField,
      fields.pathField,
      fields.sizeField,
      ...fields.keepFields,
    ]);
    this.poolNames = !others.has(fields.nameField);
  }

  record(cells: string[], lines: number): boolean {
    if (this.header === undefined) {
      this.startHeader(cells, lines);
      return true;
    }
    const rows = this.rows;
    for (const column of this.kept) {
      const cell = cells[column.index];
      // A size or a parent id written as plain digits is kept as its number (it reads back as the same
      // text): a small number costs no string.
      if (column.pool) column.pool.setString(rows, cell ?? "");
      else column.cells.push(column.numbers ? plainNumber(cell) : cell);
    }
    this.rows = rows + 1;
    return this.rows <= this.fields.maxNodes;
  }

  private startHeader(cells: string[], lines: number): void {
    const { fields, at } = this;
    const header = cells.map((name) => name.trim());
    this.header = header;
    this.headerLine = lines - newlines(cells);
    header.forEach((name, c) => {
      if (!at.has(name)) at.set(name, c);
    });
    for (const [name, index] of at) {
      if (this.wanted.has(name)) {
        // Sizes and parent ids keep plain digits as numbers (they read back as the same text).
        const numbers = name === fields.sizeField || name === fields.parentField;
        const pool = this.poolNames && name === fields.nameField ? new NamePool() : null;
        this.kept.push({ name, index, cells: [], numbers, pool });
      }
    }
  }

  /** The table read; INPUT_EMPTY when there was not even a header. */
  table(): Table {
    const names = this.header;
    if (names === undefined) throw new EspalierError("INPUT_EMPTY", "the table has no header row");
    const { at, headerLine } = this;
    // At most one row over the limit, which is enough to report it.
    const length = Math.min(this.rows, this.fields.maxNodes + 1);
    let kept = this.kept;
    return {
      length,
      textCells: true,
      column(name) {
        const c = at.get(name);
        if (c === undefined) return undefined;
        if (names.indexOf(name, c + 1) !== -1) {
          throw new EspalierError("PARSE_CSV", `the header names the column "${name}" more than once`, {
            line: headerLine,
          });
        }
        const column = kept.find((k) => k.name === name);
        if (!column) throw new Error(`column "${name}" was not kept while reading`);
        if (column.pool) return namesToArray(column.pool).slice(0, length);
        return column.cells.length > length ? column.cells.slice(0, length) : column.cells;
      },
      columnNames: () => names,
      pooledColumn(name) {
        const c = at.get(name);
        if (c === undefined || names.indexOf(name, c + 1) !== -1) return undefined;
        return kept.find((k) => k.name === name)?.pool ?? undefined;
      },
      release() {
        for (const column of kept) column.cells = [];
        kept = [];
        at.clear();
      },
    };
  }
}

function newlines(record: readonly string[]): number {
  let count = 0;
  for (const cell of record)
    for (let k = cell.indexOf("\n"); k !== -1; k = cell.indexOf("\n", k + 1)) count++;
  return count;
}

/** The number a cell of 1 to 15 digits without a leading zero (or "0") stands for, else the cell. */
function plainNumber(cell: string): string | number {
  const n = cell.length;
  if (n === 0 || n > 15 || (n > 1 && cell.charCodeAt(0) === 48)) return cell;
  let value = 0;
  for (let k = 0; k < n; k++) {
    const d = cell.charCodeAt(k) - 48;
    if (d < 0 || d > 9) return cell;
    value = value * 10 + d;
  }
  return value;
}
