import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { errorCodes } from "../../src/errors.js";
import { runBin } from "../helpers/bin.js";
import { oneErrorLine } from "./error-line.js";

// The one error contract, end to end through bin/espalier.js: every failure is one line
// `espalier: [FILE:LINE:COL: ]message [CODE]`, 1-based line and column (UTF-16 units of the decoded
// text, as an editor counts), a code from the closed list, never INTERNAL, never a position twice.
// Each expected position is counted by hand on the input beside it (RFC 4180 §2 for the CSV layout:
// records end at a line break, fields are split by the delimiter, a quoted field may hold line breaks).

const dir = mkdtempSync(join(tmpdir(), "espalier-contract-"));
function file(name: string, text: string): string {
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
}

async function errorOf(args: string[], stdin?: string) {
  const r = await runBin(args, stdin === undefined ? {} : { stdin });
  const e = oneErrorLine({ code: r.code ?? -1, stdout: r.stdout, stderr: r.stderr });
  expect(errorCodes as readonly string[], r.stderr).toContain(e.code);
  return { ...e, text: r.stderr };
}

describe("the launcher under test", () => {
  it("runs away from the tests' working directory, so no .espalier.yaml there is read", async () => {
    // A path that exists relative to the repository's root is not found: the run is elsewhere.
    const r = await errorOf(["fixtures/tidewater-files.paths"]);
    expect(r).toMatchObject({ code: "IO", file: "fixtures/tidewater-files.paths" });
  });
});

