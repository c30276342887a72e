import { CsvTableReader, type TableFields, type TableReading } from "./csv-table-reader.js";
import type { Table } from "./table.js";

/**
 * A CSV (RFC 4180, delimiter ",") or TSV (delimiter "\t", no quoting) table from bytes held whole,
 * through the byte scanner the streamed table uses ({@link CsvTableReader}), so both give the same
 * table and the same errors.
 */
export function csvTableFromBytes(bytes: Uint8Array, delimiter: "," | "\t", fields: TableFields): Table {
  const reader = new CsvTableReader(delimiter, fields);
  reader.write(bytes);
  return reader.end();
}

/**
 * The same table read from a byte stream, in chunks; reading stops once more rows than maxNodes are
 * known. `reading`: what to keep for a later version's load, or what an earlier version's kept.
 */
export async function csvTableFromStream(
  chunks: AsyncIterable<Uint8Array>,
  delimiter: "," | "\t",
  fields: TableFields,
  reading?: TableReading,
): Promise<Table> {
  const reader = new CsvTableReader(delimiter, fields, reading);
  for await (const chunk of chunks) {
    reader.write(chunk);
    if (reader.full) break;
  }
  return reader.end();
}
