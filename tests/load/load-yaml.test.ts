import { Buffer } from "node:buffer";
import { describe, expect, it } from "vitest";
import { loadTree } from "../../src/load/index.js";
import { caught, opts, outline } from "./helpers.js";

const yaml = (text: string, overrides = {}) => loadTree(text, opts({ format: "yaml", ...overrides }));

describe("loadTree(yaml)", () => {
  it("loadTree(yaml) reads the shapes JSON allows, with line numbers as origins", () => {
    const tree = yaml(
      [
        "name: tidewater",
        "children:",
        "  - name: services",
        "    children:",
        "      ledger: 40",
        "      gauge:",
        "  - name: docs",
        "    size: 3",
      ].join("\n"),
    );
    expect(outline(tree)).toEqual([
      "tidewater 0",
      "  services 0",
      "    ledger 40",
      "    gauge 0",
      "  docs 3",
    ]);
    expect([...tree.origin]).toEqual([1, 3, 5, 6, 7]);
  });

  it("loadTree(yaml) joins a top-level sequence under a synthetic root", () => {
    expect(outline(yaml("- name: a\n- name: b\n"))).toEqual(["(root)", "  a", "  b"]);
  });

  it("loadTree(yaml) follows an alias used once, e.g. from a templates section", () => {
    const text = "templates:\n  probe: &probe {name: probe, size: 2}\nname: lab\nchildren: [*probe]\n";
    expect(outline(yaml(text))).toEqual(["lab 0", "  probe 2"]);
  });

  it("loadTree(yaml) reads an alias placed twice as one entry and a reference (tests/load/yaml-aliases.test.ts)", () => {
    const text = "name: r\nchildren:\n  - &a {name: a}\n  - name: b\n    children: [*a]\n";
    const tree = yaml(text);
    expect(outline(tree)).toEqual(["r", "  a", "  b", "    a"]);
    expect([...(tree.referenceTo ?? [])]).toEqual([-1, -1, -1, 1]);
    // The reference's origin is the alias's line.
    expect(tree.origin[3]).toBe(5);
  });

  it("loadTree(yaml) reports a syntax error as PARSE_YAML at its line and column", () => {
    const error = caught(() => yaml("name: r\nchildren: [a,\nsize: 2\n", { file: "lab.yaml" }));
    expect(error.code).toBe("PARSE_YAML");
    expect(error.pos).toMatchObject({ file: "lab.yaml", line: 3 });
  });

  it("loadTree(yaml) reports a repeated key as PARSE_YAML at the repeat", () => {
    const error = caught(() => yaml("name: r\nname: s\n"));
    expect(error.code).toBe("PARSE_YAML");
    expect(error.pos).toEqual({ line: 2, column: 1 });
  });

  it("loadTree(yaml) rejects a quoted size as BAD_SIZE at its line and column", () => {
    const error = caught(() => yaml('name: r\nchildren:\n  - name: a\n    size: "12"\n'));
    expect(error.code).toBe("BAD_SIZE");
    expect(error.pos).toEqual({ line: 4, column: 11 });
    expect(error.details).toEqual({ path: "r/a", field: "size" });
  });

  it("loadTree(yaml) rejects a scalar child in a sequence as SHAPE at its line", () => {
    const error = caught(() => yaml("name: r\nchildren:\n  - a\n"));
    expect(error.code).toBe("SHAPE");
    expect(error.pos).toEqual({ line: 3, column: 5 });
  });

  it("loadTree(yaml) keeps fields, collections as written", () => {
    const tree = yaml("name: r\nowner: optics\ntags: [a, b]\n", { keepFields: ["owner", "tags"] });
    expect(tree.fields.get("owner")).toEqual(["optics"]);
    expect(tree.fields.get("tags")).toEqual(["[a, b]"]);
  });

  it("loadTree(yaml) rejects a document holding only comments as INPUT_EMPTY", () => {
    expect(caught(() => yaml("# nothing here\n")).code).toBe("INPUT_EMPTY");
  });

  it("loadTree(yaml) reports nesting too deep for the YAML parser as LIMIT_EXCEEDED with a line", () => {
    const depth = 5000;
    const text = "{name: n, children: [".repeat(depth) + "{name: leaf}" + "]}".repeat(depth);
    const error = caught(() => yaml(text));
    expect(error.code).toBe("LIMIT_EXCEEDED");
    expect(error.pos?.line).toBe(1);
  });
});

