import { createReadStream } from "node:fs";
import { EspalierError, quoted, say } from "../../errors.js";
import { placeInTable } from "../table/locate-cell.js";
import type { Engine } from "./engine.js";
import type { FactFormat } from "./fact-options.js";
import { identifier } from "./rollup-sql.js";

/** What locating an error in a fact table needs: the file, how the engine reads it, its size column. */
export interface FactSource {
  file: string;
  format: FactFormat;
  /** The engine's view of the file. */
  table: string;
  sizeField: string;
}

/**
 * The first row of the table whose size is not a number (the engine's cast to DOUBLE PRECISION fails)
 * or is negative, 1-based in the file's order of rows, with the size as written; undefined when there
 * is none. The engine numbers the rows as it reads them, in the file's order (it keeps the order of
 * rows unless told not to).
 */
export async function firstBadSize(
  engine: Engine,
  source: FactSource,
): Promise<{ row: number; value: string } | undefined> {
  const size = identifier(source.sizeField);
  const result = await engine.run(
    `SELECT r, CAST(s AS VARCHAR) FROM (SELECT ROW_NUMBER() OVER () AS r, ${size} AS s FROM ${identifier(source.table)}) AS numbered\n` +
      "WHERE (s IS NOT NULL AND TRY_CAST(s AS DOUBLE) IS NULL) OR TRY_CAST(s AS DOUBLE) < 0\n" +
      "ORDER BY r LIMIT 1",
  );
  if (result.rowCount === 0) return undefined;
  return { row: Number(result.values[0][0]), value: String(result.values[1][0]) };
}

/**
 * BAD_SIZE at the first row with a bad size (firstBadSize), placed where it is: line and column of the
 * cell in a CSV or TSV file (read again with espalier's own scanner), the line of a JSON lines record,
 * the row of a Parquet file (which has no lines). `err` itself when no such row is found.
 */
export async function locateBadSize(
  err: EspalierError,
  engine: Engine,
  source: FactSource,
): Promise<EspalierError> {
  let bad: { row: number; value: string } | undefined;
  try {
    bad = await firstBadSize(engine, source);
  } catch {
    return err;
  }
  if (bad === undefined) return err;
  const located = new EspalierError(
    "BAD_SIZE",
    say`row ${bad.row}: the size column ${quoted.name(source.sizeField)} must hold numbers from 0 to 2^53 - 1, got ${quoted.value(bad.value)}`,
    { row: bad.row },
    { row: bad.row, field: source.sizeField },
  );
  if (source.format === "csv" || source.format === "tsv") {
    // Placed by the cell of the size column in that row (SourcePos.field, dropped once placed).
    const placed = await placeInTable(
      located.placed({ field: source.sizeField }),
      source.format === "csv" ? "," : "\t",
      async () => createReadStream(source.file),
    );
    return placed as EspalierError;
  }
  if (source.format === "jsonl") {
    const line = await lineOfRecord(source.file, bad.row);
    return line === undefined ? located : located.placed({ line });
  }
  return located;
}

/**
 * The line of the `record`-th record (1-based) of a JSON lines file: records are its non-blank lines.
 */
async function lineOfRecord(file: string, record: number): Promise<number | undefined> {
  let line = 1;
  let records = 0;
  let blank = true;
  for await (const chunk of createReadStream(file) as AsyncIterable<Buffer>) {
    for (let i = 0; i < chunk.length; i++) {
      const c = chunk[i];
      if (c === 10) {
        line++;
        blank = true;
      } else if (blank && c !== 32 && c !== 9 && c !== 13) {
        blank = false;
        if (++records === record) return line;
      }
    }
  }
  return undefined;
}

/**
 * PARSE_JSON at the first record of a JSON lines file that is not JSON (RFC 8259, as JSON.parse reads
 * it), at its line and column (UTF-16 units, 1-based): the engine's own report of a malformed record
 * counts its lines in a way of its own (blank lines skipped, off by one). Undefined when every record
 * parses here (the engine objected to something else): its report then stands.
 */
export async function locateMalformedJson(file: string): Promise<EspalierError | undefined> {
  let line = 0;
  let rest = "";
  const decoder = new TextDecoder("utf-8");
  const check = (text: string): EspalierError | undefined => {
    line++;
    const record = text.endsWith("\r") ? text.slice(0, -1) : text;
    if (record.trim() === "") return undefined;
    try {
      JSON.parse(record);
      return undefined;
    } catch (err) {
      const at = /at position (\d+)/.exec(err instanceof Error ? err.message : "");
      const column = at ? Number(at[1]) + 1 : record.length + 1;
      return new EspalierError(
        "PARSE_JSON",
        say`line ${line} is not a JSON value (each line of JSON lines holds one): ${quoted.excerpt(record.slice(Math.max(0, column - 21), column + 20))}`,
        { line, column },
      );
    }
  };
  for await (const chunk of createReadStream(file) as AsyncIterable<Buffer>) {
    const lines = (rest + decoder.decode(chunk, { stream: true })).split("\n");
    rest = lines.pop() ?? "";
    for (const text of lines) {
      const found = check(text);
      if (found) return found;
    }
  }
  return check(rest + decoder.decode());
}
