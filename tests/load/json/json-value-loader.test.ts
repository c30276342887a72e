import { Buffer } from "node:buffer";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { resolveFoci } from "../../../src/focus/resolve.js";
import { loadTree } from "../../../src/load/index.js";
import { loadTreeFromStream } from "../../../src/load/stream/index.js";
import type { Tree } from "../../../src/model/tree.js";
import { prepare } from "../../../src/summarize.js";
import { opts } from "../helpers.js";
import { chunked, cutsFor, rng } from "../stream/helpers.js";

const values = (text: string, overrides = {}) =>
  loadTree(text, opts({ format: "json", readAs: "values", rootName: "doc", ...overrides }));

/** The subtree size and printed path of the node a JSON Pointer names (resolved as a focus). */
function at(tree: Tree, pointer: string) {
  const prepared = prepare(tree);
  const i = resolveFoci(prepared.index, [pointer])[0];
  return { size: prepared.measures.size[i], path: prepared.index.path(i), nodes: prepared.measures.count[i] };
}

/** The value a JSON Pointer names in a parsed document (RFC 6901 section 4, written here for the test). */
function evaluate(doc: unknown, pointer: string): unknown {
  if (pointer === "") return doc;
  let value = doc;
  for (const token of pointer.slice(1).split("/")) {
    const key = token.replaceAll("~1", "/").replaceAll("~0", "~");
    value = (value as Record<string, unknown>)[key];
  }
  return value;
}

const bytes = (text: string) => Buffer.byteLength(text, "utf8");

/** The JSON Pointer of node `i` from the names on its way down (RFC 6901 section 3 escaping). */
function pointerOf(tree: Tree, i: number): string {
  const tokens: string[] = [];
  for (let k = i; k > 0; k = tree.parent[k])
    tokens.push(tree.name.get(k).replaceAll("~", "~0").replaceAll("/", "~1"));
  return tokens
    .reverse()
    .map((t) => `/${t}`)
    .join("");
}

describe("loadTree(json, readAs values)", () => {
  it("resolves every JSON Pointer of RFC 6901 section 5 to the node of the value it names", () => {
    // The example document and pointers of RFC 6901 section 5, written compactly, so a value's text
    // is JSON.stringify of the value.
    const doc = {
      foo: ["bar", "baz"],
      "": 0,
      "a/b": 1,
      "c%d": 2,
      "e^f": 3,
      "g|h": 4,
      "i\\j": 5,
      'k"l': 6,
      " ": 7,
      "m~n": 8,
    };
    const text = JSON.stringify(doc);
    const tree = values(text);
    const pointers = [
      "",
      "/foo",
      "/foo/0",
      "/",
      "/a~1b",
      "/c%d",
      "/e^f",
      "/g|h",
      "/i\\j",
      '/k"l',
      "/ ",
      "/m~0n",
    ];
    for (const pointer of pointers) {
      const node = at(tree, pointer);
      // The node's size is the byte length of the value's text (RFC 6901 names the value).
      expect(node.size, pointer).toBe(bytes(JSON.stringify(evaluate(doc, pointer))));
      // espalier prints the pointer without its leading "/" (and "/" itself for the member named "").
      expect(node.path, pointer).toBe(pointer === "/" ? "/" : pointer.slice(1));
    }
    expect(at(tree, "/foo").nodes).toBe(3);
    // The document, its ten members and the two elements of foo.
    expect(tree.length).toBe(1 + 10 + 2);
    expect(tree.reading).toEqual({ shape: "values", sizeUnit: "bytes" });
  });

  it("gives the root the whole document's bytes, the white space around the value included", () => {
    const text = '\n  { "a" : [1, 22],\n  "é": "ü" }  \n';
    const tree = values(text);
    expect(at(tree, "").size).toBe(bytes(text));
    expect(at(tree, "/a").size).toBe(bytes("[1, 22]"));
    expect(at(tree, "/a/1").size).toBe(2);
    expect(at(tree, "/é").size).toBe(bytes('"ü"'));
    expect(values("42").ownSize[0]).toBe(2);
  });

  it("sizes every node by its value's UTF-8 text, read whole or in chunks cut anywhere (fast-check)", async () => {
    await fc.assert(
      fc.asyncProperty(fc.jsonValue({ maxDepth: 4 }), fc.integer(), async (doc, seed) => {
        const text = JSON.stringify(doc);
        const tree = values(text);
        const prepared = prepare(tree);
        for (let i = 0; i < tree.length; i++) {
          expect(prepared.measures.size[i]).toBe(bytes(JSON.stringify(evaluate(doc, pointerOf(tree, i)))));
        }
        const input = Buffer.from(text);
        const streamed = await loadTreeFromStream(
          chunked(input, cutsFor(rng(seed), input.length, 5)),
          opts({ format: "json", readAs: "values", rootName: "doc" }),
        );
        expect([...streamed.ownSize]).toEqual([...tree.ownSize]);
        expect([...streamed.parent]).toEqual([...tree.parent]);
      }),
      { numRuns: 150 },
    );
  });

  it("reads a document with no node shape as values without being asked, and nodes when they are there", () => {
    const detected = (text: string) => loadTree(text, opts({ file: "in.json" }));
    expect(detected('{"a":{"b":[1,2]},"c":true}').reading?.shape).toBe("values");
    expect(detected("[1,2,3]").length).toBe(4);
    expect(detected('{"name":"r","children":[{"name":"a"}]}').reading?.shape).toBe("nodes");
  });
});
