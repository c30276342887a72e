import { writeFileSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { summarizeFactSession } from "../../src/cli/fact-input.js";
import type { EspalierError } from "../../src/errors.js";
import { openFactTable } from "../../src/load/facts/load-facts.js";
import type { Tree } from "../../src/model/tree.js";
import { renderJson } from "../../src/render/summary-json.js";
import { renderText } from "../../src/render/summary-text.js";
import type { SummaryResult } from "../../src/summarize.js";
import { cli } from "../helpers/cli.js";
import { keyOptions, lit, scratchDir, withEngine } from "../load/facts/helpers.js";

/** The summary as JSON and as text (every number a reader sees). */
function rendered({ tree, result }: { tree: Tree; result: SummaryResult }, budget: number) {
  const json = renderJson(result.view, {
    budget,
    lines: result.selection.lines,
    foci: result.fociPaths,
    labels: false,
  });
  return { json, text: renderText(result.view, { units: "bytes", sizes: tree.hasSizes }) };
}

const dir = scratchDir();

/** A generated storage inventory: keys 1 to 6 levels deep over a small alphabet, with sizes. */
const segment = fc.constantFrom("a", "b", "c", "d", "log", "x y", "é");
const key = fc.array(segment, { minLength: 1, maxLength: 6 }).map((s) => s.join("/"));
const inventory = fc.array(fc.tuple(key, fc.nat(5000)), { minLength: 1, maxLength: 80 });

function writeInventory(rows: [string, number][], name: string): string {
  const file = join(dir, name);
  writeFileSync(file, `key,size\n${rows.map(([k, s]) => `"${k}",${s}`).join("\n")}\n`);
  return file;
}

/** Foci that exist: prefixes of some keys (picked by the generated indices). */
function fociOf(rows: [string, number][], picks: [number, number][]): string[] {
  return picks.map(([row, depth]) => {
    const parts = rows[row % rows.length][0].split("/");
    return parts.slice(0, 1 + (depth % parts.length)).join("/");
  });
}

describe("espalier FILE --key-field … --pushdown always", () => {
  it("gives the summary made from the whole rollup, for any table, foci, budget and chains (property)", async () => {
    let run = 0;
    await fc.assert(
      fc.asyncProperty(
        inventory,
        fc.array(fc.tuple(fc.nat(), fc.nat()), { maxLength: 2 }),
        fc.integer({ min: 0, max: 25 }),
        fc.boolean(),
        async (rows, picks, extra, chains) => {
          const file = writeInventory(rows, `inv-${run++}.csv`);
          const session = await openFactTable({
            file,
            format: "csv",
            facts: keyOptions("key", "size"),
            rolledUp: false,
            rootName: "inv.csv",
            keepFields: ["rows"],
            maxNodes: Number.POSITIVE_INFINITY,
          });
          try {
            const options = { foci: fociOf(rows, picks), budget: 1, importance: "depth" as const, chains };
            // The smallest budget that holds the foci, from the whole rollup's own error, plus some.
            const least = await summarizeFactSession(session, options, false, false).then(
              () => 1,
              (err: EspalierError) => err.details.smallest as number,
            );
            const budget = least + extra;
            const whole = await summarizeFactSession(session, { ...options, budget }, false, false);
            const pushed = await summarizeFactSession(session, { ...options, budget }, true, false);
            // Source: an independent run of the same summary over the whole rollup (every node fetched).
            expect(rendered(pushed, budget)).toEqual(rendered(whole, budget));
            expect(pushed.tree.length).toBeLessThanOrEqual(whole.tree.length);
          } finally {
            session.close();
          }
        },
      ),
      { numRuns: 25 },
    );
  }, 240_000);

  it("prints a pushdown query whose result, run as printed, reads back to the same summary", async () => {
    const rows: [string, number][] = [];
    for (let i = 0; i < 400; i++) {
      const depth = 2 + (i % 5);
      const parts = [`bucket-${i % 3}`];
      for (let d = 1; d < depth; d++) parts.push(`d${(i * (d + 3)) % (d + 2)}`);
      parts.push(`obj-${i}`);
      rows.push([parts.join("/"), i * 13]);
    }
    const file = writeInventory(rows, "inventory.csv");
    const focus = ["--focus", "bucket-1/d1", "--focus", "bucket-2"];
    const args = [...focus, "--budget", "14", "--format", "json"];
    const direct = await cli([file, "--key-field", "key", ...args, "--pushdown", "never"]);
    const printed = await cli([file, "--print-sql", "--key-field", "key", ...focus, "--sql-reach", "3"]);
    // The plan the engine runs (tests/load/facts/printed-sql.test.ts): keys, then level by level.
    expect(printed.stdout).toContain('"espalier_level_0" AS (');
    const out = join(dir, "pushed.parquet");
    await withEngine(async (engine) => {
      await engine.run(`CREATE VIEW facts AS SELECT * FROM read_csv(${lit(file)})`);
      await engine.run(
        `COPY (${printed.stdout.trimEnd().replace(/;$/, "")}) TO ${lit(out)} (FORMAT parquet)`,
      );
      const rowsBack = await engine.run(`SELECT count(*) FROM ${lit(out)}`);
      const all = await engine.run("SELECT count(*) FROM facts");
      // The point of the query: fewer result rows than facts.
      expect(Number(rowsBack.values[0][0])).toBeLessThan(Number(all.values[0][0]));
    });
    const back = await cli([out, "--rolled-up", ...args]);
    // Source: the printed SQL executed by the engine as printed, against the summary of the whole table.
    expect(back.stderr).toBe("");
    expect(JSON.parse(back.stdout).root).toEqual({
      ...JSON.parse(direct.stdout).root,
      name: "pushed.parquet",
    });
    const shallow = await cli([file, "--print-sql", "--key-field", "key", ...focus, "--sql-reach", "1"]);
    const cut = join(dir, "shallow.parquet");
    await withEngine(async (engine) => {
      await engine.run(`CREATE VIEW facts AS SELECT * FROM read_csv(${lit(file)})`);
      await engine.run(
        `COPY (${shallow.stdout.trimEnd().replace(/;$/, "")}) TO ${lit(cut)} (FORMAT parquet)`,
      );
    });
    const tooShallow = await cli([cut, "--rolled-up", ...focus, "--budget", "40"]);
    expect(tooShallow.code).toBe(2);
    expect(tooShallow.stderr).toContain("[SHAPE]");
  });
});