describe("espalier FILE: one error line with the file, line and column of the fault", () => {
  it("a CSV row's fault is at its cell: bad size, missing parent, duplicate id, empty id, cycle", async () => {
    const cases: [string, string, number, number][] = [
      // [table, code, line, column]
      ["id,parent,size\nr,,1\na,r,x\n", "BAD_SIZE", 3, 5],
      ["id,parent,size\nr,,1\na,q,2\n", "MISSING_PARENT", 3, 3],
      ["id,parent,size\nr,,1\na,r,2\na,r,3\n", "DUPLICATE_ID", 4, 1],
      ["id,parent,size\nr,,1\n,r,2\n", "SHAPE", 3, 1],
      ["id,parent\nr,\na,b\nb,a\n", "CYCLE", 3, 1],
      ["size,path\n1,a/b\n2,a/b\n", "DUPLICATE_PATH", 3, 3],
    ];
    for (const [table, code, line, column] of cases) {
      const path = file("t.csv", table);
      expect(await errorOf([path]), table).toMatchObject({ code, file: path, line, column });
    }
  });

  it("a quoted CSV field spanning lines: later faults are on their physical line", async () => {
    // Row 2's name spans lines 3-4; row 3 starts on line 5, its size field ("x\ny", quoted) at column 7.
    const path = file("multi.csv", 'id,parent,size\nr,,1\n"a\nb",r,2\n"c",r,"x\ny"\n');
    expect(await errorOf([path])).toMatchObject({ code: "BAD_SIZE", line: 5, column: 7 });
    // A stray quote inside an unquoted field, after a multi-line record: the quote's own line and column.
    const stray = file("stray.csv", 'id,parent,name\nr,,"Quill\nfeather"\na,r,x"y\n');
    expect(await errorOf([stray])).toMatchObject({ code: "PARSE_CSV", line: 4, column: 6 });
    // A record with a field too many: at that field.
    const ragged = file("ragged.csv", 'id,parent\nr,\n"a\nb",r,3\n');
    expect(await errorOf([ragged])).toMatchObject({ code: "PARSE_CSV", line: 4, column: 6 });
  });

  it("TSV columns count UTF-16 units: two-unit and multi-byte characters before the field", async () => {
    // ä (1 unit), € (1), 😀 (2 units: a surrogate pair), then a tab: the parent cell at 6, size at 8.
    const path = file("u.tsv", "id\tparent\tsize\nr\t\t1\nä€😀\tr\tx\n");
    expect(await errorOf([path])).toMatchObject({ code: "BAD_SIZE", line: 3, column: 8 });
  });

  it("JSON rows, YAML rows and nested JSON: at the row's, cell's or value's line and column", async () => {
    const rows = file("rows.json", '[{"id":"r","parent":null},\n {"id":"a","parent":"q"}]');
    expect(await errorOf([rows])).toMatchObject({ code: "MISSING_PARENT", line: 2, column: 2 });
    // YAML rows: at the cell's value ("zz" after "  parent: "; "x" after "  size: ").
    const yaml = file("rows.yaml", "- id: r\n  parent: null\n- id: a\n  parent: zz\n");
    expect(await errorOf([yaml])).toMatchObject({ code: "MISSING_PARENT", line: 4, column: 11 });
    const size = file("size.yaml", "- id: r\n  parent: null\n- id: a\n  parent: r\n  size: x\n");
    expect(await errorOf([size])).toMatchObject({ code: "BAD_SIZE", line: 5, column: 9 });
    const nested = file("n.json", '{"name":"r","children":[{"name":"a","size":-1}]}');
    expect(await errorOf([nested])).toMatchObject({ code: "BAD_SIZE", line: 1, column: 44 });
  });

  it("a JSON graph, parsed whole, is read again to place an entry's or a row's fault", async () => {
    // The entry's key: line 2, after one blank.
    const map = file("adj.json", '{"a": ["b"],\n "b": {"children": ["c"], "size": -1}}');
    expect(await errorOf([map, "--graph"])).toMatchObject({ code: "BAD_SIZE", line: 2, column: 2 });
    // A key given twice: JSON.parse keeps the last (ECMA-262 JSON.parse), so that is where the fault is;
    // '{"a": ["b"], "b": 1, ' is 21 characters; "é" before it counts one UTF-16 unit.
    const twice = file("twice.json", '{"a": ["é"], "b": 1, "b": {"size": -2}}');
    expect(await errorOf([twice, "--graph"])).toMatchObject({ code: "BAD_SIZE", line: 1, column: 22 });
    // Rows with repeated ids (--graph): at the row's "{", line 2 after two blanks.
    const rows = file("rows.json", '[{"id":"a","parent":""},\n  {"id":"b","parent":"zz"}]');
    expect(await errorOf([rows, "--graph"])).toMatchObject({ code: "MISSING_PARENT", line: 2, column: 3 });
  });

  it("a position is never printed twice, and a row never stands in for a line", async () => {
    for (const table of ["id,parent,size\nr,,1\na,r,x\n", "id,parent\nr,\na,q\n"]) {
      const { text } = await errorOf([file("twice.csv", table)]);
      expect(text).not.toMatch(/row \d+: row \d+/);
      expect(text).toMatch(/^espalier: [^:]+:\d+:\d+: /);
    }
  });

  it("from standard input (not read again) a table row's fault names its line", async () => {
    const e = await errorOf(["-", "--input-format", "csv"], 'id,parent\nr,\n"a\nb",r\nc,q\n');
    expect(e).toMatchObject({ code: "MISSING_PARENT", file: "<stdin>", line: 5 });
    // The parent cell's column is not known without the bytes ...
    expect(e.column).toBeUndefined();
    // ... but a fault in the row's first field is at column 1: that field starts the row's line.
    const dup = await errorOf(["-", "--input-format", "csv"], 'id,parent\nr,\n"a\nb",r\n"a\nb",r\n');
    expect(dup).toMatchObject({ code: "DUPLICATE_ID", file: "<stdin>", line: 5, column: 1 });
  });

  it("path lists, foci files and usage errors keep the same one-line form", async () => {
    // A path list's entry is its whole line: column 1.
    const twice = file("twice.txt", "a/b\na/c\na/b\n");
    expect(await errorOf([twice, "--input-format", "paths"])).toMatchObject({
      code: "DUPLICATE_PATH",
      file: twice,
      line: 3,
      column: 1,
    });
    const list = file("list.txt", "a/b\na/c\n");
    expect((await errorOf([list, "--budgt", "3"])).code).toBe("USAGE");
    // A --focus-from line that matches nothing: at that line of the foci file, no second position.
    const foci = file("foci.txt", "a/b\na/zz\n");
    const e = await errorOf([list, "--input-format", "paths", "--focus-from", foci]);
    expect(e).toMatchObject({ code: "FOCUS_NO_MATCH", file: foci, line: 2, column: 1 });
    expect(e.text).not.toContain("line 2");
    // A config file that is no YAML: the parser's own "at line N, column M" is not repeated.
    const config = file("bad.yaml", "budget: [1\n");
    const c = await errorOf([list, "--config", config]);
    expect(c).toMatchObject({ code: "USAGE", file: config, line: 2, column: 1 });
    expect(c.text).not.toMatch(/at line \d/);
  });
});
