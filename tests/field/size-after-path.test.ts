import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

const gnu = isGnuTool("find") && isGnuTool("du") && isGnuTool("stat");

// Field test: the size after the path, as find -printf '%p %s\n' and stat -c '%n %s' print it
// (findutils manual, "-printf"; GNU coreutils stat). Read as an unsized path list, each size was the
// end of a name ("winter.csv 1200") and no size read, exit 0. An invented ferry operator's folder.
let base = "";
beforeAll(() => {
  if (!gnu) return;
  base = mkdtempSync(join(tmpdir(), "espalier-size-last-"));
  writeFiles(join(base, "ferry"), {
    "timetables/winter.csv": 1200,
    "timetables/summer.csv": 900,
    "fares.json": 310,
  });
});
afterAll(() => {
  if (base) rmSync(base, { recursive: true, force: true });
});

const sh = (script: string) => execFileSync("sh", ["-c", script], { cwd: base, encoding: "utf8" });

describe("a path list with the size after the path", () => {
  it
    .skipIf(!gnu)
    .each([["find ferry -printf '%p %s\\n'"], ["stat -c '%n %s' ferry/timetables/* ferry/fares.json"]])(
    "%s is PARSE_PATHS naming the size first; the awk it names reads it at du -sb's size",
    async (script) => {
      const listing = sh(script);
      const r = await cli(["-"], { stdin: listing });
      expect(r.code).toBe(2);
      expect(r.stdout).toBe("");
      expect(r.stderr).toMatch(
        /^espalier: <stdin>:1:1: every line ends in a space and a number.*\[PARSE_PATHS\]\n$/,
      );
      const awk = /or (awk '[^']*') LIST/.exec(r.stderr)?.[1] ?? "";
      expect(awk).not.toBe("");
      const swapped = execFileSync("sh", ["-c", awk], { input: listing, encoding: "utf8" });
      const read = JSON.parse((await cli(["-", "--format", "json"], { stdin: swapped })).stdout);
      // Source: GNU du -b (apparent bytes) of the same entries.
      const entries = script.startsWith("find") ? "ferry" : "ferry/timetables/* ferry/fares.json";
      expect(read.totals.size).toBe(Number(sh(`du -cb ${entries} | tail -n 1`).split("\t")[0]));
    },
  );

  it.skipIf(!gnu)("find -printf '%p\\t%s\\n' is BAD_SIZE naming the size first", async () => {
    const r = await cli(["-"], { stdin: sh("find ferry -printf '%p\\t%s\\n'") });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(
      /:1:1: .*got "ferry"; the line is a path, a tab and a number.*awk -F'\\t'.*\[BAD_SIZE\]\n$/,
    );
  });

  it("reads two names ending in a number, and --input-format paths reads every line as a path", async () => {
    expect((await cli(["-", "--bare"], { stdin: "scans/scan 1\nscans/scan 2\n" })).code).toBe(0);
    const asked = await cli(["-", "--input-format", "paths", "--format", "json"], {
      stdin: "docs/a.md 120\ndocs/b.md 30\ndocs/c.md 7\n",
    });
    expect(JSON.parse(asked.stdout).totals.nodes).toBe(4);
  });
});
