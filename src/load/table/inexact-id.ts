import { EspalierError, quoted, say } from "../../errors.js";
import type { Cell } from "./table.js";

/**
 * SHAPE when an id or parent cell is a whole number past 2^53 - 1, as JSON and YAML rows hold a
 * database's 64-bit ids: parsed to a double it keeps about 16 digits (RFC 8259 §6: numbers beyond
 * IEEE 754 binary64 precision are not exchanged exactly), so ids that differ in their last digits read
 * as one id, and a parent that names no row could be linked to a row in silence. A CSV cell is text
 * and keeps every digit; so does a JSON string. Undefined for any other cell.
 */
export function inexactId(cell: Cell, row: number, field: string): EspalierError | undefined {
  if (typeof cell !== "number" || Number.isSafeInteger(cell) || !Number.isInteger(cell)) return undefined;
  return new EspalierError(
    "SHAPE",
    say`the "${field}" of row ${row} is a number past 2^53 - 1 (read as ${quoted.id(String(cell))}), which JSON and YAML readers keep to about 16 digits, so ids that differ in their last digits would read as one: write the ids and parent ids as strings ("12345678901234567890")`,
    { row, field },
  );
}
