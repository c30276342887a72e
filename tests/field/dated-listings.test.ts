import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

// Field tests: `du -ab --time` and `find -printf '%s\t%TY-%Tm-%Td\t%p\n'` (GNU, run here) put a date
// column between the size and the path. Read as part of the path, each date was a top-level folder
// and the folders' totals split among them: du -ab --time /usr/share/doc/git read as 5.9 MiB in three
// date folders where du -sb says 3.0 MiB, exit 0. The check for the way out is du -sb.
const gnuTools = isGnuTool("du") && isGnuTool("find") && isGnuTool("cut");
let base = "";
const run = (cmd: string, args: string[], input?: string) =>
  execFileSync(cmd, args, { cwd: base, encoding: "utf8", ...(input === undefined ? {} : { input }) });

beforeAll(() => {
  if (!gnuTools) return;
  base = mkdtempSync(join(tmpdir(), "espalier-dated-"));
  writeFiles(join(base, "harbor"), { "ledger/a.csv": 1200, "sails/plan.md": 4097, "notes.txt": 12 });
});

afterAll(() => {
  if (base) rmSync(base, { recursive: true, force: true });
});

describe.skipIf(!gnuTools)("a listing with a date between the size and the path", () => {
  it.each([
    ["du -ab --time", () => run("du", ["-ab", "--time", "harbor"])],
    ["find -printf with %T", () => run("find", ["harbor", "-printf", "%s\\t%TY-%Tm-%Td\\t%p\\n"])],
  ])("%s is PARSE_PATHS at line 1, at the second tab", async (_, listing) => {
    const text = listing();
    const result = await cli(["-"], { stdin: text });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe("");
    const column = text.indexOf("\t", text.indexOf("\t") + 1) + 1;
    expect(result.stderr).toMatch(
      new RegExp(`^espalier: <stdin>:1:${column}: .*cut -f1,3.*\\[PARSE_PATHS\\]\\n$`),
    );
  });

  it("read with the date cut out (cut -f1,3), gives du -sb's size", async () => {
    const text = run("cut", ["-f1,3"], run("du", ["-ab", "--time", "harbor"]));
    const doc = JSON.parse((await cli(["-", "--format", "json"], { stdin: text })).stdout);
    expect(doc.totals.size).toBe(Number(run("du", ["-sb", "harbor"]).split("\t")[0]));
  });

  it("find -printf with %y after the path is PARSE_PATHS too: each folder would be two nodes", async () => {
    const text = run("find", ["harbor", "-printf", "%s\\t%p\\t%y\\n"]);
    const result = await cli(["-"], { stdin: text });
    expect(result.code).toBe(2);
    const column = text.indexOf("\t", text.indexOf("\t") + 1) + 1;
    expect(result.stderr).toMatch(new RegExp(`^espalier: <stdin>:1:${column}: .*\\[PARSE_PATHS\\]\\n$`));
  });

  it("a tab inside a name is read as part of it with --input-format paths", async () => {
    const args = ["-", "--format", "json", "--input-format", "paths"];
    const doc = JSON.parse((await cli(args, { stdin: "5\tharbor/tide\tlog\n" })).stdout);
    expect(doc.totals.size).toBe(5);
    expect(doc.root.children.map((c: { name: string }) => c.name)).toEqual(["tide\tlog"]);
  });
});
