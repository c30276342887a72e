import { describe, expect, it } from "vitest";
import { loadTree } from "../../../src/load/index.js";
import { caught, opts, outline } from "../helpers.js";

// Node objects, as the tests in this file read them (reading by the document: tests/load/shape).
const json = (text: string, overrides = {}) =>
  loadTree(text, opts({ format: "json", readAs: "nodes", ...overrides }));

describe("loadTree(json)", () => {
  it("loadTree(json) reads children given as an array, in input order", () => {
    const tree = json(
      JSON.stringify({
        name: "tidewater",
        children: [
          {
            name: "services",
            children: [
              { name: "ledger", size: 40 },
              { name: "gauge", size: 2 },
            ],
          },
          { name: "README.md", size: 7 },
        ],
      }),
    );
    expect(outline(tree)).toEqual([
      "tidewater 0",
      "  services 0",
      "    ledger 40",
      "    gauge 2",
      "  README.md 7",
    ]);
    expect(tree.syntheticRoot).toBe(false);
    expect(tree.hasSizes).toBe(true);
    expect(tree.originIsRow).toBe(false);
    expect(tree.ids).toBeNull();
  });

  it("loadTree(json) reads children keyed by name: objects, numbers and null, the key naming the child", () => {
    const tree = json(
      '{"name":"tidewater","children":{"docs":{"name":"ignored","children":{"guide.md":12,"todo.md":null}},"LICENSE":3}}',
    );
    expect(outline(tree)).toEqual([
      "tidewater 0",
      "  docs 0",
      "    guide.md 12",
      "    todo.md 0",
      "  LICENSE 3",
    ]);
  });

  it("loadTree(json) joins a top-level array of nodes under a synthetic root named rootName", () => {
    const tree = json('[{"name":"optics"},{"name":"firmware","children":[{"name":"boot"}]}]', {
      rootName: "all",
    });
    expect(outline(tree)).toEqual(["all", "  optics", "  firmware", "    boot"]);
    expect(tree.syntheticRoot).toBe(true);
    expect(tree.hasSizes).toBe(false);
  });

  it("loadTree(json) names a node without a name field with the empty string, the lone top node by the file", () => {
    const tree = json('{"children":[{"size":1},{"name":"b"}]}');
    // The root's "" told a reader nothing; it takes the root name espalier gives an added root.
    expect(tree.name).toEqual(["(root)", "", "b"]);
    const named = json('{"children":[{"size":1}]}', { rootName: "iso_3166-1.json" });
    expect(named.name).toEqual(["iso_3166-1.json", ""]);
    // An empty name field counts as none; several nameless top nodes keep "" under the added root.
    expect(json('{"name":"","children":[{"name":"x"}]}').name).toEqual(["(root)", "x"]);
    expect(json('[{"size":1},{"size":2}]').name).toEqual(["(root)", "", ""]);
  });

  it("loadTree(json) uses the field names from the options and keeps extra fields", () => {
    const tree = json(
      '{"title":"Quillfeather Instruments","kids":[{"title":"Optics","bytes":5,"floor":2}]}',
      {
        nameField: "title",
        childrenField: "kids",
        sizeField: "bytes",
        keepFields: ["floor"],
      },
    );
    expect(outline(tree)).toEqual(["Quillfeather Instruments 0", "  Optics 5"]);
    expect(tree.fields.get("floor")).toEqual(["", "2"]);
  });

  it("loadTree(json) loads a chain 1,000,000 nodes deep", () => {
    const depth = 1_000_000;
    const text =
      '{"name":"n","children":['.repeat(depth - 1) + '{"name":"leaf","size":1}' + "]}".repeat(depth - 1);
    const tree = json(text);
    expect(tree.length).toBe(depth);
    expect(tree.depth[depth - 1]).toBe(depth - 1);
    expect(tree.name.get(depth - 1)).toBe("leaf");
    expect(tree.parent[depth - 1]).toBe(depth - 2);
    // ~5 s alone; up to 27 s seen in clean-clone CI runs on the busy shared machine: 60 s was too near.
  }, 180_000);

  it("loadTree(json) reports a syntax error as PARSE_JSON at its line and column", () => {
    // V8 gives a position: the "}" where a property name was expected.
    const error = caught(() => json('{\n  "name": "a",\n}', { file: "org.json" }));
    expect(error.code).toBe("PARSE_JSON");
    expect(error.pos).toEqual({ file: "org.json", line: 3, column: 1 });
  });

  it("loadTree(json) locates a syntax error V8 reports without a position", () => {
    // V8 says 'Unexpected token' with an excerpt only; the offset comes from our own scan.
    const error = caught(() => json('{\n  "name": "a",\n  "size": tru}'));
    expect(error.code).toBe("PARSE_JSON");
    expect(error.pos).toEqual({ line: 3, column: 14 });
  });

  it("loadTree(json) names JSON Lines where a second value begins a line, and only there", () => {
    // JSON Lines: one JSON text a line (jsonlines.org); espalier reads them as a fact table.
    const lines = caught(() => json('{"team":"ledger","cost":3}\n{"team":"quay","cost":5}\n'));
    expect(lines.code).toBe("PARSE_JSON");
    expect(lines.pos).toEqual({ line: 2, column: 1 });
    expect(lines.message).toContain("--input-format jsonl");
    // Another stray character after the value, or a value in the middle of a line: no such guess.
    for (const text of ['{"name":"a"}\n}', '{"name":"a"} {"name":"b"}', '{"name":"a"}\n  x']) {
      const error = caught(() => json(text));
      expect(error.code).toBe("PARSE_JSON");
      expect(error.message).not.toContain("JSON Lines");
    }
  });

  it("loadTree(json) reports input ending early at the end of the last line", () => {
    const error = caught(() => json('{"name": "a",\n "children": [\n'));
    expect(error.code).toBe("PARSE_JSON");
    expect(error.pos).toEqual({ line: 2, column: 15 });
  });

  it("loadTree(json) rejects a text or negative size with BAD_SIZE naming the node's path", () => {
    const text = caught(() => json('{"name":"r","children":[{"name":"a/b","size":"12"}]}'));
    expect(text.code).toBe("BAD_SIZE");
    // The node's path, "/" in its name escaped as "~1" (RFC 6901 §3), and the size field read.
    expect(text.details).toEqual({ path: "r/a~1b", field: "size" });
    // The column of the offending value: its index in the text (UTF-16 units) + 1.
    expect(text.pos).toEqual({ line: 1, column: 46 });
    // A size written as a keyed child's own value: no field.
    const keyed = caught(() => json('{"name":"r","children":{"x":-1}}'));
    expect([keyed.code, keyed.details]).toEqual(["BAD_SIZE", { path: "r/x" }]);
  });

  it("loadTree(json) places a structure error at a string holding multi-byte characters by its first character", () => {
    // Columns count UTF-16 units of the text, so the column is the string's index in the JS string + 1
    // (common practice, no source): the bytes of "é" itself must not pull its own column back.
    for (const text of ['{"name":"r","children":["é"]}', '{"name":"日本","children":[ "😀x"]}']) {
      const error = caught(() => json(text));
      expect(error.code).toBe("SHAPE");
      expect(error.pos).toEqual({ line: 1, column: text.lastIndexOf('"', text.lastIndexOf('"') - 1) + 1 });
    }
  });

  it("loadTree(json) rejects children that are neither an array nor an object with SHAPE", () => {
    expect(caught(() => json('{"name":"r","children":"a"}')).code).toBe("SHAPE");
    expect(caught(() => json('{"name":"r","children":[1]}')).code).toBe("SHAPE");
    expect(caught(() => json('{"name":"r","children":{"a":"b"}}')).code).toBe("SHAPE");
    expect(caught(() => json("42")).code).toBe("SHAPE");
    expect(caught(() => json('{"name":{"first":"x"}}')).code).toBe("SHAPE");
  });

  it("loadTree(json) rejects an empty top-level array with INPUT_EMPTY", () => {
    expect(caught(() => json("[]")).code).toBe("INPUT_EMPTY");
  });

  it("loadTree(json) stops with LIMIT_EXCEEDED once there are more than maxNodes nodes", () => {
    const error = caught(() => json('{"name":"r","children":[{},{},{}]}', { maxNodes: 3 }));
    expect(error.code).toBe("LIMIT_EXCEEDED");
    // The 4th node is the third "{}": after '{"name":"r","children":[' (24 characters) and "{},{},".
    expect(error.pos).toEqual({ line: 1, column: 31 });
    // A child keyed by name: at its value.
    const keyed = caught(() => json('{"name":"r","children":{"a":1,"b":{},\n "c": 2}}', { maxNodes: 3 }));
    expect([keyed.code, keyed.pos]).toEqual(["LIMIT_EXCEEDED", { line: 2, column: 7 }]);
    expect(json('{"name":"r","children":[{},{}]}', { maxNodes: 3 }).length).toBe(3);
  });

  it("loadTree(json) reports a kept field no node has as FIELD_MISSING", () => {
    expect(caught(() => json('{"name":"r"}', { keepFields: ["owner"] })).code).toBe("FIELD_MISSING");
  });

  it("loadTree(json) does not mistake Object.prototype members for fields", () => {
    // A named size field no node has is FIELD_MISSING (issue 10.8), naming the fields there are.
    const err = caught(() =>
      json('{"name":"r","children":[{"name":"a"}]}', { sizeField: "constructor", childrenField: "children" }),
    );
    expect(err.code).toBe("FIELD_MISSING");
    expect(err.details).toMatchObject({ option: "--size-field", fieldsSeen: ["name", "children"] });
    expect(caught(() => json('{"name":"r"}', { keepFields: ["toString"] })).code).toBe("FIELD_MISSING");
  });
});

describe("loadTree(json) rows or nodes", () => {
  const detected = (text: string) => loadTree(text, opts({ file: "in.json" }));

  it("loadTree(json) reads an array as rows by the keys of its first record, nested values and all", () => {
    const tree = detected('[{"id":"r","parent":null,"x":{"d":1}},{"id":"a","parent":"r","x":[1,{"e":2}]}]');
    expect(outline(tree)).toEqual(["r", "  a"]);
    expect(tree.reading?.shape).toBe("rows");
    const byPath = detected('[{"path":"a/b","meta":{"owner":"tidewater"}},{"path":"a/c"}]');
    expect(outline(byPath)).toEqual(["a", "  b", "  c"]);
  });

  it("loadTree(json) reads an array as nodes when its first element has children, ids or not", () => {
    const tree = detected('[{"id":"r","name":"r","children":[{"name":"a"}]},{"name":"s"}]');
    expect(tree.reading?.shape).toBe("nodes");
    expect(outline(tree).slice(1)).toEqual(["  r", "    a", "  s"]);
  });
});
