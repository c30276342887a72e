import { describe, expect, it } from "vitest";
import { detectFormat } from "../../src/load/index.js";
import { caught } from "./helpers.js";

describe("detectFormat(text, file)", () => {
  it("detectFormat(text, file) goes by the extension first", () => {
    expect(detectFormat("a,b", "org.yaml")).toBe("yaml");
    expect(detectFormat("a", "org.YML")).toBe("yaml");
    expect(detectFormat("name: x", "org.csv")).toBe("csv");
    expect(detectFormat("x", "org.tsv")).toBe("tsv");
    expect(detectFormat("{}", "tree.txt")).toBe("paths");
    expect(detectFormat("a", "tree.paths")).toBe("paths");
    expect(detectFormat("a", "tree.lst")).toBe("paths");
  });

  it("detectFormat(text, file) tells JSON rows from nested JSON by the first element", () => {
    expect(detectFormat('[{"id": 1, "name": "a"}, {"id": 2, "parent": 1}]', "org.json")).toBe("rows");
    expect(detectFormat('[ {"path": "a/b"} ]', undefined)).toBe("rows");
    expect(detectFormat('[{"name": "a", "children": [{"id": 1}]}]', "org.json")).toBe("json");
    expect(detectFormat('{"name": "a"}', "org.json")).toBe("json");
    expect(detectFormat('[{"name": "a"}]', undefined)).toBe("json");
  });

  it("detectFormat(text, file) finds a table header naming the id, parent or path column", () => {
    expect(detectFormat("id,parent,name\n1,,a\n", undefined)).toBe("csv");
    expect(detectFormat('"name","path"\r\na,b\r\n', "-")).toBe("csv");
    expect(detectFormat("name\tid\tparent\n", undefined)).toBe("tsv");
    expect(
      detectFormat("key,boss\n", undefined, {
        idField: "key",
        parentField: "boss",
        pathField: "p",
        childrenField: "c",
      }),
    ).toBe("csv");
  });

  it("detectFormat(text, file) takes a first line like `key:` or `---` as YAML", () => {
    expect(detectFormat("# lab\n\nname: lab\nchildren: []\n", undefined)).toBe("yaml");
    expect(detectFormat("---\n- name: a\n", undefined)).toBe("yaml");
    expect(detectFormat("- name: a\n", undefined)).toBe("yaml");
    expect(detectFormat('"odd key": 1\n', undefined)).toBe("yaml");
  });

  it("detectFormat(text, file) falls back to a path list", () => {
    expect(detectFormat("./src\n./src/a.ts\n", undefined)).toBe("paths");
    expect(detectFormat("4096\t./src\n12\t./src/a.ts\n", undefined)).toBe("paths");
    expect(detectFormat("C:/work/a\n", undefined)).toBe("paths");
    expect(detectFormat("a,b\n", "notes.md")).toBe("paths");
  });

  it("detectFormat(text, file) reads a .tsv of sizes and paths as a path list, a .tsv with a header as a table", () => {
    // find DIR -printf '%s\t%P\n' saved as .tsv: the first line is the start, an empty path.
    expect(detectFormat("4096\t\n12\tsrc/a.ts\n", "listing.tsv")).toBe("paths");
    expect(detectFormat("12\tsrc/a.ts\n", "listing.TSV")).toBe("paths");
    expect(detectFormat("path\tsize\nsrc/a.ts\t12\n", "files.tsv")).toBe("tsv");
    expect(detectFormat("id\tparent\n1\t\n", "org.tsv")).toBe("tsv");
    // Neither: a table, whose FIELD_MISSING names --input-format paths (tests/load/table).
    expect(detectFormat("a\tb\n", "odd.tsv")).toBe("tsv");
  });

  it("detectFormat(text, file) rejects empty or whitespace-only text as INPUT_EMPTY", () => {
    expect(caught(() => detectFormat("", undefined)).code).toBe("INPUT_EMPTY");
    expect(caught(() => detectFormat("\ufeff \r\n\t", "a.json")).code).toBe("INPUT_EMPTY");
  });
});
