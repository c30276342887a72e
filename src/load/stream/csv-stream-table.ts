import { parse } from "csv-parse";
import { EspalierError, quoted, say } from "../../errors.js";
import { NamePool, namesToArray } from "../../model/names.js";
import type { LoadOptions } from "../load-options.js";
import type { Table } from "../table.js";

type Fields = Pick<
  LoadOptions,
  "nameField" | "sizeField" | "idField" | "parentField" | "pathField" | "keepFields" | "maxNodes"
>;

/**
 * A CSV (RFC 4180, delimiter ",") or TSV (delimiter "\t", no quoting) table read from a byte stream with
 * csv-parse's stream parser, the same options as {@link csvTable}: the first record is the header, blank
 * lines are skipped. Only the columns a loader reads (id, parent, path, name, size and kept fields) are
 * kept, cell by cell, so the records themselves are never all held; sizes and parent ids written as
 * plain digits are kept as numbers (see `IdIndex.get`). Stops reading once the table is
 * known to have more than `maxNodes` rows. Errors as csvTable gives them: PARSE_CSV at the line where
 * the faulty record starts (after the last good record, past the blank lines csv-parse skipped).
 */
export async function csvStreamTable(
  chunks: AsyncIterable<Uint8Array>,
  delimiter: "," | "\t",
  fields: Fields,
): Promise<Table> {
  const parser = parse({ delimiter, quote: delimiter === "\t" ? false : '"', skip_empty_lines: true });
  const wanted = new Set([
    fields.idField,
    fields.parentField,
    fields.pathField,
    fields.nameField,
    fields.sizeField,
    ...fields.keepFields,
  ]);
  const maxRows = fields.maxNodes;
  let header: string[] | undefined;
  let headerLine = 0;
  const at = new Map<string, number>();
  const kept: {
    name: string;
    index: number;
    cells: (string | number)[];
    numbers: boolean;
    pool: NamePool | null;
  }[] = [];
  // The name column, when no other role reads it, goes straight into a name pool: a name per row then
  // costs its bytes, not a string kept until the table is linked.
  const others = new Set([
    fields.idField,
    fields.parentField,
    fields.pathField,
    fields.sizeField,
    ...fields.keepFields,
  ]);
  const poolNames = !others.has(fields.nameField);
  let rows = 0;
  // Where the last good record ended, to place an error at the start of the record after it.
  let lastLines = 0;
  let lastEmpty = 0;
  parser.on("data", (record: string[]) => {
    lastLines = parser.info.lines;
    lastEmpty = parser.info.empty_lines;
    if (header === undefined) {
      header = record.map((name) => name.trim());
      headerLine = lastLines - newlines(record);
      header.forEach((name, c) => {
        if (!at.has(name)) at.set(name, c);
      });
      for (const [name, index] of at) {
        if (wanted.has(name)) {
          // Sizes and parent ids keep plain digits as numbers (they read back as the same text).
          const numbers = name === fields.sizeField || name === fields.parentField;
          const pool = poolNames && name === fields.nameField ? new NamePool() : null;
          kept.push({ name, index, cells: [], numbers, pool });
        }
      }
      return;
    }
    for (const column of kept) {
      const cell = record[column.index];
      // A size or a parent id written as plain digits is kept as its number (it reads back as the same
      // text): a small number costs no string.
      if (column.pool) column.pool.setString(rows, cell ?? "");
      else column.cells.push(column.numbers ? plainNumber(cell) : cell);
    }
    rows++;
  });
  parser.on("error", () => {
    // Read from parser.errored after each write; the event comes a tick later.
  });
  const check = () => {
    const error = parser.errored;
    if (!error) return;
    const code = (error as { code?: unknown }).code;
    if (typeof code === "string" && /^(CSV_|INVALID_)/.test(code))
      throw csvError(error, lastLines, lastEmpty);
    throw error;
  };
  const done = new Promise<void>((resolve) => parser.once("close", resolve));
  for await (const chunk of chunks) {
    parser.write(chunk);
    check();
    if (rows > maxRows) break;
  }
  if (rows > maxRows) {
    parser.destroy();
  } else {
    parser.end();
    await done;
    check();
  }

  if (header === undefined) throw new EspalierError("INPUT_EMPTY", "the table has no header row");
  const names = header;
  // As csvTable, which parses no further than one row over the limit.
  const length = Math.min(rows, maxRows + 1);
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
      if (!column) throw new Error(`column "${name}" was not kept while streaming`);
      if (column.pool) return namesToArray(column.pool).slice(0, length);
      return column.cells.length > length ? column.cells.slice(0, length) : column.cells;
    },
    columnNames: () => names,
    pooledColumn(name) {
      if (at.get(name) === undefined || names.indexOf(name, at.get(name)! + 1) !== -1) return undefined;
      return kept.find((k) => k.name === name)?.pool ?? undefined;
    },
    release() {
      for (const column of kept) column.cells = [];
      kept.length = 0;
      at.clear();
    },
  };
}

/** PARSE_CSV at the first line after the last good record that csv-parse did not skip as blank. */
function csvError(error: Error, lastLines: number, lastEmpty: number): EspalierError {
  const info = error as { records?: number; empty_lines?: number };
  const good = Number(info.records ?? 0);
  const skipped = Math.max(0, Number(info.empty_lines ?? lastEmpty) - lastEmpty);
  const line = lastLines + 1 + skipped;
  const reason = error.message.replace(/\s+(at|on) line \d+.*$/s, "");
  const pos = good > 0 ? { line, row: good } : { line };
  return new EspalierError(
    "PARSE_CSV",
    say`invalid CSV (${(error as { code?: string }).code ?? "CSV_ERROR"}): ${quoted.excerpt(reason)}`,
    pos,
  );
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
