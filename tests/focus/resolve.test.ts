import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { resolveFoci, resolvePath } from "../../src/focus/resolve.js";
import { buildTree } from "../../src/model/build-tree.js";
import { measure } from "../../src/model/measure.js";
import { PathIndex } from "../../src/model/path-index.js";
import type { Tree } from "../../src/model/tree.js";
import { makeTree, nodeNamed } from "../helpers/make-tree.js";
import { arbTree } from "../helpers/random-tree.js";
import { caught } from "../load/helpers.js";

const indexOf = (tree: Tree) => new PathIndex(tree, measure(tree));
const names = (tree: Tree, nodes: Int32Array) => [...nodes].map((i) => tree.name.get(i));

describe("resolveFoci(index, specs)", () => {
  const tree = makeTree("R{src{lib{a.ts,b.ts},test{a.test.ts}},docs{lib{guide.md}},README.md}");
  const index = indexOf(tree);

  it("resolves exact paths, with or without a leading slash", () => {
    expect(names(tree, resolveFoci(index, ["src/lib/a.ts"]))).toEqual(["a.ts"]);
    expect(names(tree, resolveFoci(index, ["/src/lib/a.ts"]))).toEqual(["a.ts"]);
  });

  it("matches * within one segment and ** across any number of segments", () => {
    expect(names(tree, resolveFoci(index, ["src/lib/*.ts"]))).toEqual(["a.ts", "b.ts"]);
    expect(names(tree, resolveFoci(index, ["**/lib"]))).toEqual(["lib", "lib"]);
    expect(names(tree, resolveFoci(index, ["src/**"]))).toEqual([
      "src",
      "lib",
      "a.ts",
      "b.ts",
      "test",
      "a.test.ts",
    ]);
    expect(names(tree, resolveFoci(index, ["**/a*.ts"]))).toEqual(["a.ts", "a.test.ts"]);
    expect(names(tree, resolveFoci(index, ["*/lib/*"]))).toEqual(["a.ts", "b.ts", "guide.md"]);
  });

  it("returns sorted, distinct nodes for overlapping specs", () => {
    const got = resolveFoci(index, ["src/lib/a.ts", "src/lib/*", "src/lib/a.ts"]);
    expect([...got]).toEqual([nodeNamed(tree, "a.ts"), nodeNamed(tree, "b.ts")]);
  });

  it("throws FOCUS_NO_MATCH and suggests the closest existing path", () => {
    const err = caught(() => resolveFoci(index, ["src/lbi/a.ts"]));
    expect(err.code).toBe("FOCUS_NO_MATCH");
    expect(err.details.suggestions).toContain("src/lib/a.ts");
    const near = caught(() => resolveFoci(index, ["src/tset"]));
    expect(near.details.suggestions).toContain("src/test");
  });

  it("with nothing near, says where the path stops and what is there (field test: a typed province)", () => {
    // Field test on an administrative-division table: "<province>/nothere" said only "matches no node".
    const err = caught(() => resolveFoci(index, ["src/quayside/moorings"]));
    expect(err.code).toBe("FOCUS_NO_MATCH");
    expect(err.details.suggestions).toEqual([]);
    expect(err.message).toBe(
      'focus "src/quayside/moorings" matches no node; "src" has no child "quayside": its 2 children include "lib", "test"',
    );
    const top = caught(() => resolveFoci(index, ["harbourmaster"]));
    expect(top.message).toMatch(
      /; the root has no child "harbourmaster": its 3 children include "src", "docs", "README\.md"$/,
    );
    const leaf = caught(() => resolveFoci(index, ["README.md/section/anchor"]));
    expect(leaf.message).toMatch(/; "README\.md" has no children$/);
  });

  it("neither repeats the spec nor suggests from real names when pseudonyms are on", () => {
    const err = caught(() => resolveFoci(index, ["src/lbi/a.ts"], "secret"));
    expect(err.code).toBe("FOCUS_NO_MATCH");
    expect(err.message).not.toContain("src/l");
    expect(err.message).not.toContain("a.ts");
  });

  it("throws FOCUS_SYNTAX for a ~ not followed by 0 or 1 (RFC 6901 section 3)", () => {
    const err = caught(() => resolveFoci(index, ["src/a~2b"]));
    expect(err.code).toBe("FOCUS_SYNTAX");
    // The way out: a literal "~" is "~0" (RFC 6901 section 3).
    expect(err.message).toContain('written "a~02b"');
  });

  it("names a row by id where rows have ids", () => {
    const t = buildTree({
      parentOf: Int32Array.from([-1, 0, 1]),
      name: ["Ada", "Bo", "Cy"],
      ownSize: new Float64Array(3),
      hasSizes: false,
      ids: ["E1", "E2", "E3"],
      origin: Int32Array.from([1, 2, 3]),
      originIsRow: true,
      fields: new Map(),
      rootName: "(root)",
    });
    expect(names(t, resolveFoci(indexOf(t), ["E3"]))).toEqual(["Cy"]);
    expect(names(t, resolveFoci(indexOf(t), ["Bo/Cy"]))).toEqual(["Cy"]);
  });

  it("keeps equal sibling names addressable with a ~~N suffix", () => {
    const t = makeTree("R{x{a},x{b},x{c}}");
    const idx = indexOf(t);
    expect(idx.path(nodeNamed(t, "b"))).toBe("x~~2/b");
    expect(t.name.get(resolvePath(idx, "x~~3/c"))).toBe("c");
    expect(t.name.get(resolvePath(idx, "x/a"))).toBe("a");
  });

  it("reads back every printed path, whatever the names (property)", () => {
    fc.assert(
      fc.property(arbTree(80), (t) => {
        const idx = indexOf(t);
        for (let i = 0; i < t.length; i++) expect(resolvePath(idx, idx.path(i))).toBe(i);
      }),
    );
  });
});

