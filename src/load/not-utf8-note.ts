import { isUtf8 } from "node:buffer";
import { say } from "../errors.js";
import type { ReadingNote } from "../model/reading-note.js";
import { wellFormedUtf8 } from "../model/well-formed-utf8.js";
import type { Table } from "./table/table.js";

/**
 * UNDECODABLE_BYTES: `count` lines of a path list or a YAML document, rows of a table, ids of an edge
 * list or strings of a JSON document hold bytes that are not UTF-8 (RFC 3629), the first on input
 * line `line`. Each bad sequence reads as U+FFFD, as the WHATWG decoder reads it, so
 * the names print with it and two names that differ only in such bytes look alike; where they would be
 * one node (one path, one id) the load refuses (written-paths.ts), else they stay two nodes, alike.
 * A folder named on another system or a spreadsheet's old export is mostly Latin-1 (ISO/IEC 8859-1).
 */
export function notUtf8Note(
  unit: "line" | "row" | "id" | "string",
  count: number,
  line: number,
): ReadingNote {
  const what = count === 1 ? `1 ${unit} holds` : `${count} ${unit}s hold`;
  const first = unit === "line" ? `: line ${line}` : ` on line ${line}`;
  return {
    code: "UNDECODABLE_BYTES",
    line,
    count,
    parts: say`${what} bytes that are not UTF-8 (the first${first}): each bad sequence was read as U+FFFD, so names that differ only there print alike; where they would be one path or one id the input is refused. When the input is Latin-1, as a folder named on another system or a spreadsheet's old export often is, convert it first: iconv -f latin1 -t utf-8 FILE | espalier -`,
  };
}

/** The UNDECODABLE_BYTES note of a table some rows of which hold bytes that are not UTF-8, if any. */
export function tableNotUtf8Notes(table: Pick<Table, "notUtf8" | "place">): ReadingNote[] {
  const found = table.notUtf8?.();
  if (found === undefined) return [];
  const line = table.place?.(found.first)?.line ?? found.first + 1;
  return [notUtf8Note("row", found.count, line)];
}

/**
 * The UNDECODABLE_BYTES note of a document read whole (YAML) whose bytes are not all UTF-8, counting
 * its lines that hold such bytes; undefined when all are UTF-8 (one native check).
 */
export function documentNotUtf8Note(bytes: Uint8Array): ReadingNote | undefined {
  if (isUtf8(bytes)) return undefined;
  let count = 0;
  let first = 0;
  let line = 1;
  for (let start = 0; start <= bytes.length; line++) {
    let end = bytes.indexOf(0x0a, start);
    if (end === -1) end = bytes.length;
    if (!wellFormedUtf8(bytes, start, end) && count++ === 0) first = line;
    start = end + 1;
  }
  return count > 0 ? notUtf8Note("line", count, first) : undefined;
}
