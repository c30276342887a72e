import { EspalierError, type SourcePos } from "../../errors.js";
import { CsvScanner, type CsvSink } from "./csv-scanner.js";

/**
 * Finds a cell of a CSV or TSV table by reading its bytes again with the scanner that read them: the
 * field of column `field` (the first header cell of that name, trimmed, as the table reader takes it)
 * in data row `row`, or the row's first field. Its line and column are where the field starts (its
 * opening quote when quoted), counted as every CSV error counts them. Errors about a row are rare, so
 * the reader keeps no column for each cell: only the error pays for this second reading.
 */
class CellFinder implements CsvSink {
  readonly scanner: CsvScanner;
  private records = 0;
  private column = 0;
  found: SourcePos | undefined;

  constructor(
    delimiter: "," | "\t",
    private readonly row: number,
    private readonly wanted: string | undefined,
  ) {
    this.scanner = new CsvScanner(delimiter.charCodeAt(0), this);
  }

  field(column: number, bytes: Uint8Array, start: number, end: number): void {
    if (this.records > 0 || this.wanted === undefined || this.column > 0) return;
    const name = new TextDecoder("utf-8", { ignoreBOM: true }).decode(bytes.subarray(start, end)).trim();
    if (name === this.wanted) this.column = column + 1;
  }

  record(): boolean {
    if (this.records++ < this.row) return false;
    this.found = this.scanner.fieldPosition(Math.max(0, this.column - 1));
    return true;
  }
}

/** The cell's place in a table held as bytes; undefined when the bytes do not have that row. */
export function locateCell(
  bytes: Uint8Array,
  delimiter: "," | "\t",
  row: number,
  field: string | undefined,
): SourcePos | undefined {
  const finder = new CellFinder(delimiter, row, field);
  try {
    finder.scanner.write(bytes);
    finder.scanner.end();
  } catch {
    // A fault after the row (read again, it was fine the first time up to there).
  }
  return finder.found;
}

/** The same from a stream of the table's bytes, read again; it stops reading at the row. */
export async function locateCellInStream(
  chunks: AsyncIterable<Uint8Array>,
  delimiter: "," | "\t",
  row: number,
  field: string | undefined,
): Promise<SourcePos | undefined> {
  const finder = new CellFinder(delimiter, row, field);
  try {
    for await (const chunk of chunks) {
      finder.scanner.write(chunk);
      if (finder.scanner.done) return finder.found;
    }
    finder.scanner.end();
  } catch {
    // As above; a failure to read again leaves the row's line as the table knew it.
  }
  return finder.found;
}

/**
 * `err` placed at the cell it is about, when it is about a row of a table (a row and no column yet: a
 * duplicate id, a missing parent, a bad size, a cycle, a repeated path), read again from `again`.
 */
export async function placeInTable(
  err: unknown,
  delimiter: "," | "\t",
  again: () => Promise<AsyncIterable<Uint8Array>>,
): Promise<unknown> {
  const pos = rowToPlace(err);
  if (pos === undefined) return err;
  try {
    const found = await locateCellInStream(await again(), delimiter, pos.row, pos.field);
    return (err as EspalierError).placed(found);
  } catch {
    return err;
  }
}

/** The same for a table held as bytes. */
export function placeInTableBytes(err: unknown, delimiter: "," | "\t", bytes: Uint8Array): unknown {
  const pos = rowToPlace(err);
  return pos === undefined
    ? err
    : (err as EspalierError).placed(locateCell(bytes, delimiter, pos.row, pos.field));
}

function rowToPlace(err: unknown): { row: number; field?: string } | undefined {
  if (!(err instanceof EspalierError)) return undefined;
  const pos = err.pos;
  if (pos?.row === undefined || pos.column !== undefined) return undefined;
  return { row: pos.row, field: pos.field };
}
