import { type MessagePart, quoted, say } from "../../errors.js";

/**
 * A clause for the message of an input detected as a path list whose first line may be the header of a
 * table whose columns are not named `id`/`parent`/`path` (`from<TAB>to`, `employee,manager`): with a
 * tab (`tsv`), its first cell is read as a size (BAD_SIZE); with commas (`csv`), every line is a row
 * (PARSE_PATHS). It names the options that read the table as the table it is; none when a cell holds a
 * digit (a size written otherwise, or a row of data). `only: "edges"` names the edge list's options only
 * (the message names the table's itself).
 */
export function headerLineHint(
  cells: readonly string[],
  format: "tsv" | "csv",
  only: "table and edges" | "edges" = "table and edges",
): MessagePart[] {
  if (cells.length < 2 || cells.some((cell) => /\d/.test(cell))) return [];
  const edges =
    cells.length === 2
      ? say`--input-format edges --parent-field ${quoted.name(cells[0].trim())} --child-field ${quoted.name(cells[1].trim())}`
      : ["--input-format edges --parent-field COLUMN --child-field COLUMN"];
  if (only === "edges") return say`, or, for one edge a row (a parent and a child), ${edges}`;
  const table = format === "tsv" ? "a tab-separated table" : "the table";
  return say`; if line 1 names the columns of ${table}, pass --input-format ${format} with --id-field COLUMN and --parent-field COLUMN (or --path-field COLUMN), or, for one edge a row (a parent and a child), ${edges}`;
}