describe("resolveFoci(index, specs) with paths as a listing prints them", () => {
  // POSIX find -print writes each pathname with the starting point in front: `find .` gives
  // "./services/ledger", `find fixtures` gives "fixtures/external" (POSIX find, -print; from memory).
  // The listing's starting point is the tree's root, whose own path is "".
  const dot = makeTree(".{services{ledger{src},billing},docs}");
  const named = makeTree("fixtures{external{emoji-test.txt},fixtures{x}}");

  it("drops a leading ./ and reads the rest as a path or a glob", () => {
    expect(names(dot, resolveFoci(indexOf(dot), ["./services/ledger"]))).toEqual(["ledger"]);
    expect(names(dot, resolveFoci(indexOf(dot), ["./services/*"]))).toEqual(["ledger", "billing"]);
    expect(names(dot, resolveFoci(indexOf(dot), ["."]))).toEqual(["."]);
  });

  it("drops the root's own name in front, and reads the name alone as the root", () => {
    const index = indexOf(named);
    expect(names(named, resolveFoci(index, ["fixtures/external/emoji-test.txt"]))).toEqual([
      "emoji-test.txt",
    ]);
    const plain = makeTree("fixtures{external{emoji-test.txt}}");
    expect(resolveFoci(indexOf(plain), ["fixtures"])).toEqual(Int32Array.of(0));
  });

  it("prefers a node really named so: fixtures/x is the child fixtures' x, ./ is tried only after", () => {
    const index = indexOf(named);
    const [hit] = resolveFoci(index, ["fixtures/x"]);
    expect(named.name.get(named.parent[hit])).toBe("fixtures");
    expect(named.parent[named.parent[hit]]).toBe(0);
    expect(named.parent[resolveFoci(index, ["fixtures"])[0]]).toBe(0);
  });

  it("still fails on a listed path that names nothing, suggesting espalier's own spelling", () => {
    const e = caught(() => resolveFoci(indexOf(dot), ["./services/ledgr"]));
    expect(e.code).toBe("FOCUS_NO_MATCH");
    expect(e.details.suggestions).toContain("services/ledger");
  });
});
