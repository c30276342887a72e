import { CsvTableReader, type TableFields } from "../csv-table-reader.js";
import type { Table } from "../table.js";

/**
 * A CSV (RFC 4180, delimiter ",") or TSV (delimiter "\t", no quoting) table read from a byte stream, chunk
 * by chunk, with the byte scanner of `csvTable` (see {@link CsvTableReader}): the same table, and the
 * same errors (PARSE_CSV at the line where the faulty record starts), for the same bytes. Stops reading
 * once the table is known to have more than `maxNodes` rows.
 */
export async function csvStreamTable(
  chunks: AsyncIterable<Uint8Array>,
  delimiter: "," | "\t",
  fields: TableFields,
): Promise<Table> {
  const reader = new CsvTableReader(delimiter, fields);
  for await (const chunk of chunks) {
    reader.write(chunk);
    if (reader.full) break;
  }
  return reader.end();
}
