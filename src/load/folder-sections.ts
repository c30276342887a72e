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
  const head = lines[first];
  if (!/^[^\s#:][^:]*:$/.test(head)) return undefined;
  const entry = lines[first + 1];
  if (entry === undefined || entry === "" || /^[\s-]/.test(entry) || /: |:$/.test(entry)) return undefined;
  return first + 2;
}

/** PARSE_PATHS at `line`: the input is a listing in folder sections, which espalier does not read. */
export function folderSectionsError(line: number): EspalierError {
  return new EspalierError(
    "PARSE_PATHS",
    "the input starts as ls -R (or ls -lR) prints a folder: its path and ':', then its entries by name alone; read as YAML it fails here, and espalier reads a listing whose every line holds a whole path: list one with find DIR -printf '%s\\t%p\\n' (sizes and paths) or find DIR (paths)",
    { line, column: 1 },
  );
}
