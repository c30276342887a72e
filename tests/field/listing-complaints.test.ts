import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

const gnu = isGnuTool("find") && isGnuTool("du");

// Field test: a listing saved with its command's standard error (2>&1), as GNU find and du write a
// folder they cannot read or find: `find: ‘missing’: No such file or directory`, `du: cannot access
// 'missing': No such file or directory` (seen here). Unsized, the message was read as a path: a
// top-level entry "find: ‘missing’: No such file or directory", exit 0. An invented ferry folder.
let base = "";
beforeAll(() => {
  if (!gnu) return;
  base = mkdtempSync(join(tmpdir(), "espalier-complaints-"));
  writeFiles(join(base, "ferry"), { "timetables/winter.csv": 1200, "fares.json": 310 });
});
afterAll(() => {
  if (base) rmSync(base, { recursive: true, force: true });
});

/** What `sh -c SCRIPT` prints on both streams, whatever its exit status. */
function both(script: string): string {
  try {
    return execFileSync("sh", ["-c", `${script} 2>&1`], { cwd: base, encoding: "utf8" });
  } catch (error) {
    return (error as { stdout: string }).stdout;
  }
}

describe("a listing holding its command's messages to standard error", () => {
  it.skipIf(!gnu).each([
    ["find ferry missing", "find"],
    ["find /srv-missing ferry", "find"],
    ["find ferry missing -printf '%s\\t%p\\n'", "find"],
    ["du -ab ferry missing", "du"],
    ["du -ab missing ferry", "du"],
  ])("%s 2>&1 is PARSE_PATHS at the message's line naming %s", async (script, command) => {
    const listing = both(script);
    const line = listing.split("\n").findIndex((l) => l.startsWith(`${command}: `)) + 1;
    expect(line).toBeGreaterThan(0);
    const r = await cli(["-"], { stdin: listing });
    expect(r.code, listing).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(
      new RegExp(
        `^espalier: <stdin>:${line}:1: line ${line} is a message ${command} wrote to standard error .*No such file or directory.*2>/dev/null.*\\[PARSE_PATHS\\]\\n$`,
      ),
    );
  });

  it("reads a folder whose name only starts with a command's name", async () => {
    const r = await cli(["-", "--bare"], { stdin: "find-us/map.svg\nfind: the guide/a.txt\nfinder/b\n" });
    expect(r.code).toBe(0);
  });
});
