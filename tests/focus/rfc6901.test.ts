import { describe, expect, it } from "vitest";
import { resolveFoci, resolvePath } from "../../src/focus/resolve.js";
import { buildTree } from "../../src/model/build-tree.js";
import { measure } from "../../src/model/measure.js";
import { PathIndex } from "../../src/model/path-index.js";
import { rfc6901MemberPointers } from "../helpers/rfc6901-example.js";

// Source: RFC 6901 (JSON Pointer), section 5. The example document's members become nodes; each
// member's value (0..8) is kept as the node's size so the test can check the node the RFC names.
//   { "foo": ["bar", "baz"], "": 0, "a/b": 1, "c%d": 2, "e^f": 3, "g|h": 4, "i\\j": 5, "k\"l": 6, " ": 7, "m~n": 8 }
const members: [string, number][] = [
  ["", 0],
  ["a/b", 1],
  ["c%d", 2],
  ["e^f", 3],
  ["g|h", 4],
  ["i\\j", 5],
  ['k"l', 6],
  [" ", 7],
  ["m~n", 8],
];

function rfcTree() {
  // root, foo, foo/0 ("bar"), foo/1 ("baz"), then the other members.
  const name = ["(document)", "foo", "0", "1", ...members.map(([n]) => n)];
  const parentOf = [-1, 0, 1, 1, ...members.map(() => 0)];
  const size = [0, 0, 0, 0, ...members.map(([, v]) => v)];
  const tree = buildTree({
    parentOf: Int32Array.from(parentOf),
    name,
    ownSize: Float64Array.from(size),
    hasSizes: true,
    ids: null,
    origin: new Int32Array(name.length),
    originIsRow: false,
    fields: new Map(),
    rootName: "(root)",
  });
  return new PathIndex(tree, measure(tree));
}

describe("focus paths follow RFC 6901 section 5", () => {
  const index = rfcTree();
  const { tree } = index;

  it('"" names the whole document (the root)', () => {
    expect(resolvePath(index, "")).toBe(0);
  });

  it('"/foo" names the array and "/foo/0" its first element', () => {
    expect(tree.name.get(resolvePath(index, "/foo"))).toBe("foo");
    const first = resolvePath(index, "/foo/0");
    expect(tree.name.get(first)).toBe("0");
    expect(tree.parent[first]).toBe(resolvePath(index, "/foo"));
  });

  // Each pointer of the RFC's table with the value it evaluates to.
  const table = rfc6901MemberPointers;
  for (const [pointer, value] of table) {
    it(`${JSON.stringify(pointer)} selects the member whose value is ${value}`, () => {
      const node = resolvePath(index, pointer);
      expect(node).toBeGreaterThan(0);
      expect(tree.ownSize[node]).toBe(value);
      expect(resolveFoci(index, [pointer])).toEqual(Int32Array.from([node]));
    });
  }

  it("prints every path so that it reads back to the same node", () => {
    for (let i = 0; i < tree.length; i++) expect(resolvePath(index, index.path(i))).toBe(i);
    expect(index.path(resolvePath(index, "/m~0n"))).toBe("m~0n");
    expect(index.path(resolvePath(index, "/a~1b"))).toBe("a~1b");
    expect(index.path(resolvePath(index, "/"))).toBe("/");
  });
});
