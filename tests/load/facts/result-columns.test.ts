import { DuckDBInstance } from "@duckdb/node-api";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { openEngine } from "../../../src/load/facts/engine.js";
import { lit } from "./helpers.js";

/**
 * The reference: the engine package's own conversion of a result to JavaScript values
 * (`DuckDBResultReader.getColumnsJS` of @duckdb/node-api), with big integers that are exact as numbers
 * made numbers, as espalier's reader promises.
 */
async function packageColumns(sql: string): Promise<unknown[][]> {
  const instance = await DuckDBInstance.create(":memory:");
  const connection = await instance.connect();
  try {
    const reader = await connection.runAndReadAll(sql);
    return reader
      .getColumnsJS()
      .map((column) =>
        column.map((v) => (typeof v === "bigint" && Number.isSafeInteger(Number(v)) ? Number(v) : v)),
      );
  } finally {
    connection.closeSync();
    instance.closeSync();
  }
}

async function espalierColumns(sql: string): Promise<unknown[][]> {
  const engine = await openEngine();
  try {
    const result = await engine.run(sql);
    expect(result.values.every((column) => column.length === result.rowCount)).toBe(true);
    return result.values.map((column) => [...column]);
  } finally {
    engine.close();
  }
}

// Text is written into the statement as a literal; the engine's SQL parser ends a statement at a NUL
// (it reads the text as a C string, from memory: seed 1740669552 gave "unterminated quoted string" for
// "\u0000"), so no literal may hold one. Values with NUL in them reach the reader from files, not SQL.
const text = fc
  .oneof(
    fc.string({ maxLength: 14 }),
    fc.string({ unit: "grapheme", maxLength: 8 }),
    fc.string({ unit: "binary", maxLength: 20 }),
    fc.constantFrom("", "acct-1", "a-name-longer-than-twelve-bytes", "ü", "\u{1F30A}", "é\u0301"),
  )
  .filter((s) => !s.includes("\u0000"));

describe("Engine.run: result values", () => {
  it("are those of the engine package's own conversion, for text, whole numbers and doubles (property)", async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.array(
          fc.record({
            t: fc.option(text, { nil: null }),
            i: fc.option(fc.integer(), { nil: null }),
            b: fc.option(fc.bigInt({ min: -(2n ** 63n), max: 2n ** 63n - 1n }), { nil: null }),
            h: fc.option(fc.bigInt({ min: -(2n ** 100n), max: 2n ** 100n }), { nil: null }),
            d: fc.option(fc.double({ noNaN: true }), { nil: null }),
          }),
          { minLength: 1, maxLength: 40 },
        ),
        async (rows) => {
          const value = (v: unknown, type: string) =>
            v === null
              ? `CAST(NULL AS ${type})`
              : `CAST(${typeof v === "string" ? lit(v) : String(v)} AS ${type})`;
          const tuples = rows.map(
            (r) =>
              `(${value(r.t, "VARCHAR")}, ${value(r.i, "INTEGER")}, ${value(r.b, "BIGINT")}, ${value(r.h, "HUGEINT")}, ${value(r.d === null ? null : r.d.toExponential(17), "DOUBLE")})`,
          );
          const sql = `SELECT * FROM (VALUES ${tuples.join(", ")}) AS v(t, i, b, h, d)`;
          const mine = await espalierColumns(sql);
          expect(mine).toEqual(await packageColumns(sql));
          // Text comes back as it went in, NULL as null.
          expect(mine[0]).toEqual(rows.map((r) => r.t));
        },
      ),
      { numRuns: 25 },
    );
  });

  it("reads results of many chunks, with repeated and NULL text, as the package does", async () => {
    // 10,000 rows: five of the engine's chunks of 2,048; names repeat in runs, as in a sorted rollup.
    const sql =
      "SELECT CASE WHEN i % 7 = 0 THEN NULL ELSE 'name-' || (i // 100) END AS t, " +
      "CASE WHEN i % 5 = 0 THEN repeat('long-', 1 + i % 4) || i ELSE 'ü' || (i % 3) END AS u, " +
      "CAST(i AS BIGINT) * 1099511627776 AS b, SUM(CAST(i AS BIGINT)) OVER (ORDER BY i) AS h, " +
      "CASE WHEN i % 3 = 0 THEN NULL ELSE i / 7 END AS d FROM range(10000) AS r(i) ORDER BY i";
    const mine = await espalierColumns(sql);
    expect(mine).toEqual(await packageColumns(sql));
    expect(mine[2][9999]).toBe(9999n * 1099511627776n);
  });
});
