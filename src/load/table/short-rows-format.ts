import { EspalierError } from "../../errors.js";
import type { InputFormat, LoadOptions } from "../load-options.js";

/**
 * `--short-rows fill` says how a CSV or TSV table's short rows read; on any other input it would be
 * ignored, and a user who asked for it would not learn that it did not apply: USAGE, naming the format
 * the input is read as. (An edge list may be a table; it is checked when read.)
 */
export function checkShortRowsFormat(
  format: InputFormat | "fact table",
  options: Pick<LoadOptions, "shortRows">,
): void {
  if (options.shortRows === undefined || format === "csv" || format === "tsv" || format === "edges") return;
  const how =
    format === "fact table"
      ? " (the SQL engine reads a fact table's CSV itself)"
      : " (--input-format csv or tsv reads it as a table)";
  throw new EspalierError(
    "USAGE",
    `--short-rows reads CSV and TSV tables only; this input is read as ${format}${how}`,
  );
}
