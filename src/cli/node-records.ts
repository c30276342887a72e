import { Buffer } from "node:buffer";
import { EspalierError } from "../errors.js";
import { loadTree } from "../load/index.js";
import { defaultLoadOptions, type LoadOptions } from "../load/load-options.js";
import { csvTableFromBytes } from "../load/table/csv-table.js";
import { locateCell } from "../load/table/locate-cell.js";
import { rowsTable } from "../load/table/rows-table.js";
import type { Table } from "../load/table/table.js";
import type { CliIO } from "./io.js";
import { readInput } from "./read-input.js";

/**
 * The node records of a graph (`--nodes FILE`): a CSV or TSV table with a header, or a JSON array of
 * flat records, one per node id. JSON by the `.json` extension or a first `[`; TSV by `.tsv`/`.tab` or a
 * tab in the first line; CSV otherwise. Errors name the records file.
 */
export async function readNodeRecords(io: CliIO, file: string, fields: LoadOptions): Promise<Table> {
  const shown = file === "-" ? "<stdin>" : file;
  try {
    const text = await readInput(io, file);
    const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
    const lower = file.toLowerCase();
    if (lower.endsWith(".json") || body.trimStart().startsWith("[")) {
      let value: unknown;
      try {
        value = JSON.parse(body);
      } catch (error) {
        if (!(error instanceof SyntaxError)) throw error;
        // The engine's message quotes the text around the fault (input: --pseudonymize must not print
        // it) and, in newer engines, gives no place: espalier's own JSON reader says where, at its line
        // and column, with the input it quotes marked as such.
        try {
          loadTree(body, { ...defaultLoadOptions, format: "json", readAs: "values", file: shown });
        } catch (placed) {
          if (placed instanceof EspalierError && placed.code === "PARSE_JSON") throw placed.inFile(shown);
        }
        throw new EspalierError("PARSE_JSON", "invalid JSON in the node records");
      }
      if (!Array.isArray(value))
        throw new EspalierError("SHAPE", "node records in JSON must be an array of objects");
      // A record's fault names this file (its message names the record).
      return { ...rowsTable(value), place: () => ({ file: shown }) };
    }
    const firstLine = body.slice(0, body.indexOf("\n") === -1 ? body.length : body.indexOf("\n"));
    const tsv = lower.endsWith(".tsv") || lower.endsWith(".tab") || firstLine.includes("\t");
    // The records are read by the id, name, size and kept columns (no row limit: one record per node).
    const bytes = Buffer.from(body, "utf8");
    const delimiter = tsv ? "\t" : ",";
    const table = csvTableFromBytes(bytes, delimiter, { ...fields, maxNodes: Number.POSITIVE_INFINITY });
    // A record's fault is placed at its cell in this file.
    return {
      ...table,
      place: (row, field) => ({ file: shown, ...locateCell(bytes, delimiter, row, field) }),
    };
  } catch (error) {
    throw error instanceof EspalierError ? error.inFile(shown) : error;
  }
}
