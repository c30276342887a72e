import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

// Field tests: the output of commands that align columns with runs of spaces (GNU df -B1, sha256sum;
// run here) was read as a path list, each whole line one path, a mount point's or a file's "/"s
// splitting it and every number in the names, exit 0.
const gnuTools = isGnuTool("df") && isGnuTool("sha256sum");

describe.skipIf(!gnuTools)("columns aligned with spaces (df -B1, sha256sum)", () => {
  it("df -B1 and sha256sum of a few files are PARSE_PATHS at line 1", async () => {
    const base = mkdtempSync(join(tmpdir(), "espalier-spaced-"));
    try {
      writeFiles(base, { "tide/log.txt": 12, "quay/berths.csv": 310 });
      const sums = execFileSync("sha256sum", ["tide/log.txt", "quay/berths.csv"], {
        cwd: base,
        encoding: "utf8",
      });
      for (const text of [execFileSync("df", ["-B1"], { encoding: "utf8" }), sums]) {
        const r = await cli(["-"], { stdin: text });
        expect(r.code).toBe(2);
        expect(r.stdout).toBe("");
        expect(r.stderr).toMatch(
          /^espalier: <stdin>:1:1: every line holds two or more spaces .*\[PARSE_PATHS\]\n$/,
        );
      }
    } finally {
      rmSync(base, { recursive: true, force: true });
    }
  });
});

describe("names with spaces in a path list", () => {
  it("are read when some line holds no two spaces in a row, and with --input-format paths", async () => {
    const some = "tide  charts/neap.svg\ntide  charts/spring.svg\nquay/berths.csv\n";
    const r = await cli(["-", "--format", "json"], { stdin: some });
    expect(r.code).toBe(0);
    // (stdin), "tide  charts", its two files, quay, berths.csv.
    expect(JSON.parse(r.stdout).totals.nodes).toBe(6);
    const every = "tide  charts/neap.svg\ntide  charts/spring.svg\n";
    expect((await cli(["-"], { stdin: every })).code).toBe(2);
    const asked = await cli(["-", "--input-format", "paths", "--format", "json"], { stdin: every });
    expect(JSON.parse(asked.stdout).totals.nodes).toBe(3);
  });
});
