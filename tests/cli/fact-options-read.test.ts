import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Fact-table options given where they read nothing ran with exit 0 and changed nothing: `--key-depth`
// on an org chart, `--key-depth` with --levels (it cuts a split key only), `--sql-table` without
// --print-sql, `--pushdown` in a diff (only a summary fetches in steps). A reader who asked for a
// cut or a pushdown saw the uncut result and could not tell.

const ORG = ["fixtures/quillfeather-org.csv", "--parent-field", "manager", "--bare", "--budget", "5"];
const COSTS = [
  "fixtures/quillfeather-cost-export.csv",
  "--levels",
  "account,service,region",
  "--size-field",
  "cost",
];

describe("fact-table options where they would change nothing", () => {
  it("is USAGE naming the option, on an input that is no fact table", async () => {
    for (const [flag, value] of [
      ["--key-depth", "2"],
      ["--key-separator", ":"],
      ["--sql-table", "costs"],
      ["--sql-reach", "1"],
      ["--pushdown", "always"],
    ]) {
      const result = await cli([...ORG, flag, value]);
      expect(result.stdout).toBe("");
      expect(result.code).toBe(2);
      expect(result.stderr).toBe(
        `espalier: ${flag} applies to fact tables (read with --levels, --key-field or --rolled-up), and this input is none: it would change nothing here [USAGE]\n`,
      );
    }
  });

  it("is USAGE for a key option with --levels, --sql-table without --print-sql, --pushdown in a diff", async () => {
    const depth = await cli([...COSTS, "--key-depth", "2", "--budget", "5"]);
    expect(depth.code).toBe(2);
    expect(depth.stderr).toMatch(
      /^espalier: --key-depth applies to a key split into levels \(--key-field\) only/,
    );
    const table = await cli([...COSTS, "--sql-table", "cost_export", "--budget", "5"]);
    expect(table.code).toBe(2);
    expect(table.stderr).toMatch(/^espalier: --sql-table shapes the --print-sql query only/);
    const diff = await cli([
      "diff",
      ...COSTS,
      "fixtures/quillfeather-cost-export.csv",
      "--pushdown",
      "never",
    ]);
    expect(diff.code).toBe(2);
    expect(diff.stderr).toMatch(/^espalier: --pushdown applies to a summary only, not to espalier diff/);
  });

  it("still runs where they apply, and a config file's values are not held against a run", async () => {
    const printed = await cli(["--print-sql", ...COSTS, "--sql-table", "cost_export"]);
    expect(printed.code).toBe(0);
    expect(printed.stdout).toMatch(/cost_export/);
    const fromConfig = await cli([...ORG], { files: { ".espalier.yaml": "sqlTable: cost_export\n" } });
    expect(fromConfig.stderr).toBe("");
    expect(fromConfig.code).toBe(0);
  });
});
