import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

// Field tests: one path list made of two listings, one from an absolute start (find /tmp/…/orchard) and
// one from a relative one (cd …; find cellar), as two runs appended to one file give it. Read as it is,
// "/" and "cellar" were two trees side by side with no word, exit 0. The line counts are checked
// against wc -l of each listing (GNU coreutils).
const gnu = isGnuTool("find") && isGnuTool("wc");

let base = "";
beforeAll(() => {
  if (!gnu) return;
  base = mkdtempSync(join(tmpdir(), "espalier-mixed-starts-"));
  // An invented cider farm: an orchard's records and a cellar's.
  writeFiles(base, {
    "orchard/rows/north.csv": 300,
    "orchard/rows/south.csv": 420,
    "orchard/ledger.txt": 90,
    "cellar/casks/c1.log": 75,
    "cellar/casks/c2.log": 60,
  });
});
afterAll(() => {
  if (base) rmSync(base, { recursive: true, force: true });
});

function sh(script: string): string {
  return execFileSync("sh", ["-c", script], { cwd: base, encoding: "utf8" });
}

describe("a path list with absolute and relative paths", () => {
  it.skipIf(!gnu)("is read with an ABSOLUTE_AND_RELATIVE note counting each kind's lines", async () => {
    const absolute = sh(`find "${base}/orchard" -printf '%s\\t%p\\n'`);
    const relative = sh("find cellar -printf '%s\\t%p\\n'");
    const r = await cli(["-", "--format", "json"], { stdin: absolute + relative });
    expect(r.code).toBe(0);
    const notes = JSON.parse(r.stdout).input.notes;
    expect(notes).toEqual([expect.objectContaining({ code: "ABSOLUTE_AND_RELATIVE", line: 1 })]);
    const a = Number(sh(`find "${base}/orchard" -printf '%s\\t%p\\n' | wc -l`));
    const b = Number(sh("find cellar -printf '%s\\t%p\\n' | wc -l"));
    expect(notes[0].message).toMatch(
      new RegExp(
        `^${a} lines give an absolute path \\(the first: line 1\\) and ${b} lines a relative one \\(the first: line ${a + 1}\\)`,
      ),
    );
    expect(r.stderr).toMatch(/find \/DIR.*\[ABSOLUTE_AND_RELATIVE\]\n$/);
    const text = await cli(["-"], { stdin: relative + absolute });
    expect(text.stdout.split("\n")[0]).toContain("absolute and relative paths read as two trees");
  });

  it.skipIf(!gnu)("from one start, absolute or relative, has no note", async () => {
    for (const listing of [
      sh(`find "${base}/orchard" "${base}/cellar" -printf '%s\\t%p\\n'`),
      sh("find orchard cellar -printf '%s\\t%p\\n'"),
      sh("find . -printf '%s\\t%p\\n'"),
      sh("find . -printf '%s\\t%P\\n'"),
    ]) {
      const r = await cli(["-", "--format", "json"], { stdin: listing });
      expect(r.code).toBe(0);
      expect(JSON.parse(r.stdout).input.notes).toBeUndefined();
    }
  });

  it.skipIf(!gnu)("a CSV path column or JSON rows with both kinds have the note, counting rows", async () => {
    // A sheet of the farm's files: its path column from two listings (grep -c counts each kind's rows).
    const sheet = `path,size\n${sh(`find "${base}/orchard" -type f -printf '%p,%s\\n'`)}${sh("find cellar -type f -printf '%p,%s\\n'")}`;
    const absolute = Number(sh(`printf '%s' '${sheet}' | grep -c '^/'`));
    const relative = Number(sh(`printf '%s' '${sheet}' | grep -c '^[^/].*,[0-9]*$'`));
    const r = await cli(["-", "--format", "json"], { stdin: sheet });
    expect(r.code).toBe(0);
    const notes = JSON.parse(r.stdout).input.notes;
    expect(notes).toEqual([expect.objectContaining({ code: "ABSOLUTE_AND_RELATIVE", line: 2 })]);
    expect(notes[0].message).toMatch(
      new RegExp(
        `^${absolute} rows give an absolute path \\(the first: row 1\\) and ${relative} rows a relative one`,
      ),
    );
    const rows = JSON.stringify([
      { path: "/srv/orchard/ledger.txt", size: 90 },
      { path: "cellar/casks/c1.log", size: 75 },
    ]);
    const json = await cli(["-", "--format", "json"], { stdin: rows });
    expect(JSON.parse(json.stdout).input.notes).toEqual([
      expect.objectContaining({ code: "ABSOLUTE_AND_RELATIVE" }),
    ]);
  });

  it("an unsized list has the note too, and the made-absolute list none", async () => {
    const list = "/srv/orchard/rows/north.csv\ncellar/casks/c1.log\n";
    const r = await cli(["-", "--format", "json"], { stdin: list });
    expect(JSON.parse(r.stdout).input.notes).toEqual([
      expect.objectContaining({ code: "ABSOLUTE_AND_RELATIVE", line: 1 }),
    ]);
    const fixed = await cli(["-", "--format", "json"], { stdin: list.replace("\ncellar", "\n/srv/cellar") });
    const read = JSON.parse(fixed.stdout);
    expect(read.input.notes).toBeUndefined();
    expect(read.totals.nodes).toBe(8);
  });
});
