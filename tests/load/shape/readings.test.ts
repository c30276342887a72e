import { Buffer } from "node:buffer";
import { describe, expect, it } from "vitest";
import { loadTree } from "../../../src/load/index.js";
import { caught, opts, outline } from "../helpers.js";
import { loadStreamed } from "../stream/helpers.js";

const load = (text: string, file: string, overrides = {}) =>
  loadTree(text, opts({ file, rootName: file, ...overrides }));

describe("loadTree(text) reads JSON and YAML as the document says", () => {
  // A dependency listing shaped as a package manager prints one (invented packages).
  const listing = {
    version: "4.2.0",
    name: "tidewater",
    dependencies: {
      "harbor-log": {
        version: "1.0.0",
        overridden: false,
        dependencies: { "tide-clock": { version: "0.2.1", overridden: false } },
      },
      "@quill/ink": { version: "3.0.1", overridden: false },
    },
  };

  it("finds the children under `dependencies`, names children by key, records the field it chose", () => {
    const tree = load(JSON.stringify(listing, null, 2), "deps.json");
    expect(outline(tree)).toEqual(["tidewater", "  harbor-log", "    tide-clock", "  @quill/ink"]);
    expect(tree.reading).toEqual({
      shape: "nodes",
      sizeUnit: "number",
      childrenField: "dependencies",
      childrenFieldFound: true,
      // The fields beside those read for the tree, which a diff compares when there is no version.
      otherFields: ["version", "overridden"],
    });
  });

  it("finds the same children field in YAML", () => {
    const yaml =
      "name: tidewater\ndependencies:\n  harbor-log:\n    dependencies:\n      tide-clock: {}\n  ink: {}\n";
    expect(outline(load(yaml, "deps.yaml"))).toEqual([
      "tidewater",
      "  harbor-log",
      "    tide-clock",
      "  ink",
    ]);
  });

  it("reads a lock file's `packages` map as rows linked by path, the empty path the root", () => {
    const lock = {
      name: "tidewater",
      lockfileVersion: 3,
      packages: {
        "": { name: "tidewater", version: "4.2.0" },
        "node_modules/harbor-log": { version: "1.0.0" },
        "node_modules/harbor-log/node_modules/tide-clock": { version: "0.2.1" },
        "node_modules/@quill/ink": { version: "3.0.1" },
      },
    };
    const tree = load(JSON.stringify(lock), "lock.json", { keepFields: ["version"] });
    expect(outline(tree)).toEqual([
      "tidewater",
      "  node_modules",
      "    harbor-log",
      "      node_modules",
      "        tide-clock",
      "    @quill",
      "      ink",
    ]);
    expect(tree.reading).toEqual({ shape: "path-map", sizeUnit: "number", pathMapField: "packages" });
    expect(tree.fields.get("version")).toEqual(["4.2.0", "", "1.0.0", "", "0.2.1", "", "3.0.1"]);
    const twice = caught(() => load('{"":{},"a":{},"a/b":{},"":{}}', "x.json"));
    expect(twice.code).toBe("DUPLICATE_PATH");
  });

  it("streams a path map and a found children field as it reads them whole, however cut", async () => {
    for (const [text, file] of [
      [JSON.stringify(listing), "deps.json"],
      ['{"packages":{"":{"size":1},"a":{"size":2},"a/b":{"size":3}}}', "lock.json"],
    ]) {
      const whole = load(text, file);
      const bytes = Buffer.from(text);
      for (const cut of [1, 7, 20, 33]) {
        const streamed = await loadStreamed(bytes, opts({ file, rootName: file }), [cut, cut * 2]);
        expect(outline(streamed)).toEqual(outline(whole));
        expect(streamed.reading).toEqual(whole.reading);
      }
    }
  });

  it("never loads a document holding more as a lone root: FIELD_MISSING names its nested fields", () => {
    // Asked for nodes under a field it lacks: the fields there are, and the options to pass.
    for (const [text, file] of [
      ['{"name":"r","deps":{"a":{}},"meta":[1]}', "x.json"],
      ["name: r\ndeps:\n  a: {}\nmeta: [1]\n", "x.yaml"],
    ]) {
      const error = caught(() => load(text, file, { childrenField: "kids" }));
      expect(error.code).toBe("FIELD_MISSING");
      expect(error.details).toEqual({
        option: "--children-field",
        field: "kids",
        fieldsSeen: ["deps", "meta"],
        remedies: ["--children-field", "--read-as values"],
      });
      expect(caught(() => load(text, file, { readAs: "nodes" })).code).toBe("FIELD_MISSING");
    }
    // A leaf with kept nested fields is one node, as asked.
    expect(load('{"name":"r","tags":["a"]}', "x.json", { keepFields: ["tags"] }).length).toBe(1);
  });

  it("reads a YAML document with no node shape as the tree of its values, sized in bytes", () => {
    const text = "# tidewater CI\nname: build\non: [push]\njobs:\n  test:\n    steps:\n      - run: make\n";
    const tree = load(text, "ci.yaml");
    expect(tree.reading).toEqual({ shape: "values", sizeUnit: "bytes" });
    expect(outline(tree).map((line) => line.trim().split(" ")[0])).toEqual([
      "ci.yaml",
      "name",
      "on",
      "0",
      "jobs",
      "test",
      "steps",
      "0",
      "run",
    ]);
    let total = 0;
    for (let i = 0; i < tree.length; i++) total += tree.ownSize[i];
    // The root is the whole document, comments included: its size is the document's bytes.
    expect(total).toBe(Buffer.byteLength(text));
    // "on" holds the text "[push]": 6 bytes (the node's value, from its first character to its last).
    expect(tree.ownSize[2] + tree.ownSize[3]).toBe(6);
  });

  it("reads YAML rows by their keys, as JSON rows", () => {
    const tree = load("- id: r\n- id: a\n  parent: r\n  meta: {x: 1}\n", "org.yaml");
    expect(outline(tree)).toEqual(["r", "  a"]);
    expect(tree.reading?.shape).toBe("rows");
  });
});
