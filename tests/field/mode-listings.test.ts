import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, symlinkSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

const gnuTar = isGnuTool("tar");

/** Whether `cmd args…` runs on this machine (busybox, bsdtar: not always installed). */
function runs(cmd: string, args: string[]): boolean {
  try {
    execFileSync(cmd, args, { stdio: "ignore" });
    return true;
  } catch {
    return false;
  }
}

// Field test: `ls -l` of a folder and `tar tv` of an archive piped in (invented names here). Each line
// starts with a file's mode, then owner, size, date and name (POSIX ls -l; from memory): read as a
// path list, every whole line became a path split at its "/"s, sizes and dates in the names, exit 0.
const ls = [
  "total 12",
  "drwxr-xr-x 3 quill quill 4096 Dec  3 22:55 ledger",
  "-rw-r--r-- 1 quill quill  310 Dec  3 22:55 README.md",
  "lrwxrwxrwx 1 quill quill    6 Dec  3 22:55 docs -> ledger",
  "",
].join("\n");
const tar = [
  "drwxr-xr-x quill/quill       0 2026-12-03 22:55 tide/",
  "-rw-r--r-- quill/quill     310 2026-12-03 22:55 tide/README.md",
  "",
].join("\n");

describe("a listing whose lines start with file modes (ls -l, tar tv)", () => {
  it("is PARSE_PATHS at its first line, naming find -printf (and bsdtar's awk: ls -l's layout)", async () => {
    const r = await cli(["-"], { stdin: ls });
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(
      /^espalier: <stdin>:1:1: every line starts with a file's mode .*bsdtar tvf FILE \| awk '.*' \| espalier -.*find DIR -printf.*\[PARSE_PATHS\]\n$/,
    );
    // A date in another layout (ls -l --time-style=long-iso): no awk, find and tar tf named.
    const iso = ls.replaceAll("Dec  3 22:55", "2026-12-03 22:55");
    expect((await cli(["-"], { stdin: iso })).stderr).toMatch(/find DIR -printf.*tar tf.*\[PARSE_PATHS\]\n$/);
  });

  it("tar tv's lines are PARSE_PATHS naming an awk that keeps each size and name", async () => {
    const r = await cli(["-"], { stdin: tar });
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(
      /^espalier: <stdin>:1:1: .*tar tvf FILE \| awk '.*' \| espalier -.*\[PARSE_PATHS\]\n$/,
    );
  });

  // Each archiver's own tv listing, read by the awk its message names (GNU tar 1.34, busybox 1.35 and
  // bsdtar 3.6.2 seen here: busybox lays its columns out as GNU tar, bsdtar as ls -l).
  for (const [tool, cmd, pre, present] of [
    ["GNU tar", "tar", [], gnuTar],
    ["busybox tar", "busybox", ["tar"], runs("busybox", ["tar", "--help"])],
    ["bsdtar", "bsdtar", [], runs("bsdtar", ["--version"])],
  ] as const)
    it.skipIf(!present)(
      `the awk the message names reads ${tool}'s own tv listing: sizes of the files written`,
      async () => {
        const base = mkdtempSync(join(tmpdir(), "espalier-tar-"));
        try {
          // Source: a tv listing prints each member's size in bytes (0 for folders and links); the files'
          // sizes are those written, 310 + 4,097 + 12 bytes.
          writeFiles(join(base, "tide"), {
            "README.md": 310,
            "charts/neap.svg": 4097,
            "charts/log 1.txt": 12,
          });
          symlinkSync("README.md", join(base, "tide", "readme-link"));
          execFileSync("tar", ["-cf", "tide.tar", "tide"], { cwd: base });
          const listing = execFileSync(cmd, [...pre, "-tvf", "tide.tar"], { cwd: base, encoding: "utf8" });
          const told = (await cli(["-"], { stdin: listing })).stderr;
          const awk = /\| awk '(.*)' \| espalier -/.exec(told)?.[1];
          expect(awk).toBeDefined();
          const paths = execFileSync("awk", [awk!], { input: listing, encoding: "utf8" });
          const doc = JSON.parse((await cli(["-", "--format", "json"], { stdin: paths })).stdout);
          // tide, charts, the three files and the link (named without its target).
          expect(doc.totals).toEqual({ nodes: 6, size: 310 + 4097 + 12 });
          expect(doc.root.children.map((c: { name: string }) => c.name).sort()).toEqual([
            "README.md",
            "charts",
            "readme-link",
          ]);
        } finally {
          rmSync(base, { recursive: true, force: true });
        }
      },
    );

  it("reads such lines as paths when asked, and a list where only some lines look so", async () => {
    const asked = await cli(["-", "--input-format", "paths", "--bare"], { stdin: tar });
    expect(asked.code).toBe(0);
    const some = await cli(["-", "--bare"], { stdin: "-rw-r--r-- notes\nsrc/a\n" });
    expect(some.code).toBe(0);
    expect(some.stdout).toBe(". (stdin)  4 nodes\n  . -rw-r--r-- notes\n  . src / a  2 nodes\n");
  });
});
