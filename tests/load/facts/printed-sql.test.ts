import { writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { describe, expect, it } from "vitest";
import type { FactOptions } from "../../../src/load/facts/fact-options.js";
import { deepestKey, type FactLoad, openFactTable } from "../../../src/load/facts/load-facts.js";
import { printedSql } from "../../../src/load/facts/printed-sql.js";
import { keyOptions, levelsOptions, lit, scratchDir, withEngine } from "./helpers.js";

const dir = scratchDir();
const costs = resolve(import.meta.dirname, "../../../fixtures/quillfeather-cost-export.csv");

/** A key hierarchy 1 to 5 levels deep, with a key ending at a node, an empty name and a NULL-free size. */
function inventory(): string {
  const file = join(dir, "inventory.csv");
  const lines = ["key,size"];
  for (let i = 0; i < 240; i++) {
    const depth = 1 + (i % 5);
    const parts = [`bucket-${i % 3}`];
    for (let d = 1; d < depth; d++) parts.push(`p${(i * (d + 2)) % (d + 3)}`);
    lines.push(`${parts.join("/")}/obj-${i}.bin,${i * 29}`);
  }
  lines.push("bucket-0/p0,7", "bucket-1//odd,11", "bucket-2,3");
  writeFileSync(file, `${lines.join("\n")}\n`);
  return file;
}

/** The statements a session runs to fetch the whole tree, and (with `near`) the nodes near the foci. */
async function statementsRun(
  file: string,
  facts: FactOptions,
  near?: { foci: string[][]; reach: number },
): Promise<string[]> {
  const statements: string[] = [];
  const load: FactLoad = {
    file,
    format: "csv",
    facts,
    rolledUp: false,
    rootName: "facts",
    keepFields: [],
    maxNodes: Number.POSITIVE_INFINITY,
    engine: { onQuery: (sql) => statements.push(sql) },
  };
  const session = await openFactTable(load);
  try {
    if (near) await session.near(near.foci, near.reach);
    else await session.whole();
  } finally {
    session.close();
  }
  return statements;
}

/**
 * The printed statement split into its parts: each common table expression's name and body (indented
 * two spaces in print), and the final query, without its semicolon.
 */
function parts(printed: string): { tables: Map<string, string>; result: string } {
  const tables = new Map<string, string>();
  const cte = /(?:^WITH |^)"([a-z_0-9]+)" AS \(\n([\s\S]*?)\n\),?\n/gm;
  let end = 0;
  for (let m = cte.exec(printed); m !== null; m = cte.exec(printed)) {
    tables.set(m[1], m[2].replace(/^ {2}/gm, ""));
    end = m.index + m[0].length;
  }
  return { tables, result: printed.slice(end).trimEnd().replace(/;$/, "") };
}

/** The statements that made working tables (`CREATE TABLE name AS body`), by name. */
function tablesMade(statements: string[]): Map<string, string> {
  const made = new Map<string, string>();
  for (const sql of statements) {
    const m = /^CREATE TABLE ([a-z_0-9]+) AS ([\s\S]*)$/.exec(sql);
    if (m) made.set(m[1], m[2]);
  }
  return made;
}

describe("printedSql(facts, depth, near?)", () => {
  it("prints, for a key hierarchy, the statements the engine runs: the same tables, then the same query", async () => {
    const file = inventory();
    const facts = keyOptions("key", "size");
    const depth = await deepestKey(file, "csv", facts);
    for (const near of [undefined, { foci: [["bucket-1", "p1"], ["bucket-2"]], reach: 2 }]) {
      const run = await statementsRun(file, facts, near);
      const printed = parts(printedSql(facts, depth, near));
      // Every table of the printed plan is one the engine made with the same text, and back.
      expect(printed.tables).toEqual(tablesMade(run));
      expect(printed.tables.size).toBe(depth + 2);
      expect(run).toContain(printed.result);
      expect(printed.result).not.toContain("ROLLUP");
    }
  });

  it("prints, for level columns, the rollup the engine runs, and with foci its pushdown query", async () => {
    const facts = levelsOptions(["account", "service", "region", "usage"], "cost");
    const whole = parts(printedSql(facts, 4));
    const run = await statementsRun(costs, facts);
    expect(whole.tables.size).toBe(0);
    expect(tablesMade(run).get("espalier_rollup")).toBe(whole.result);
    const near = { foci: [["qf-build"]], reach: 2 };
    const pushed = parts(printedSql(facts, 4, near));
    const runNear = await statementsRun(costs, facts, near);
    expect(pushed.tables).toEqual(tablesMade(runNear));
    expect(runNear).toContain(pushed.result);
  });

  it("gives, run as printed on the engine, the rows the session fetched", async () => {
    const file = inventory();
    const facts = keyOptions("key", "size");
    const depth = await deepestKey(file, "csv", facts);
    const near = { foci: [["bucket-1", "p1"]], reach: 2 };
    let nodeRows = 0;
    const load: FactLoad = {
      file,
      format: "csv",
      facts,
      rolledUp: false,
      rootName: "facts",
      keepFields: ["rows"],
      maxNodes: Number.POSITIVE_INFINITY,
    };
    const session = await openFactTable(load);
    const tree = await session.near(near.foci, near.reach).finally(() => session.close());
    const printed = printedSql(facts, depth, near);
    await withEngine(async (engine) => {
      // Source: the printed SQL executed by the engine as printed, over a view of the file.
      await engine.run(`CREATE VIEW facts AS SELECT * FROM read_csv(${lit(file)}, all_varchar = true)`);
      const result = await engine.run(printed.trimEnd().replace(/;$/, ""));
      // One row per node (node_count set), and own rows (node_count NULL) for keys ending at a node.
      const nodeCount = result.values[result.names.indexOf("node_count")];
      nodeRows = nodeCount.filter((value) => value !== null).length;
    });
    expect(nodeRows).toBe(tree.length);
  });
});
