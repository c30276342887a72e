import { describe, expect, it } from "vitest";
import { loadTree } from "../../src/load/index.js";
import { caught, opts, outline } from "./helpers.js";

const bom = "\ufeff";

describe("loadTree(text, options)", () => {
  it("loadTree(text, options) strips a byte order mark and accepts CRLF line ends in every format", () => {
    const inputs: [string, string][] = [
      ["json", '{\r\n"name": "a",\r\n"children": [{"name": "b"}]\r\n}\r\n'],
      ["yaml", "name: a\r\nchildren:\r\n  - name: b\r\n"],
      ["csv", "id,parent\r\na,\r\nb,a\r\n"],
      ["tsv", "id\tparent\r\na\t\r\nb\ta\r\n"],
      ["rows", '[{"id": "a"},\r\n{"id": "b", "parent": "a"}]\r\n'],
      ["paths", "a\r\na/b\r\n"],
    ];
    for (const [format, text] of inputs) {
      const detected = format === "rows" ? "x.json" : `x.${format}`;
      expect(outline(loadTree(bom + text, opts({ file: detected }))), format).toEqual(["a", "  b"]);
    }
  });

  it("loadTree(text, options) counts lines from the first character after a byte order mark", () => {
    const error = caught(() => loadTree(`${bom}{"name": }`, opts({ file: "a.json" })));
    expect(error.code).toBe("PARSE_JSON");
    expect(error.pos).toEqual({ file: "a.json", line: 1, column: 10 });
  });

  it("loadTree(text, options) detects the format from content when there is no file name", () => {
    expect(loadTree("id,parent\na,\nb,a\n", opts()).ids).toEqual(["a", "b"]);
    expect(loadTree('[{"path": "a/b"}]', opts()).originIsRow).toBe(true);
    expect(outline(loadTree("name: a\n", opts()))).toEqual(["a"]);
    expect(outline(loadTree("a/b\n", opts({ file: "-" })))).toEqual(["a", "  b"]);
  });

  it("loadTree(text, options) lets options.format override detection", () => {
    // Read as nested JSON, rows are nameless root nodes.
    const tree = loadTree('[{"id": "a"}, {"id": "b", "parent": "a"}]', opts({ format: "json" }));
    expect(tree.name).toEqual(["(root)", "", ""]);
    expect(loadTree("id,parent\n", opts({ format: "paths" })).name).toEqual(["id,parent"]);
  });

  it("loadTree(text, options) rejects empty input as INPUT_EMPTY naming the file", () => {
    const error = caught(() => loadTree(`${bom}\n \n`, opts({ file: "empty.csv" })));
    expect(error.code).toBe("INPUT_EMPTY");
    expect(error.pos).toEqual({ file: "empty.csv" });
  });

  it("loadTree(text, options) gives the same tree for the same input", () => {
    const text = "path,size\nb/x,1\na,2\nb/y,3\n";
    expect(loadTree(text, opts())).toEqual(loadTree(text, opts()));
  });
});
