import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field tests: an installed package's RECORD file, a CSV of path, hash and size with no header row
// (PEP 376, "RECORD": "a CSV-formatted file ... one line per installed file", from memory; the files
// on this machine are so: ../../../bin/f2py,sha256=...,239), with invented file names and hashes. With no
// extension and no header naming a column, it was read as a path list: each whole row one path, its
// last name "tide.py,sha256=…,2076" and every size lost, with exit 0.
const record = [
  "../../../bin/tidegauge,sha256=q1w2e3r4t5y6u7i8o9p0,239",
  "tidegauge/__init__.py,sha256=a1s2d3f4g5h6j7k8l9z0,2076",
  "tidegauge/reader.py,sha256=z9x8c7v6b5n4m3l2k1j0,11486",
  "tidegauge/py.typed,,",
  "tidegauge-2.1.0.dist-info/RECORD,,",
  "",
].join("\n");

describe("a CSV table without its header row", () => {
  it("is PARSE_PATHS at line 1 saying each line holds as many commas, naming a header and --input-format paths", async () => {
    const result = await cli(["RECORD"], { files: { RECORD: record } });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe("");
    expect(result.stderr).toMatch(
      /^espalier: RECORD:1:1: every line holds 2 commas, as the rows of a CSV table without its header row do: .*--input-format paths \[PARSE_PATHS\]\n$/,
    );
  });

  it("reads with a header row added, sizes summed (239 + 2,076 + 11,486 = 13,801), or as paths when asked", async () => {
    const table = await cli(["RECORD.csv", "--format", "json"], {
      files: { "RECORD.csv": `path,hash,size\n${record}` },
    });
    expect(table.stderr).toBe("");
    const json = JSON.parse(table.stdout);
    expect(json.totals.size).toBe(13_801);
    const paths = await cli(["RECORD", "--input-format", "paths", "--format", "json"], {
      files: { RECORD: record },
    });
    expect(paths.code).toBe(0);
  });

  it("leaves a path list alone whose names hold commas unevenly, and one of two lines", async () => {
    const listing = ["reports/2031,q1.pdf", "reports/summary.pdf", "reports/a,b,c.txt", ""].join("\n");
    const read = await cli(["-", "--format", "json"], { stdin: listing });
    expect(read.stderr).toBe("");
    // The folder (the only top-level name, so the root) and its three files.
    expect(JSON.parse(read.stdout).totals.nodes).toBe(4);
    const two = await cli(["-", "--format", "json"], { stdin: "a,b/c\nd,e/f\n" });
    expect(two.code).toBe(0);
  });
});
