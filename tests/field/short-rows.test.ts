import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field tests: a release table shaped as /usr/share/distro-info/debian.csv is written (its later
// columns left out where a release has no such date yet: 15 of its 22 rows are short), reduced to
// invented tidewater releases. RFC 4180, section 2.4: "Each line should contain the same number of
// fields throughout the file". espalier refuses a short row by default and names it; `--short-rows fill`
// reads the missing last fields as empty, which is what such a file means.
const releases = [
  "version,codename,series,created,release,eol,eol-lts",
  "1.0,Slack,slack,2029-01-10,2029-06-01,2031-06-01,2033-06-01",
  "2.0,Flood,flood,2029-06-01,2030-06-01,2032-06-01",
  '3.0,"Neap, late",neap,2030-06-01',
  ",Ebb,ebb,2028-12-01",
  "",
].join("\n");

/** The release table read as CSV linked by its series column, short rows filled. */
const FILLED = ["--input-format", "csv", "--path-field", "series", "--short-rows", "fill"];

async function run(args: string[], stdin = releases) {
  return cli(["-", ...FILLED.slice(0, 4), ...args], { stdin });
}

describe("a CSV table with rows shorter than the header", () => {
  it("is PARSE_CSV naming the row, its field count, the header's and the option that reads it", async () => {
    const result = await run([]);
    expect(result.code).toBe(2);
    // Row 2 (line 3) has 6 fields where the header has 7; the position is where the row ends.
    expect(result.stderr).toMatch(
      /^espalier: <stdin>:3:49: invalid CSV: row 2 has 6 fields where the header has 7 .*--short-rows fill .*\[PARSE_CSV\]\n$/,
    );
  });

  it("with --short-rows fill reads the missing last fields as empty, every row a node", async () => {
    const result = await run(["--short-rows", "fill", "--format", "json", "--label", "{codename} {eol-lts}"]);
    expect(result.stderr).toBe("");
    const json = JSON.parse(result.stdout);
    // 4 data rows (wc -l minus the header and the blank last line) and the root.
    expect(json.totals.nodes).toBe(5);
    const labels = json.root.children.map((c: { name: string; label: string }) => [c.name, c.label]);
    expect(labels).toEqual([
      ["slack", "Slack 2033-06-01"],
      ["flood", "Flood "],
      ["neap", "Neap, late "],
      ["ebb", "Ebb "],
    ]);
  });

  it("with --short-rows fill says how many rows it filled: header, JSON input, and both versions of a diff", async () => {
    // Rows 2, 3 and 4 are short (6, 4 and 4 fields where the header has 7); row 1 is whole.
    const text = await run(["--short-rows", "fill", "--budget", "8"]);
    expect(text.stdout.split("\n")[0]).toMatch(/^summary: 5 nodes; 3 short rows filled; no focus; /);
    const json = JSON.parse((await run(["--short-rows", "fill", "--format", "json"])).stdout);
    expect(json.input.filledRows).toBe(3);
    const whole = releases.split("\n").slice(0, 2).join("\n");
    const none = JSON.parse((await run(["--short-rows", "fill", "--format", "json"], whole)).stdout);
    expect(none.input.filledRows).toBeUndefined();
    const diff = await cli(["diff", "old.csv", "new.csv", ...FILLED], {
      files: { "old.csv": whole, "new.csv": releases },
    });
    expect(diff.code).toBe(0);
    expect(diff.stdout.split("\n")[0]).toContain("; 0 -> 3 short rows filled;");
  });

  it("still refuses a row with more fields than the header, with or without the option", async () => {
    const long = [
      "version,codename,series,created,release,eol,eol-lts",
      "1.0,Slack,slack,2029-01-10,2029-06-01,2031-06-01,2033-06-01",
      "2.0,Flood,flood,2029-06-01,2030-06-01,2032-06-01,",
      ",Ebb,ebb,2028-12-01,,,,2040-01-01",
      "",
    ].join("\n");
    for (const args of [[], ["--short-rows", "fill"]]) {
      const result = await run(args, long);
      expect(result.code).toBe(2);
      expect(result.stderr).toMatch(/row 3 has 8 fields where the header has 7 .*\[PARSE_CSV\]/);
      expect(result.stderr).not.toContain("--short-rows fill reads");
    }
  });

  it("reads the same from a file (bytes held whole) as from standard input (streamed)", async () => {
    const args = [...FILLED, "--format", "json"];
    const fromFile = await cli(["releases.csv", ...args], { files: { "releases.csv": releases } });
    const fromStdin = await run(args.slice(4));
    expect(fromFile.stderr).toBe("");
    expect(JSON.parse(fromFile.stdout).totals).toEqual(JSON.parse(fromStdin.stdout).totals);
  });

  it("--short-rows on an input that is no table is USAGE naming the format read", async () => {
    const result = await cli(["-", "--short-rows", "fill"], { stdin: '{"name": "tidewater"}' });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/--short-rows reads CSV and TSV tables only; this input is read as json/);
    const facts = await cli([
      "fixtures/quillfeather-cost-export.csv",
      "--levels",
      "account,service",
      "--size-field",
      "cost",
      "--short-rows",
      "fill",
    ]);
    expect(facts.code).toBe(2);
    expect(facts.stderr).toMatch(
      /--short-rows reads CSV and TSV tables only; this input is read as fact table/,
    );
  });
});

describe("a semicolon-separated file read as CSV", () => {
  // As spreadsheets save it where the comma is the decimal mark: `;` between fields, `2,5` a number.
  it("says what the file is when its one column is not found", async () => {
    const result = await cli(["-", "--input-format", "csv"], {
      stdin: "id;parent;size\nharbor;;1\nquay;harbor;2\n",
    });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/\[FIELD_MISSING\]/);
    expect(result.stderr).toContain("one column holding 2 semicolons: a semicolon-separated file");
  });

  it("says it too when a decimal comma splits a row", async () => {
    const result = await cli(["-", "--input-format", "csv"], {
      stdin: "id;parent;size\nharbor;;1\nquay;harbor;2,5\n",
    });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(
      /row 2 has 2 fields where the header has 1 .*semicolon-separated file.*\[PARSE_CSV\]/,
    );
  });

  it("leaves a comma-separated table whose names hold semicolons as it is", async () => {
    const result = await cli(["-", "--input-format", "csv", "--format", "json"], {
      stdin: "id,parent,size\nharbor;north,,1\nquay,harbor;north,2\n",
    });
    expect(result.stderr).toBe("");
    expect(JSON.parse(result.stdout).totals).toEqual({ nodes: 2, size: 3 });
  });
});
