import { EspalierError } from "../../errors.js";
import { sepLineMessage } from "../sep-line.js";

/**
 * An error about a CSV table whose header is one column holding semicolons, with a hint: such a file
 * is separated by ";" (as spreadsheets write it where the comma is the decimal mark), which CSV is not
 * (RFC 4180, section 2: fields are separated by commas). Read as CSV, each line is one field, so the
 * columns named are never found, or a decimal comma splits a row; the hint says what the file is.
 * Other errors, and other tables, are returned as they are.
 */
export function withSeparatorHint(error: unknown, header: readonly string[] | undefined): unknown {
  if (!(error instanceof EspalierError) || header === undefined) return error;
  if (error.code !== "FIELD_MISSING" && error.code !== "PARSE_CSV") return error;
  // `sep=,` read as CSV is two cells, "sep=" and ""; `sep=;` one.
  const sep = header.length <= 2 && /^sep=.?$/.test(header[0]) && (header[1] ?? "") === "";
  if (sep) {
    const separator = header.length === 2 ? "," : header[0].slice(4) || "\t";
    return new EspalierError(
      error.code,
      [...error.parts, `; ${sepLineMessage(separator, "csv")}`],
      error.pos,
      error.details,
    );
  }
  if (header.length !== 1) return error;
  const semicolons = header[0].split(";").length - 1;
  if (semicolons === 0) return error;
  return new EspalierError(
    error.code,
    [
      ...error.parts,
      `; the header is one column holding ${semicolons} ${semicolons === 1 ? "semicolon" : "semicolons"}: a semicolon-separated file, which espalier does not read as CSV (RFC 4180 separates by commas); save or convert it with commas as separators first, python3 -c 'import csv, sys; csv.writer(sys.stdout).writerows(csv.reader(sys.stdin, delimiter=";"))' < FILE | espalier -`,
    ],
    error.pos,
    error.details,
  );
}
