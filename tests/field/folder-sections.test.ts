import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

// Field tests: `ls -R` and `ls -lR` (GNU coreutils, run here) print each folder as its path and ":",
// then its entries by name. The first line reads as YAML (`harbor:`), so the listing failed as
// invalid YAML ("Implicit map keys need to be followed by map values"), a message that names neither
// the shape nor what to list instead.
const gnuLs = isGnuTool("ls");
let base = "";
const ls = (args: string[]) => execFileSync("ls", args, { cwd: base, encoding: "utf8" });

beforeAll(() => {
  if (!gnuLs) return;
  base = mkdtempSync(join(tmpdir(), "espalier-ls-"));
  writeFiles(join(base, "harbor"), { "ledger/a.csv": 12, "notes.txt": 3 });
});

afterAll(() => {
  if (base) rmSync(base, { recursive: true, force: true });
});

describe.skipIf(!gnuLs)("a listing in folder sections (ls -R, ls -lR)", () => {
  it.each([["-R"], ["-lR"]])("ls %s is PARSE_PATHS at its second line, naming find", async (flags) => {
    const listing = ls([flags, "harbor"]);
    expect(listing.split("\n")[0]).toBe("harbor:");
    const result = await cli(["-"], { stdin: listing });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe("");
    expect(result.stderr).toMatch(/^espalier: <stdin>:2:1: .*find DIR -printf .*\[PARSE_PATHS\]\n$/);
  });

  it("is left to the YAML reader when the name or --input-format says YAML", async () => {
    const listing = ls(["-R", "harbor"]);
    const named = await cli(["listing.yaml"], { files: { "listing.yaml": listing } });
    expect(named.stderr).toContain("[PARSE_YAML]");
    const asked = await cli(["-", "--input-format", "yaml"], { stdin: listing });
    expect(asked.stderr).toContain("[PARSE_YAML]");
  });
});

describe("YAML whose first key holds nothing", () => {
  it("still reads, and a stray line after it is still PARSE_YAML when it is key: value", async () => {
    expect((await cli(["-", "--budget", "5"], { stdin: "harbor:\n  ledger: 1\n" })).code).toBe(0);
    expect((await cli(["-", "--budget", "5"], { stdin: "harbor:\nledger: 1\n" })).code).toBe(0);
    const stray = await cli(["-"], { stdin: "harbor:\n  - a\nb: [\n" });
    expect(stray.stderr).toContain("[PARSE_YAML]");
  });
});
