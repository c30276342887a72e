import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

// Field tests: `find /DIR -printf '%s %p %u\n'` and `stat -c '%s %n %U'` (GNU, run here) print a column
// after a path that is split from its size by a space. Read as part of the names, each folder was two
// nodes (`git root` holding the folder's size, `git` its contents) and every name held the owner, exit 0.
// The check for the way out is du -sb (GNU coreutils: the apparent size of the folder and all below).
const gnuTools = isGnuTool("find") && isGnuTool("stat") && isGnuTool("du");
let base = "";
const run = (cmd: string, args: string[]) => execFileSync(cmd, args, { cwd: base, encoding: "utf8" });

beforeAll(() => {
  if (!gnuTools) return;
  base = mkdtempSync(join(tmpdir(), "espalier-space-column-"));
  writeFiles(join(base, "harbor"), {
    "tide charts/neap 01.svg": 1200,
    "tide charts/spring 02.svg": 4097,
    "ledger/berth fees.csv": 310,
    "notes.txt": 12,
  });
});

afterAll(() => {
  if (base) rmSync(base, { recursive: true, force: true });
});

/** The summary of `text` from standard input: exit code, standard error, and the JSON when it read. */
async function read(text: string, args: string[] = []) {
  const r = await cli(["-", "--format", "json", "--budget", "200", ...args], { stdin: text });
  return { code: r.code, stderr: r.stderr, doc: r.code === 0 ? JSON.parse(r.stdout) : undefined };
}

describe.skipIf(!gnuTools)("a listing split by spaces with a column after the path", () => {
  it.each([
    ["find -printf '%s %p %u\\n'", () => run("find", [join(base, "harbor"), "-printf", "%s %p %u\\n"])],
    [
      "find -type f -printf '%s %p %u\\n'",
      () => run("find", [join(base, "harbor"), "-type", "f", "-printf", "%s %p %u\\n"]),
    ],
    ["find -printf '%s %p %y\\n'", () => run("find", [join(base, "harbor"), "-printf", "%s %p %y\\n"])],
    [
      "stat -c '%s %n %U'",
      () =>
        run("stat", [
          "-c",
          "%s %n %U",
          ...run("find", [join(base, "harbor"), "-type", "f"])
            .trim()
            .split("\n"),
        ]),
    ],
  ])("%s is PARSE_PATHS at line 1, nothing on standard output", async (_, listing) => {
    const r = await cli(["-"], { stdin: listing() });
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(/^espalier: <stdin>:1:1: .*\[PARSE_PATHS\]\n$/);
  });

  it("the same listing without the column reads, names with spaces and all, at du -sb's size", async () => {
    const { code, doc } = await read(run("find", [join(base, "harbor"), "-printf", "%s %p\\n"]));
    expect(code).toBe(0);
    expect(doc.totals.size).toBe(Number(run("du", ["-sb", "harbor"]).split("\t")[0]));
  });

  it("--input-format paths reads the word as part of the names, as asked", async () => {
    const text = run("find", [join(base, "harbor"), "-type", "f", "-printf", "%s %p %u\\n"]);
    const { code, doc } = await read(text, ["--input-format", "paths"]);
    expect(code).toBe(0);
    expect(doc.totals.size).toBe(1200 + 4097 + 310 + 12);
  });
});

describe("names with spaces whose last words differ are no column", () => {
  // An invented album folder, as find /srv/tidewater -printf '%s %p\n' would list it: every name holds
  // a space, the last words are the names' own (no repeats, no folder named without its last word).
  const listing = [
    "4096 /srv/tidewater/harbor songs",
    "310 /srv/tidewater/harbor songs/01 Low Tide.flac",
    "420 /srv/tidewater/harbor songs/02 Night Ferry.flac",
    "530 /srv/tidewater/harbor songs/03 Fog Horn.flac",
    "640 /srv/tidewater/harbor songs/04 Pier Lights.flac",
    "",
  ].join("\n");

  it("reads 8 nodes (/, srv, tidewater, the folder, 4 songs) of 5,996 bytes", async () => {
    const { code, stderr, doc } = await read(listing);
    expect(stderr).toBe("");
    expect(code).toBe(0);
    expect(doc.totals).toEqual({ nodes: 8, size: 4096 + 310 + 420 + 530 + 640 });
  });

  it("but the same words repeated on every line are a column (an owner): PARSE_PATHS", async () => {
    const owned = listing.replace(/\.flac/g, ".flac harbormaster").replace("songs\n", "songs harbormaster\n");
    const r = await cli(["-"], { stdin: owned });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^espalier: <stdin>:1:1: .*"harbormaster".*\[PARSE_PATHS\]\n$/);
  });
});
