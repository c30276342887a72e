import type { LoadOptions } from "../load-options.js";
import { WrittenPaths } from "../written-paths.js";
import type { Table } from "./table.js";

/**
 * DUPLICATE_ID at the first row whose cell in one of `columns` (the id and parent columns, or an edge
 * table's parent and child columns) reads as an id that an earlier cell wrote in other bytes that are
 * not UTF-8 (Latin-1 `caf\xe9`, `caf\xe8`): read alike, they would be one id, and a row would be linked
 * to another's row (see load/written-paths.ts).
 */
export function checkWrittenIds(table: Table, columns: readonly string[]): void {
  const cells = columns.map((name) => table.writtenCells?.(name));
  if (cells.every((c) => c === undefined)) return;
  const written = new WrittenPaths("row");
  const rows = [...new Set(cells.flatMap((c) => [...(c?.keys() ?? [])]))].sort((a, b) => a - b);
  for (const r of rows) {
    cells.forEach((c, k) => {
      const cell = c?.get(r);
      if (cell !== undefined) written.checkId(cell.read, cell.written, r + 1, columns[k]);
    });
  }
}

/** As {@link checkWrittenIds}, for a path column: DUPLICATE_PATH where a folder on a path's way is written two ways. */
export function checkWrittenPaths(table: Table, options: LoadOptions): void {
  const paths = table.writtenCells?.(options.pathField);
  if (paths === undefined) return;
  const written = new WrittenPaths("row");
  for (const r of [...paths.keys()].sort((a, b) => a - b)) {
    const path = paths.get(r)!;
    written.checkPath(path.read, path.written, r + 1, options.pathField);
  }
}
