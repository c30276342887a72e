import type { MessagePart } from "../../errors.js";
import { say } from "../../errors.js";
import { escapeSegment } from "../../model/segment.js";
import type { LoadOptions } from "../load-options.js";
import type { Table } from "./table.js";

/**
 * The end of a FIELD_MISSING message for JSON or YAML rows whose first row holds, under a field, a list
 * of records that have the path field, or the id and parent fields: the rows to read are likely those
 * (`npm pack --dry-run --json`: one record per package, its files under `files`, each with a `path`
 * and a `size`), and `--start-at` reads them. Empty when there is no such field.
 */
export function rowsInside(table: Table, options: LoadOptions): MessagePart[] | "" {
  const first = table.firstRecord;
  if (first === undefined) return "";
  for (const [key, value] of Object.entries(first)) {
    if (!Array.isArray(value)) continue;
    const item: unknown = value[0];
    if (typeof item !== "object" || item === null || Array.isArray(item)) continue;
    const linked =
      Object.hasOwn(item, options.pathField) ||
      (Object.hasOwn(item, options.idField) && Object.hasOwn(item, options.parentField));
    if (!linked) continue;
    // RFC 6901: the rows' array, its first element, then the key (`~` and `/` escaped).
    const pointer = `${options.startAt ?? ""}/0/${escapeSegment(key)}`;
    return say`; the first row's "${key}" holds records with the fields that link rows: --start-at ${pointer} reads them`;
  }
  return "";
}
