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
      /^espalier: <stdin>:4:1: line 4 writes the path "harbor\/caf\uFFFD\.txt" in other bytes than line 3 does: bytes that are not UTF-8 are read as U\+FFFD.*iconv -f LATIN1 -t UTF-8.*\[DUPLICATE_PATH\]\n$/,
    );
  });

  it("a plain repeated path says nothing of U+FFFD", async () => {
    const result = await cli(["-"], { stdin: "1\tharbor/a.txt\n2\tharbor/a.txt\n" });
    expect(result.stderr).toMatch(
      /^espalier: <stdin>:2:1: line 2 repeats the path "harbor\/a\.txt" of line 1 \[DUPLICATE_PATH\]\n$/,
    );
  });
});

// `find DIR -type f -printf '%s\t%p\n'` (files only, no folder lines) or `git ls-files` over two folders
// with Latin-1 names that differ in bytes that are not UTF-8: "\xe9t\xe9" and "\xe8t\xe8" (ISO/IEC 8859-1:
// 0xE9 e-acute, 0xE8 e-grave). In UTF-8 (RFC 3629 section 4) 0xE9 and 0xE8 lead a three-byte sequence and
// "t" (0x74) is no continuation byte, so the WHATWG UTF-8 decoder (Encoding Standard, section 4.1)
// reads each as one U+FFFD: both folders read as "\uFFFDt\uFFFD". They were made one folder with
// both files in it, exit 0, one node short.
describe("folders named in bytes that are not UTF-8, met only on the way to their files", () => {
  const latin1 = (text: string) => Buffer.from(text, "latin1");
  const listing = latin1("3\tharbor/\xe9t\xe9/log.txt\n5\tharbor/\xe8t\xe8/tide.txt\n");

  it("is DUPLICATE_PATH at the second line, naming the first, not one folder holding both files", async () => {
    for (const args of [["-"], ["-", "--format", "json"], ["-", "--input-format", "paths"]]) {
      const result = await cli(args, { stdin: listing });
      expect(result.stdout).toBe("");
      expect(result.code).toBe(2);
      expect(result.stderr).toMatch(
        /^espalier: <stdin>:2:1: line 2 writes the path "harbor\/\uFFFDt\uFFFD" in other bytes than line 1 does: .*iconv -f LATIN1 -t UTF-8.*\[DUPLICATE_PATH\]\n$/,
      );
    }
  });

  it("the same in a list ended by NUL, a Windows listing and under --pseudonymize (no name printed)", async () => {
    const nul = await cli(["-", "--nul-separated"], {
      stdin: latin1("3\tharbor/\xe9t\xe9/log.txt\x005\tharbor/\xe8t\xe8/tide.txt\x00"),
    });
    expect(nul.code).toBe(2);
    expect(nul.stderr).toMatch(/:2:1: line 2 writes the path .*\[DUPLICATE_PATH\]\n$/);
    const windows = await cli(["-"], {
      stdin: latin1("C:\\harbor\\\xe9t\xe9\\log.txt\r\nC:\\harbor\\\xe8t\xe8\\tide.txt\r\n"),
    });
    expect(windows.code).toBe(2);
    expect(windows.stderr).toMatch(
      /:2:1: line 2 writes the path "C:\/harbor\/\uFFFDt\uFFFD" .*\[DUPLICATE_PATH\]\n$/,
    );
    const hidden = await cli(["-", "--pseudonymize"], {
      stdin: listing,
      env: { ESPALIER_PSEUDONYM_KEY: "k" },
    });
    expect(hidden.code).toBe(2);
    expect(hidden.stderr).not.toMatch(/harbor|\uFFFD/);
  });

  it("reads each folder once when both lines write it in the same bytes, and both once converted to UTF-8", async () => {
    const same = await cli(["-", "--format", "json"], {
      stdin: latin1("3\tharbor/\xe9t\xe9/log.txt\n5\tharbor/\xe9t\xe9/tide.txt\n"),
    });
    expect(same.code).toBe(0);
    // harbor, one folder, two files: 4 nodes.
    expect(JSON.parse(same.stdout).totals).toEqual({ nodes: 4, size: 8 });
    // As iconv -f LATIN1 -t UTF-8 would give it: two folders, "été" and "ètè", 5 nodes.
    const converted = await cli(["-", "--format", "json"], { stdin: listing.toString("latin1") });
    expect(converted.code).toBe(0);
    const summary = JSON.parse(converted.stdout);
    expect(summary.totals).toEqual({ nodes: 5, size: 8 });
    expect(summary.root.children.map((c: { name: string }) => c.name)).toEqual([
      "\u00e9t\u00e9",
      "\u00e8t\u00e8",
    ]);
  });
});
