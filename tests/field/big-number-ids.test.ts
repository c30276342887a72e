import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: JSON rows exported from a database whose ids are 64-bit integers, written as JSON numbers
// (invented rows of a quay registry). Read as doubles, 1000000000000000001 and 1000000000000000002
// are one number, so a row whose parent names no row was linked under another with exit 0, and the
// output printed an id (1000000000000000000) that the input does not hold. RFC 8259 §6: numbers past
// IEEE 754 binary64 precision are not exchanged exactly; 2^53 - 1 = 9007199254740991 is the largest
// integer every such reader keeps (ECMA-262 Number.MAX_SAFE_INTEGER).
const rows = (parent: string) =>
  `[{"id": 1000000000000000001, "parent": null, "name": "harbor"},\n {"id": 1000000000000000300, "parent": ${parent}, "name": "quay"}]\n`;

describe("ids past 2^53 - 1 as JSON or YAML numbers", () => {
  it("JSON rows: SHAPE at the row, naming strings as the way out, never a link read in silence", async () => {
    const r = await cli(["rows.json"], { files: { "rows.json": rows("1000000000000000002") } });
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(
      /^espalier: rows\.json:1:2: the "id" of row 1 is a number past 2\^53 - 1 .*\[SHAPE\]\n$/,
    );
    // Written as strings, every digit is kept: the parent that names no row is MISSING_PARENT.
    const text = rows('"1000000000000000002"').replace(/"id": (\d+)/g, '"id": "$1"');
    const strings = await cli(["rows.json"], { files: { "rows.json": text } });
    expect(strings.code).toBe(2);
    expect(strings.stderr).toMatch(/"1000000000000000002", which no row has as its id \[MISSING_PARENT\]/);
  });

  it("a parent past 2^53 - 1 and a graph's rows are refused the same way; YAML rows keep the digits", async () => {
    const parent = await cli(["rows.json"], {
      files: { "rows.json": '[{"id": "a", "parent": null}, {"id": "b", "parent": 9007199254740993}]' },
    });
    expect(parent.stderr).toMatch(/the "parent" of row 2 is a number past 2\^53 - 1 .*\[SHAPE\]\n$/);
    // YAML rows read an id written as a number as written (yaml-scalar-names.test.ts), every digit
    // kept: the exact id links, one differing in its last digit names no row.
    const yaml = (p: string) =>
      `- {id: 1000000000000000001, parent: null, name: harbor}\n- {id: 7, parent: ${p}}\n`;
    const y = await cli(["rows.yaml", "--bare"], { files: { "rows.yaml": yaml("1000000000000000001") } });
    expect(y.code).toBe(0);
    expect(y.stdout).toBe(". harbor / 7  2 nodes\n");
    const off = await cli(["rows.yaml"], { files: { "rows.yaml": yaml("1000000000000000002") } });
    expect(off.code).toBe(2);
    expect(off.stderr).toMatch(/"1000000000000000002", which no row has as its id \[MISSING_PARENT\]/);
    const graph = await cli(["-", "--graph"], {
      stdin: '[{"id": 1, "parent": null}, {"id": 10000000000000000001, "parent": 1}]',
    });
    expect(graph.code).toBe(2);
    expect(graph.stderr).toMatch(/the "id" of row 2 is a number past 2\^53 - 1 .*\[SHAPE\]\n$/);
  });

  it("ids up to 2^53 - 1, and numbers matching their string spelling, still read", async () => {
    const r = await cli(["-", "--bare"], {
      stdin:
        '[{"id": 9007199254740991, "parent": null, "name": "harbor"}, {"id": 2, "parent": "9007199254740991", "name": "quay"}]',
    });
    expect(r.code).toBe(0);
    expect(r.stdout).toBe(". harbor / quay  2 nodes\n");
  });
});

describe("whole numbers past 2^53 - 1 as names and compared fields", () => {
  it("keep their digits: two such names stay two, a change between them is an edit (JSON and YAML)", async () => {
    // RFC 8259 §6; read as doubles both were 12345678901234567000, and the diff saw no change, exit 0.
    const json = (n: string) => `{"name": "harbor", "children": [{"name": "quay", "serial": ${n}}]}`;
    const files = {
      "a.json": json("12345678901234567891"),
      "b.json": json("12345678901234567892"),
      "a.yaml": "name: harbor\nchildren:\n  - name: 12345678901234567891\n  - name: 12345678901234567892\n",
    };
    const r = await cli(
      ["diff", "a.json", "b.json", "--compare-field", "serial", "--fail-on-change", "--bare"],
      {
        files,
      },
    );
    expect(r.code).toBe(1);
    expect(r.stdout).toContain("[edited serial 12345678901234567891 -> 12345678901234567892] quay");
    const y = await cli(["a.yaml", "--bare"], { files });
    expect(y.stdout).toBe(". harbor  3 nodes\n  . 12345678901234567891\n  . 12345678901234567892\n");
    // Below 2^53 a number is its value, as JSON.parse reads it (docs/diff.md): 7e0 and 7 are one.
    const same = await cli(["diff", "a.json", "c.json", "--compare-field", "serial", "--fail-on-change"], {
      files: { ...files, "a.json": json("7"), "c.json": json("7e0") },
    });
    expect(same.code).toBe(0);
  });
});
