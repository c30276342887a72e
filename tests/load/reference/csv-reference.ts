import { parse } from "csv-parse/sync";
import { EspalierError } from "../../../src/errors.js";
import type { Table } from "../../../src/load/table/table.js";

// The whole-text CSV/TSV reader espalier had before every load went through the byte loaders, kept as a
// reference answer: csv-parse's synchronous parser over the whole text, error lines found by re-reading.

/**
 * A table from CSV (RFC 4180, delimiter ",") or TSV (delimiter "\t"). The first record is the header.
 * TSV has no quoting (IANA text/tab-separated-values: a field cannot hold a tab or line break), so a
 * double quote in TSV is an ordinary character. Blank lines are skipped and are not rows.
 * `maxRows` stops parsing once the table is known to be too long.
 */
export function csvTable(text: string, delimiter: "," | "\t", maxRows: number): Table {
  const limit = Number.isFinite(maxRows) ? { to: maxRows + 2 } : {};
  const options = { delimiter, quote: delimiter === "\t" ? false : '"', skip_empty_lines: true, ...limit };
  let records: string[][];
  try {
    records = parse(text, options);
  } catch (error) {
    const code = (error as { code?: unknown }).code;
    if (typeof code === "string" && /^(CSV_|INVALID_)/.test(code))
      throw csvError(error as Error, text, options);
    throw error;
  }
  if (records.length === 0) throw new EspalierError("INPUT_EMPTY", "the table has no header row");
  const header = records[0].map((name) => name.trim());
  const at = new Map<string, number>();
  header.forEach((name, c) => {
    if (!at.has(name)) at.set(name, c);
  });
  const length = records.length - 1;
  return {
    length,
    textCells: true,
    column(name) {
      const c = at.get(name);
      if (c === undefined) return undefined;
      if (header.indexOf(name, c + 1) !== -1) {
        const line = firstNonBlankLineAfter(text, 0);
        throw new EspalierError("PARSE_CSV", `the header names the column "${name}" more than once`, {
          line,
        });
      }
      const cells: string[] = new Array(length);
      for (let r = 0; r < length; r++) cells[r] = records[r + 1][c];
      return cells;
    },
    columnNames: () => header,
  };
}

/**
 * PARSE_CSV at the line where the faulty record starts: csv-parse reports the line where it noticed the
 * fault (for an unclosed quote, the end of the input), so the record's start is found by re-reading the
 * good records before it.
 */
function csvError(error: Error, text: string, options: object): EspalierError {
  const good = Number((error as { records?: number }).records ?? 0);
  let lastEnd = 0;
  if (good > 0) {
    const before = parse(text, { ...options, to: good, info: true }) as unknown as {
      info: { lines: number };
    }[];
    lastEnd = before[before.length - 1].info.lines;
  }
  const line = firstNonBlankLineAfter(text, lastEnd);
  const reason = error.message.replace(/\s+(at|on) line \d+.*$/s, "");
  const pos = good > 0 ? { line, row: good } : { line };
  return new EspalierError("PARSE_CSV", `invalid CSV: ${reason}`, pos);
}

/** The first line after line `after` (1-based) that holds more than whitespace; or the line after. */
function firstNonBlankLineAfter(text: string, after: number): number {
  let line = 1;
  let start = 0;
  while (line <= after) {
    const nl = text.indexOf("\n", start);
    if (nl === -1) return line + 1;
    start = nl + 1;
    line++;
  }
  for (;;) {
    const nl = text.indexOf("\n", start);
    const end = nl === -1 ? text.length : nl;
    if (text.slice(start, end).trim() !== "" || nl === -1) return line;
    start = nl + 1;
    line++;
  }
}
