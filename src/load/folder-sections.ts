import { EspalierError } from "../errors.js";

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
