import { EspalierError } from "../errors.js";
import { defaultLoadOptions, type InputFormat, type LoadOptions } from "./load-options.js";
import { complaintOf } from "./path-list/complaint-lines.js";
import { isRowsValue } from "./rows-shape.js";

/** The field names that tell a table's columns (and a document's children) apart. */
export type FieldNames = Pick<LoadOptions, "childrenField" | "idField" | "parentField" | "pathField">;

const byExtension: ReadonlyArray<[string, InputFormat]> = [
  [".yaml", "yaml"],
  [".yml", "yaml"],
  [".csv", "csv"],
  [".tsv", "tsv"],
  [".tab", "tsv"],
  [".paths", "paths"],
  [".txt", "paths"],
  [".lst", "paths"],
];

/**
 * The format of `text`: by the file's extension first (".json" is JSON or rows by content), then by
 * content: "{" or "[" starts JSON; a first line whose tab- or comma-separated cells name the id, parent
 * or path field is a TSV or CSV header; a first line like "key:" (or "---") is YAML; anything else is a
 * path list. Whitespace-only text is INPUT_EMPTY.
 */
export function detectFormat(
  text: string,
  file: string | undefined,
  fields: FieldNames = defaultLoadOptions,
): InputFormat {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const first = body.search(/\S/);
  if (first === -1) throw new EspalierError("INPUT_EMPTY", "the input is empty", file ? { file } : undefined);
  const name = file && file !== "-" ? file.toLowerCase() : "";
  if (name.endsWith(".json")) return jsonKind(body, first, fields);
  for (const [extension, format] of byExtension) {
    if (!name.endsWith(extension)) continue;
    // A tab-separated listing of sizes and paths (find -printf '%s\t%P\n' saved as .tsv) is a path list.
    if (format === "tsv" && !isHeader(firstLineOf(body, first), "\t", fields) && isSizedPath(body, first))
      return "paths";
    return format;
  }

  if (body[first] === "{" || body[first] === "[") return jsonKind(body, first, fields);
  const firstLine = firstLineOf(body, 0);
  if (firstLine.includes("\t") && isHeader(firstLine, "\t", fields)) return "tsv";
  if (firstLine.includes(",") && isHeader(firstLine, ",", fields)) return "csv";
  // `find: ‘x’: No such file or directory` first (a listing saved with 2>&1) reads like a YAML key: the
  // path list's reader says what the line is.
  if (looksLikeYaml(body) && complaintOf(firstLineOf(body, first)) === undefined) return "yaml";
  return "paths";
}

/** The line that holds offset `at`, without its line end. */
function firstLineOf(body: string, at: number): string {
  const start = body.lastIndexOf("\n", at) + 1;
  const end = body.indexOf("\n", at);
  return body.slice(start, end === -1 ? body.length : end).replace(/\r$/, "");
}

/** Whether a line's cells name the id, parent or path field (a table's header). */
function isHeader(line: string, delimiter: string, fields: FieldNames): boolean {
  const names = [fields.idField, fields.parentField, fields.pathField];
  return line.split(delimiter).some((cell) => names.includes(cell.trim().replace(/^"(.*)"$/, "$1")));
}

/** Whether the first non-blank line, at `first`, is a size, a tab and a path (or nothing: the root). */
function isSizedPath(body: string, first: number): boolean {
  return /^\s*\d+(?:\.\d+)?\t/.test(firstLineOf(body, first));
}

/** "rows" when the first element of a top-level array is a flat record with the id, parent or path field. */
function jsonKind(body: string, first: number, fields: FieldNames): "json" | "rows" {
  if (body[first] !== "[") return "json";
  const open = body.indexOf("{", first);
  if (open === -1 || body.slice(first + 1, open).trim() !== "") return "json";
  const close = body.indexOf("}", open);
  if (close === -1) return "json";
  try {
    // Only a flat first record parses on its own; a nested node object is cut at its first "}".
    return isRowsValue([JSON.parse(body.slice(open, close + 1))], fields) ? "rows" : "json";
  } catch {
    return "json";
  }
}

/** The first line that is not blank or a comment is "---", a directive, "key:" or "- key:". */
function looksLikeYaml(body: string): boolean {
  for (let start = 0; start < body.length; ) {
    const end = body.indexOf("\n", start);
    const line = body.slice(start, end === -1 ? body.length : end).replace(/\r$/, "");
    start = end === -1 ? body.length : end + 1;
    if (line.trim() === "" || line.trimStart().startsWith("#")) continue;
    if (line === "---" || line.startsWith("--- ") || line.startsWith("%YAML")) return true;
    return /^(?:-\s+)?(?:"[^"]*"|'[^']*'|[^\s#'"-][^:#]*?|-[^\s:#][^:#]*?)\s*:(?:\s|$)/.test(line);
  }
  return false;
}
