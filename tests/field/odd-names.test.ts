import { Buffer } from "node:buffer";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field tests: `find . -printf '%s\t%P\n'` run here on a folder holding a name with a line break and
// two Latin-1 names that differ in one byte that is not UTF-8 (`caf\xe9.txt`, `caf\xe8.txt`), reduced to
// invented tidewater names. Both were refused, but with messages that did not say why: the line break
// splits an entry over two lines, and the WHATWG decoder reads each bad byte as U+FFFD, so two names
// become one.

describe("find output with names a line-per-entry listing cannot hold", () => {
  it("a name with a line break: the no-size message says so and names --nul-separated", async () => {
    const listing = "4096\t\n4096\tharbor\n12\tharbor/tide\nlog.txt\n7\tharbor/a.txt\n";
    const result = await cli(["-"], { stdin: listing });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(
      /^espalier: <stdin>:4:1: line 4 has no size column before a tab, unlike line 1; if a name holds a line break.*--nul-separated \[PARSE_PATHS\]\n$/,
    );
    // Ended by NUL, the same entries read: the root, harbor, its two files.
    const nul = await cli(["-", "--nul-separated", "--format", "json"], {
      stdin: "4096\t\x004096\tharbor\x0012\tharbor/tide\nlog.txt\x007\tharbor/a.txt\x00",
    });
    expect(nul.stderr).toBe("");
    expect(JSON.parse(nul.stdout).totals).toEqual({ nodes: 4, size: 4096 + 4096 + 12 + 7 });
  });

  it("two names that differ only in bytes that are not UTF-8: DUPLICATE_PATH says U+FFFD and iconv", async () => {
    const listing = Buffer.concat([
      Buffer.from("4096\t\n4096\tharbor\n3\tharbor/caf"),
      Buffer.from([0xe9]),
      Buffer.from(".txt\n2\tharbor/caf"),
      Buffer.from([0xe8]),
      Buffer.from(".txt\n"),
    ]);
    const result = await cli(["-"], { stdin: listing });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(
      /^espalier: <stdin>:4:1: line 4 repeats the path "harbor\/caf\uFFFD\.txt" of line 3; the path holds U\+FFFD.*iconv -f LATIN1 -t UTF-8.*\[DUPLICATE_PATH\]\n$/,
    );
  });

  it("a plain repeated path says nothing of U+FFFD", async () => {
    const result = await cli(["-"], { stdin: "1\tharbor/a.txt\n2\tharbor/a.txt\n" });
    expect(result.stderr).toMatch(
      /^espalier: <stdin>:2:1: line 2 repeats the path "harbor\/a\.txt" of line 1 \[DUPLICATE_PATH\]\n$/,
    );
  });
});
