import { describe, expect, it } from "vitest";
import { IdIndex } from "../../../src/load/table/id-index.js";

describe("IdIndex", () => {
  it("IdIndex.add(id, row) returns -1 for a new id and the earlier row for a repeated one, by text", () => {
    const ids: string[] = new Array(6);
    const index = new IdIndex(ids);
    expect(["12", "012", "0", "q7", "4000000000", "12"].map((id, row) => index.add(id, row))).toEqual([
      -1, -1, -1, -1, -1, 0,
    ]);
    expect(ids.slice(0, 5)).toEqual(["12", "012", "0", "q7", "4000000000"]);
  });

  it("IdIndex.get(id) finds a row by the id's text, and a number by the text it is written as", () => {
    const index = new IdIndex(new Array(5));
    for (const [row, id] of ["12", "012", "0", "q7", "4000000000"].entries()) index.add(id, row);
    expect(["12", "012", "0", "q7", "4000000000", "7", "00", "q"].map((id) => index.get(id))).toEqual([
      0, 1, 2, 3, 4, -1, -1, -1,
    ]);
    // A cell kept as a number stands for String(cell).
    expect([12, 0, -0, 4_000_000_000, 7, 1.5, -12].map((id) => index.get(id))).toEqual([
      0, 2, 2, 4, -1, -1, -1,
    ]);
  });

  it("IdIndex.get(id) tells apart ids past the rows' count, written as numbers or text", () => {
    const index = new IdIndex(new Array(3));
    index.add("1000", 0);
    index.add("2147483648", 1);
    index.add("1.5", 2);
    expect([
      index.get(1000),
      index.get("1000"),
      index.get(2147483648),
      index.get(1.5),
      index.get("1.50"),
    ]).toEqual([0, 0, 1, 2, -1]);
  });
});
