import type { FactFormat } from "./fact-options.js";
import { identifier, literal } from "./rollup-sql.js";

/**
 * The embedded engine's statement that makes a file readable as the table `table` (a view: nothing is
 * copied, the engine streams the file on each query). Engine-specific by nature: the one statement
 * espalier runs but never prints. CSV and TSV cells are read as text under the header's names (given,
 * not guessed, so a row with too many or too few fields is an error rather than a guess), so a level
 * value such as "007" keeps its zeros. CSV quoting is RFC 4180's (a quote doubled inside a quoted
 * field; `""` is an empty value, an empty field too); TSV has no quoting.
 */
export function sourceViewSql(
  table: string,
  file: string,
  format: FactFormat,
  header: readonly string[] = [],
): string {
  const path = literal(file);
  const columns = `{${header.map((name) => `${literal(name)}: 'VARCHAR'`).join(", ")}}`;
  const text = (delim: string, quote: string) =>
    `read_csv(${path}, header = true, auto_detect = false, columns = ${columns}, delim = ${literal(delim)}, ` +
    `quote = ${literal(quote)}, escape = ${literal(quote)}, strict_mode = true, null_padding = false, ` +
    "allow_quoted_nulls = false)";
  const from =
    format === "parquet"
      ? `read_parquet(${path})`
      : format === "jsonl"
        ? `read_json(${path}, format = 'newline_delimited')`
        : format === "tsv"
          ? text("\t", "")
          : text(",", '"');
  return `CREATE OR REPLACE VIEW ${identifier(table)} AS SELECT * FROM ${from}`;
}
