import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

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
  it("is PARSE_PATHS at its first line, naming find -printf and tar tf", async () => {
    for (const stdin of [ls, tar]) {
      const r = await cli(["-"], { stdin });
      expect(r.code).toBe(2);
      expect(r.stdout).toBe("");
      expect(r.stderr).toMatch(
        /^espalier: <stdin>:1:1: every line starts with a file's mode .*tar tf.*\[PARSE_PATHS\]\n$/,
      );
    }
  });

  it("reads such lines as paths when asked, and a list where only some lines look so", async () => {
    const asked = await cli(["-", "--input-format", "paths", "--bare"], { stdin: tar });
    expect(asked.code).toBe(0);
    const some = await cli(["-", "--bare"], { stdin: "-rw-r--r-- notes\nsrc/a\n" });
    expect(some.code).toBe(0);
    expect(some.stdout).toBe(". (stdin)  4 nodes\n  . -rw-r--r-- notes\n  . src / a  2 nodes\n");
  });
});
