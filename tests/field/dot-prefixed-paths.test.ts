import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

const gnuFind = isGnuTool("find");

// Field test: one folder listed with and without a leading ./ in one list (GNU find's -printf %p keeps
// the starting point `.`, %P leaves it out: findutils manual, "-printf"), as `find .` joined with
// `git ls-files` gives, of an invented ferry operator's folder. Read as written, `.` was one top-level
// folder beside its own entries, and a file listed both ways two files: the size counted twice, exit 0.
describe("a path list naming one folder with and without ./", () => {
  it("is PARSE_PATHS at the first line without ./, naming the name listed both ways", async () => {
    const r = await cli(["-"], { stdin: "120\t./timetables/winter.csv\n80\ttimetables/summer.csv\n" });
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(
      /^espalier: <stdin>:2:1: line 2 names "timetables" .*line 1 names "\.\/timetables".*sed 's\|\\t\\\.\/\|\\t\|' LIST.*\[PARSE_PATHS\]\n$/,
    );
  });

  it("is PARSE_PATHS when no name is in both (each would show beside the folder that holds it)", async () => {
    const r = await cli(["-"], { stdin: "./timetables/winter.csv\nfares.json\n" });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(
      /:2:1: line 2 names "fares\.json" without a leading \.\/ .*sed 's\|\^\\\.\/\|\|' LIST.*\[PARSE_PATHS\]\n$/,
    );
  });

  it("reads a list all with ./, all without, and a lone . line beside relative paths", async () => {
    for (const stdin of ["./a/b\n./c\n", "a/b\nc\n", ".\nfares.json\nroutes.json\n"])
      expect((await cli(["-", "--bare"], { stdin })).code, stdin).toBe(0);
  });

  it.skipIf(!gnuFind)(
    "the machine's find %p and %P of one folder, joined, are refused; with the sed it names, DUPLICATE_PATH; one way, read at du's size",
    async () => {
      const base = mkdtempSync(join(tmpdir(), "espalier-dot-"));
      try {
        writeFiles(base, { "timetables/winter.csv": 1200, "timetables/summer.csv": 900, "fares.json": 310 });
        const find = (format: string) =>
          execFileSync("find", [".", "-type", "f", "-printf", format], { cwd: base, encoding: "utf8" });
        const winter = find("%s\t%p\n")
          .split("\n")
          .filter((l) => l.includes("winter"))
          .join("\n");
        const joined = `${winter}\n${find("%s\t%P\n")}`;
        const r = await cli(["-"], { stdin: joined });
        expect(r.code).toBe(2);
        expect(r.stderr).toMatch(/\[PARSE_PATHS\]\n$/);
        // Read one way (%P alone): the three files' bytes, as du -sb --apparent-size of the files says.
        // Source: GNU du -b (apparent size in bytes).
        const du = execFileSync("sh", ["-c", "du -cb timetables/*.csv fares.json | tail -n 1"], {
          cwd: base,
          encoding: "utf8",
        });
        const read = JSON.parse((await cli(["-", "--format", "json"], { stdin: find("%s\t%P\n") })).stdout);
        expect(read.totals.size).toBe(Number(du.split("\t")[0]));
        const stripped = execFileSync("sed", [/sed '([^']*)'/.exec(r.stderr)?.[1] ?? ""], {
          input: joined,
          encoding: "utf8",
        });
        const again = await cli(["-"], { stdin: stripped });
        expect(again.stderr).toMatch(/repeats the path "timetables\/winter\.csv".*\[DUPLICATE_PATH\]\n$/);
      } finally {
        rmSync(base, { recursive: true, force: true });
      }
    },
  );
});
