import { describe, expect, it } from "vitest";
import { valuesByParent } from "../../../src/load/table/values-by-parent.js";

// Rows of a graph table of the fictional Tidewater Freight's services: id, parent, and an `access`
// cell per row; node 0 dispatch, 1 billing-api, 2 route-svc, 3 quay-cache (rows 3 and 4).
const parents = ["", "dispatch", "dispatch", "route-svc", "billing-api"];
const nodeOfRow = Int32Array.from([0, 1, 2, 3, 3]);

function valuesOf(cells: string[]): string[] {
  // Each node's first row's cell, as the graph table keeps it before.
  const values = ["", "", "", ""];
  for (let r = cells.length - 1; r >= 0; r--) values[nodeOfRow[r]] = cells[r];
  valuesByParent(values, cells, (r) => parents[r], nodeOfRow);
  return values;
}

describe("valuesByParent(values, cells, parentOf, nodeOfRow)", () => {
  it("gives a node whose rows differ its cells by parent id, parents in code-unit order", () => {
    expect(valuesOf(["", "rw", "rw", "rw", "ro"])).toEqual([
      "",
      "rw",
      "rw",
      '{"billing-api":"ro","route-svc":"rw"}',
    ]);
  });

  it("keeps the first row's cell where the later rows repeat it or leave it empty", () => {
    expect(valuesOf(["", "rw", "rw", "ro", "ro"])[3]).toBe("ro");
    expect(valuesOf(["", "rw", "rw", "ro", ""])[3]).toBe("ro");
  });

  it("with emptyRepeats false (an edge's own cell), tells an empty later cell from the first's", () => {
    const cells = ["", "rw", "rw", "ro", ""];
    const values = ["", "rw", "rw", "ro"];
    valuesByParent(values, cells, (r) => parents[r], nodeOfRow, false);
    expect(values[3]).toBe('{"billing-api":"","route-svc":"ro"}');
  });

  it("tells a cell written only on a later row from none, and escapes as JSON writes strings", () => {
    expect(valuesOf(["", "", "", "", 'say "hi"'])[3]).toBe('{"billing-api":"say \\"hi\\"","route-svc":""}');
  });
});
