import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

// Field tests: find -ls (GNU findutils) prints each entry's inode, blocks, mode, links, owner, group,
// size, date and path. It was refused as lines that start with a number and a space, naming
// find -printf '%s %P\n' and wc -c, which it is not; now the message names what it is and the listing
// that reads: find DIR -printf '%s\t%p\n', whose sum is checked against GNU du -sb (apparent bytes).
const gnu = isGnuTool("find") && isGnuTool("du");

let base = "";
beforeAll(() => {
  if (!gnu) return;
  base = mkdtempSync(join(tmpdir(), "espalier-find-ls-"));
  // An invented observatory's night logs.
  writeFiles(base, { "nights/2031-04-01.log": 1300, "nights/2031-04-02.log": 2100, "nights/notes.txt": 77 });
});
afterAll(() => {
  if (base) rmSync(base, { recursive: true, force: true });
});

function sh(script: string): string {
  return execFileSync("sh", ["-c", script], { cwd: base, encoding: "utf8" });
}

describe("a find -ls listing", () => {
  it.skipIf(!gnu)(
    "is PARSE_PATHS naming find -ls and find -printf '%s\\t%p\\n', which reads with du -sb's sum",
    async () => {
      const r = await cli(["-"], { stdin: sh("find nights -ls") });
      expect(r.code).toBe(2);
      expect(r.stdout).toBe("");
      expect(r.stderr).toMatch(
        /^espalier: <stdin>:1:1: every line is as find -ls prints .*find DIR -printf '%s\\t%p\\n'.*\[PARSE_PATHS\]\n$/,
      );
      const read = JSON.parse(
        (await cli(["-", "--format", "json"], { stdin: sh("find nights -printf '%s\\t%p\\n'") })).stdout,
      );
      expect(read.totals.size).toBe(Number(sh("du -sb nights").split("\t")[0]));
    },
  );
});
