import { parse } from "csv-parse";
import { parse as parseWhole } from "csv-parse/sync";
import { EspalierError, quoted, say } from "../../errors.js";
import { asBuffer } from "../../model/buffer-codecs.js";
import { readLimits, tooLong } from "../read-limits.js";

const STOP = new Error("enough records");

/** Where CSV/TSV records go, one at a time, in input order (the header first). */
export interface CsvRecordSink {
  /**
   * One record. `lines` is the number of lines read to its end, `emptyLines` how many blank lines were
   * skipped so far. Returns false when no more records are wanted.
   */
  record(cells: string[], lines: number, emptyLines: number): boolean;
}

/**
 * csv-parse's options for espalier's tables: RFC 4180 for CSV; TSV has no quoting (IANA
 * text/tab-separated-values: a field cannot hold a tab or a line break), so a double quote in TSV is an
 * ordinary character. Blank lines are skipped and are not records.
 */
function csvOptions(delimiter: "," | "\t", maxRecordBytes: number) {
  // max_record_size: a record that never ends (an endless input without line breaks) stops at the
  // limit (read-limits.ts); csv-parse counts its characters, never more than its UTF-8 bytes.
  return {
    delimiter,
    quote: delimiter === "\t" ? false : '"',
    skip_empty_lines: true,
    max_record_size: maxRecordBytes,
  } as const;
}

/** Reads the records of CSV/TSV bytes held whole, synchronously. */
export function readCsvBytes(
  bytes: Uint8Array,
  delimiter: "," | "\t",
  sink: CsvRecordSink,
  maxRecordBytes = readLimits.maxLineBytes,
): void {
  let lastLines = 0;
  let lastEmpty = 0;
  // Each record goes to the sink as it is parsed, none is kept; a thrown STOP ends the parse.
  const onRecord = (record: string[], info: { lines: number; empty_lines: number }) => {
    lastLines = info.lines;
    lastEmpty = info.empty_lines;
    if (!sink.record(record, lastLines, lastEmpty)) throw STOP;
    return null;
  };
  try {
    parseWhole(asBuffer(bytes), { ...csvOptions(delimiter, maxRecordBytes), on_record: onRecord });
  } catch (error) {
    if (error === STOP) return;
    throw asParseError(error, lastLines, lastEmpty, maxRecordBytes);
  }
}

/** Reads the records of CSV/TSV from a byte stream; stops reading once the sink wants no more. */
export async function readCsvStream(
  chunks: AsyncIterable<Uint8Array>,
  delimiter: "," | "\t",
  sink: CsvRecordSink,
  maxRecordBytes = readLimits.maxLineBytes,
): Promise<void> {
  const parser = parse(csvOptions(delimiter, maxRecordBytes));
  let lastLines = 0;
  let lastEmpty = 0;
  let wanted = true;
  parser.on("data", (record: string[]) => {
    if (!wanted) return;
    lastLines = parser.info.lines;
    lastEmpty = parser.info.empty_lines;
    wanted = sink.record(record, lastLines, lastEmpty);
  });
  parser.on("error", () => {
    // Read from parser.errored after each write; the event comes a tick later.
  });
  const check = () => {
    const error = parser.errored;
    if (error) throw asParseError(error, lastLines, lastEmpty, maxRecordBytes);
  };
  const done = new Promise<void>((resolve) => parser.once("close", resolve));
  for await (const chunk of chunks) {
    parser.write(chunk);
    check();
    if (!wanted) break;
  }
  if (!wanted) {
    parser.destroy();
    return;
  }
  parser.end();
  await done;
  check();
}

/** A csv-parse error as PARSE_CSV (see csvError); anything else as it is. */
function asParseError(error: unknown, lastLines: number, lastEmpty: number, maxRecordBytes: number): unknown {
  const code = (error as { code?: unknown }).code;
  if (code === "CSV_MAX_RECORD_SIZE") {
    const line = lastLines + 1;
    return tooLong(`the record at line ${line}`, maxRecordBytes, { line });
  }
  if (typeof code === "string" && /^(CSV_|INVALID_)/.test(code))
    return csvError(error as Error, lastLines, lastEmpty);
  return error;
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