describe("loadTree(yaml) merge keys", () => {
  // The YAML 1.1 merge type (yaml.org/type/merge.html, from memory): a mapping's own keys override
  // merged ones; in a sequence of merged mappings, earlier ones override later ones.
  it("loadTree(yaml) applies `<<: *base`: a merged size and name are the node's, its own keys win", () => {
    const text = [
      "defaults: &base",
      "  size: 10",
      "  owner: tidewater",
      "name: root",
      "children:",
      "  - name: a",
      "    <<: *base",
      "  - name: b",
      "    <<: *base",
      "    size: 3",
      "",
    ].join("\n");
    const tree = yaml(text, { keepFields: ["owner"] });
    expect(outline(tree)).toEqual(["root 0", "  a 10", "  b 3"]);
    expect(tree.fields.get("owner")).toEqual(["", "tidewater", "tidewater"]);
  });

  it("loadTree(yaml) merges a sequence of mappings, earlier ones first, and merges within merges", () => {
    const text = [
      "one: &one {size: 1}",
      "two: &two {size: 2, name: from-two}",
      "three: &three {<<: *two, owner: q}",
      "name: r",
      "children:",
      "  - {<<: [*one, *two]}",
      "  - {<<: [*three]}",
      "  - {'<<': *one, name: quoted}",
      "",
    ].join("\n");
    const tree = yaml(text, { keepFields: ["owner"] });
    expect(outline(tree)).toEqual(["r 0", "  from-two 1", "  from-two 2", "  quoted 0"]);
    expect(tree.fields.get("owner")).toEqual(["", "", "q", ""]);
  });

  it("loadTree(yaml) takes children keyed by name from a merged mapping too", () => {
    const text = [
      "common: &common",
      "  lint: 4",
      "name: ci",
      "children:",
      "  <<: *common",
      "  test: 7",
      "",
    ].join("\n");
    expect(outline(yaml(text))).toEqual(["ci 0", "  test 7", "  lint 4"]);
  });

  it('loadTree(yaml) reads a !!float-tagged 3 as the number 3 (YAML 1.2.2, 10.3.2: "3" matches the core schema\'s float)', () => {
    const tree = yaml("name: r\nsize: !!float 3\n");
    expect(tree.ownSize[0]).toBe(3);
  });

  it("loadTree(yaml) refuses a second document read as nodes as PARSE_YAML at the --- that starts it", () => {
    const error = caught(() => yaml("name: r\nsize: 1\n---\nname: s\n", { readAs: "nodes" }));
    expect([error.code, error.pos]).toEqual(["PARSE_YAML", { line: 3, column: 1 }]);
  });

  it("loadTree(yaml) reads several documents as values, each a child of the root named by index", () => {
    const text = "name: r\nsize: 1\n---\nname: s\n";
    const tree = yaml(text, { rootName: "two.yaml" });
    expect(tree.reading?.shape).toBe("values");
    // Own sizes in bytes of source text (28 in all): a block mapping's text runs to the end of its last
    // line, so document 0 is "name: r\nsize: 1\n" (16 bytes, 2 of them its values), document 1
    // "name: s\n" (8, 1 its value), and the root holds the "---\n" between them (4).
    expect(outline(tree)).toEqual([
      "two.yaml 4",
      "  0 14",
      "    name 1",
      "    size 1",
      "  1 7",
      "    name 1",
    ]);
    expect(Buffer.byteLength(text)).toBe(4 + 14 + 1 + 1 + 7 + 1);
  });
});
