/** A first line `sep=X`: the separator of the table after it, as spreadsheets write it before the header. */
export const SEP_LINE = /^sep=(.)\r?$/;

/**
 * What a first line `sep=X` is and how to read what follows it: the line a spreadsheet writes before a
 * table's header to name its separator (a convention of spreadsheet programs; common practice, no
 * source), which is no path and no header. `as`: how the input was being read, as a path list (each
 * row would be one name) or as CSV (the line would be the header, naming none of the columns).
 */
export function sepLineMessage(separator: string, as: "paths" | "csv"): string {
  const drop = "tail -n +2 FILE";
  const way =
    separator === ","
      ? `${drop} | espalier - reads the table after it`
      : separator === ";"
        ? `${drop} | python3 -c 'import csv, sys; csv.writer(sys.stdout).writerows(csv.reader(sys.stdin, delimiter=";"))' | espalier - reads the table after it (espalier reads CSV with commas, RFC 4180)`
        : `${drop} | espalier - reads what follows it`;
  const read =
    as === "paths"
      ? "read as a path list, each row would be one name"
      : "read as CSV it is the header, which names none of the table's columns";
  const paths = as === "paths" ? "; to read each line as a path, pass --input-format paths" : "";
  return `line 1, "sep=${separator}", is the line a spreadsheet writes before a table's header to name its separator: ${read}. Drop that line: ${way}${paths}`;
}
