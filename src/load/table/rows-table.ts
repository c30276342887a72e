import { EspalierError, type SourcePos } from "../../errors.js";
import { type Cell, cellText, type Table } from "./table.js";

/**
 * A table from a parsed JSON array of flat objects (rows); each element must be an object. `place`
 * says where a row (or its cell of a field) is in the input, when the reader kept that.
 */
export function rowsTable(
  rows: readonly unknown[],
  place?: (row: number, field?: string) => SourcePos | undefined,
): Table {
  for (let r = 0; r < rows.length; r++) {
    const row = rows[r];
    if (typeof row !== "object" || row === null || Array.isArray(row)) {
      throw new EspalierError("SHAPE", `row ${r + 1} must be an object`, { row: r + 1, ...place?.(r + 1) });
    }
  }
  const records = rows as readonly Record<string, unknown>[];
  return {
    length: records.length,
    textCells: false,
    ...(records.length > 0 ? { firstRecord: records[0] } : {}),
    column(name) {
      const cells: Cell[] = new Array(records.length);
      let found = false;
      for (let r = 0; r < records.length; r++) {
        const record = records[r];
        if (!Object.hasOwn(record, name)) {
          cells[r] = undefined;
          continue;
        }
        found = true;
        const value = record[name];
        if (typeof value === "object" && value !== null) {
          throw new EspalierError("SHAPE", `the "${name}" of row ${r + 1} must be a plain value`, {
            row: r + 1,
            ...place?.(r + 1, name),
          });
        }
        cells[r] = value as Cell;
      }
      return found ? cells : undefined;
    },
    keptText(name) {
      // A kept field is text: a nested value as its JSON, as the nested loaders keep one.
      let found = false;
      const texts = records.map((record) => {
        if (!Object.hasOwn(record, name)) return "";
        found = true;
        const value = record[name];
        return typeof value === "object" && value !== null ? JSON.stringify(value) : cellText(value as Cell);
      });
      return found ? texts : undefined;
    },
    ...(place ? { place } : {}),
    columnNames() {
      const names = new Set<string>();
      for (const record of records) for (const key of Object.keys(record)) names.add(key);
      return [...names];
    },
  };
}
