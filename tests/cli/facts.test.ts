import { existsSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { describe, expect, it } from "vitest";
import { runBin } from "../helpers/bin.js";
import { cli } from "../helpers/cli.js";
import { lit, scratchDir, withEngine } from "../load/facts/helpers.js";

const fixture = resolve(import.meta.dirname, "../../fixtures/quillfeather-cost-export.csv");
const dir = scratchDir();
const LEVELS = ["--levels", "account,service,region,usage", "--size-field", "cost"];

/** Runs a printed query as printed on the engine, over a view of `file` named as in the query. */
async function runPrinted(sql: string, table: string, file: string, out: string, format: string) {
  await withEngine(async (engine) => {
    await engine.run(`CREATE VIEW ${table} AS SELECT * FROM read_csv(${lit(file)})`);
    // The printed text, unchanged but for its closing semicolon, inside COPY.
    await engine.run(`COPY (${sql.trimEnd().replace(/;$/, "")}) TO ${lit(out)} (FORMAT ${format})`);
  });
}

describe("espalier FILE --levels … (fact tables)", () => {
  it("summarises the cost export around a focus, every line adding up", async () => {
    const r = await cli([fixture, ...LEVELS, "--focus", "qf-telemetry-prod/egress", "--budget", "12"]);
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    expect(r.stdout.trimEnd().split("\n").length).toBeLessThanOrEqual(12);
    expect(r.stdout).toContain("* egress");
  });

  it("says how many rows its nodes stand for, in the header and in JSON (field test: rows per leaf)", async () => {
    // RFC 4180: one record per line after the header line, none of the fixture's fields quoted across
    // lines, so its rows are its lines less the header.
    const rows = readFileSync(fixture, "utf8").trimEnd().split("\n").length - 1;
    const r = await cli([fixture, ...LEVELS, "--budget", "8"]);
    expect(r.code).toBe(0);
    const [header] = r.stdout.split("\n");
    const nodes = Number(/^summary: ([\d,]+) nodes/.exec(header)![1].replaceAll(",", ""));
    // A row per day: fewer nodes than rows, and the header says both.
    expect(nodes).toBeLessThan(rows);
    expect(header).toContain(`; rolled up from ${rows.toLocaleString("en-US")} rows;`);
    const json = JSON.parse((await cli([fixture, ...LEVELS, "--budget", "8", "--format", "json"])).stdout);
    // The rollup's root is one espalier added (a saved summary says so, for a diff of two saves).
    expect(json.input).toEqual({
      shape: "table",
      sizeUnit: "number",
      rolledUpRows: rows,
      rootNamed: "added",
    });
    expect(json.totals.nodes).toBe(nodes);
  });

  it("prints a query that, run as printed on the engine, gives a result read back to the same summary", async () => {
    const printed = await cli(["--print-sql", ...LEVELS, "--sql-table", "cost_export"]);
    expect(printed.code).toBe(0);
    expect(printed.stdout).toContain("GROUP BY ROLLUP");
    expect(printed.stdout).toContain('FROM "cost_export"');
    const direct = await cli([
      fixture,
      ...LEVELS,
      "--focus",
      "qf-build",
      "--budget",
      "15",
      "--format",
      "json",
    ]);
    for (const format of ["csv", "parquet"]) {
      const out = join(dir, `rollup.${format}`);
      await runPrinted(printed.stdout, "cost_export", fixture, out, format);
      const back = await cli([
        out,
        "--rolled-up",
        "--focus",
        "qf-build",
        "--budget",
        "15",
        "--format",
        "json",
      ]);
      // Source: the printed SQL executed by the engine as printed (a stand-in for a cluster engine).
      expect(back.stderr).toBe("");
      expect(JSON.parse(back.stdout).root).toEqual({
        ...JSON.parse(direct.stdout).root,
        name: `rollup.${format}`,
      });
    }
  });

  it("does the same for a key hierarchy, its depth read from the table", async () => {
    const keys = join(dir, "inventory.csv");
    const lines = ["key,size"];
    for (let i = 0; i < 300; i++)
      lines.push(`bucket-${i % 3}/team-${i % 7}/${i % 2 ? `run-${i % 5}/` : ""}obj-${i}.bin,${i * 37}`);
    lines.push("bucket-0/team-0,5", "bucket-1//odd,9");
    writeFileSync(keys, `${lines.join("\n")}\n`);
    const printed = await cli([keys, "--print-sql", "--key-field", "key"]);
    expect(printed.stdout).toContain("SPLIT_PART");
    const args = ["--focus", "bucket-0/team-0", "--budget", "20", "--format", "json"];
    const direct = await cli([keys, "--key-field", "key", ...args]);
    const out = join(dir, "keys-rollup.parquet");
    await runPrinted(printed.stdout, "facts", keys, out, "parquet");
    const back = await cli([out, "--rolled-up", ...args]);
    expect(back.stderr).toBe("");
    expect(JSON.parse(back.stdout).root).toEqual({
      ...JSON.parse(direct.stdout).root,
      name: "keys-rollup.parquet",
    });
  });

  it("refuses a result table with a row missing (SHAPE), rather than a different tree", async () => {
    const printed = await cli(["--print-sql", ...LEVELS]);
    const out = join(dir, "whole.csv");
    await runPrinted(printed.stdout, "facts", fixture, out, "csv");
    const rows = readFileSync(out, "utf8").trimEnd().split("\n");
    const cut = join(dir, "cut.csv");
    writeFileSync(cut, `${rows.filter((_, k) => k !== 5).join("\n")}\n`);
    const r = await cli([cut, "--rolled-up"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/\[(SHAPE|MISSING_PARENT)\]/);
  });

  it("compares two months with diff, exit 1 when they differ", async () => {
    const text = readFileSync(fixture, "utf8");
    const next = join(dir, "next-month.csv");
    writeFileSync(next, `${text}qf-lab,sandbox,harrow-north,hours,2031-05-01,40\n`);
    const r = await cli(["diff", fixture, next, ...LEVELS, "--fail-on-change", "--budget", "10"]);
    expect(r.stderr).toBe("");
    expect(r.code).toBe(1);
    expect(r.stdout).toContain("qf-lab");
    // Each month's rows: the added month has the one row more.
    const rows = text.trimEnd().split("\n").length - 1;
    expect(r.stdout).toContain(
      `rolled up from ${rows.toLocaleString("en-US")} -> ${(rows + 1).toLocaleString("en-US")} rows`,
    );
  });

  it("pseudonymises the level values like any names", async () => {
    const r = await cli([fixture, ...LEVELS, "--pseudonymize", "--budget", "8"], {
      env: { ESPALIER_PSEUDONYM_KEY: "test-secret" },
    });
    expect(r.code).toBe(0);
    expect(r.stdout).not.toContain("qf-");
    expect(r.stdout).toContain("anon-");
  });

  it("reads fact tables from files only, and needs --levels or --key-field", async () => {
    expect((await cli(["-", ...LEVELS], { stdin: "a,cost\n" })).stderr).toContain("[USAGE]");
    expect((await cli([fixture, "--input-format", "parquet"])).stderr).toContain("[USAGE]");
  });
});

describe("start-up path", () => {
  it("imports the engine package in one module only, and the fact loader only dynamically", () => {
    const src = resolve(import.meta.dirname, "../../src");
    const files = (readdirSync(src, { recursive: true }) as string[]).filter((f) => f.endsWith(".ts"));
    const engineUsers = files.filter((f) => readFileSync(join(src, f), "utf8").includes("@duckdb/node-api"));
    expect(engineUsers).toEqual([join("load", "facts", "engine.ts")]);
    for (const f of files) {
      if (f.startsWith(join("load", "facts"))) continue;
      const text = readFileSync(join(src, f), "utf8");
      expect(text).not.toMatch(/^import (?!type ).*load\/facts\/(load-facts|engine)\.js/m);
    }
  });

  it("the launcher loads the engine's JavaScript layer as the one file built beside its bundle", async () => {
    const root = resolve(import.meta.dirname, "../..");
    const { version } = JSON.parse(
      readFileSync(join(root, "node_modules/@duckdb/node-bindings/package.json"), "utf8"),
    );
    expect(existsSync(join(root, `dist/bundle/engine-api-${version}.cjs`))).toBe(true);
    // A preloaded script lists, as the run ends, the engine modules Node loaded.
    const hook = join(dir, "list-modules.cjs");
    const list = 'Object.keys(require.cache).filter((k) => k.includes("duckdb") || k.includes("engine-api"))';
    writeFileSync(
      hook,
      `process.on("exit", () => process.stderr.write("\\nMODULES " + JSON.stringify(${list}) + "\\n"));\n`,
    );
    const args = [fixture, ...LEVELS, "--focus", "qf-build", "--budget", "10"];
    const bin = await runBin(args, { env: { NODE_OPTIONS: `--require ${hook}` } });
    expect(bin.code).toBe(0);
    expect(bin.stdout).toBe((await cli(args)).stdout);
    const loaded: string[] = JSON.parse(/MODULES (.*)/.exec(bin.stderr)?.[1] ?? "null");
    expect(loaded.some((m) => m.endsWith(`engine-api-${version}.cjs`))).toBe(true);
    expect(loaded.filter((m) => m.includes("node-api"))).toEqual([]);
    expect(loaded.some((m) => m.includes("node-bindings"))).toBe(true);
  });
});
