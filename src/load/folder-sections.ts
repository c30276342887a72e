import { EspalierError } from "../errors.js";

/**
 * The line where a listing in folder sections begins its second line, when `text` is one: a first line
 * that is a folder's path and ":" (`src/ledger:`, `.:`), then its entries one a line, none of them
 * `key: value` or indented, as `ls -R` and `ls -lR` print each folder (GNU ls, seen here; `ls -lR`
 * with its `total N` line and a file's mode first). As YAML, that first line reads as a key and the
 * next as a stray text: the parser's own error names neither. Undefined otherwise.
 */
export function folderSectionsAt(text: string): number | undefined {
  const lines = text.split("\n", 4).map((line) => line.replace(/\r$/, ""));
  const first = lines.findIndex((line) => line.trim() !== "");
  if (first === -1) return undefined;
  const entry = lines[first + 1];
  return entry !== undefined && startsSections(lines[first], entry) ? first + 2 : undefined;
}

/**
 * Whether `head` and `entry`, an input's first line and the one after it, start a folder's section as
 * `ls -R` and `ls -lR` print it: a path and ":", then an entry that is not `key: value` nor indented.
 */
export function startsSections(head: string, entry: string): boolean {
  if (!/^[^\s#:][^:]*:$/.test(head)) return false;
  return entry !== "" && !/^[\s-]/.test(entry) && !/: |:$/.test(entry);
}

/**
 * PARSE_PATHS at `line`: the input is a listing in folder sections, which espalier does not read; `as`
 * is how it was being read (detected as YAML from its first line, or as a path list).
 */
export function folderSectionsError(line: number, as: "yaml" | "paths" = "yaml"): EspalierError {
  const read =
    as === "yaml"
      ? "read as YAML it fails here"
      : "read as a path list, each entry would be a top-level name apart from its folder, and the folder's line a name of its own";
  return new EspalierError(
    "PARSE_PATHS",
    `the input starts as ls -R (or ls -lR, ls -sR) prints a folder: its path and ':', then its entries by name alone; ${read}, and espalier reads a listing whose every line holds a whole path: list one with find DIR -printf '%s\\t%p\\n' (sizes and paths) or find DIR (paths)${as === "paths" ? "; to read each line as a path, pass --input-format paths" : ""}`,
    { line, column: 1 },
  );
}
