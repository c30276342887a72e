import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

const gnuLs = isGnuTool("ls");

// Field tests: `ls -s` (each entry's disk blocks and its name, after `total N`) and `ls -R`, `ls -lR`,
// `ls -sR` (each folder as its path and ":", then its entries) saved to a file with a path list's name
// (.txt), invented names (GNU ls seen here). Read as a path list, each line was one name ("4 berths"),
// `total 12` a name too, exit 0; and a section listing's entries all top-level names, or
// DUPLICATE_PATH where two folders hold one name.
const lsS = ["total 12", "4 berths", "8 ledger.csv", ""].join("\n");
const lsSh = ["total 265M", "   0 quay-link", " 68K tide-gauge", "4.0K README.md", ""].join("\n");
const lsSR = [
  "harbour:",
  "total 8",
  "4 berths",
  "4 README.md",
  "",
  "harbour/berths:",
  "total 4",
  "4 README.md",
  "",
].join("\n");

/** Runs the CLI on `text` saved as `name` in a folder of its own. */
async function onFile(name: string, text: string, args: string[] = []) {
  const dir = mkdtempSync(join(tmpdir(), "espalier-ls-"));
  try {
    writeFileSync(join(dir, name), text);
    return await cli([join(dir, name), ...args]);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

describe("ls -s and ls -R listings detected as path lists", () => {
  it.each([
    ["ls -s", lsS],
    ["ls -sh", lsSh],
  ])("%s is PARSE_PATHS at line 1 naming find -printf and du -ab", async (_, text) => {
    const r = await onFile("berths.txt", text);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(
      /:1:1: the first line is total .*as ls -s prints.*du -ab DIR.*\[PARSE_PATHS\]\n$/,
    );
  });

  it("ls -sR is PARSE_PATHS at line 2 though a name is in two folders (was DUPLICATE_PATH)", async () => {
    const r = await onFile("harbour.txt", lsSR);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/:2:1: the input starts as ls -R .*read as a path list.*\[PARSE_PATHS\]\n$/);
  });

  it("reads lists that only start so: total then paths, a first path ending with a colon", async () => {
    const totalThenPaths = await onFile("a.txt", "total 3\nledger/q1.csv\nledger/q2.csv\n");
    expect(totalThenPaths.code).toBe(0);
    const colonThenPaths = await onFile("b.txt", "notes:\nledger/q1.csv\n");
    expect(colonThenPaths.code).toBe(0);
    const asked = await onFile("c.txt", lsS, ["--input-format", "paths", "--format", "json"]);
    expect(JSON.parse(asked.stdout).totals.nodes).toBe(4);
  });

  it.skipIf(!gnuLs)(
    "the machine's own ls -s, ls -sR, ls -lR and ls -R of a folder are PARSE_PATHS",
    async () => {
      const base = mkdtempSync(join(tmpdir(), "espalier-ls-"));
      try {
        writeFiles(join(base, "harbour"), {
          "README.md": 310,
          "berths/README.md": 12,
          "berths/north.svg": 5000,
        });
        for (const flags of ["-s", "-sR", "-lR", "-R", "-sh"]) {
          const listing = execFileSync("ls", [flags, "harbour"], { cwd: base, encoding: "utf8" });
          const r = await onFile("listing.txt", listing);
          expect(r.code, flags).toBe(2);
          expect(r.stderr, flags).toMatch(/ls -s|ls -R/);
          expect(r.stderr, flags).toMatch(/\[PARSE_PATHS\]\n$/);
        }
      } finally {
        rmSync(base, { recursive: true, force: true });
      }
    },
  );
});
