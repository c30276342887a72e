import { describe, expect, it } from "vitest";
import { loadTree } from "../../../src/load/index.js";
import { caught, opts, outline } from "../helpers.js";

const paths = (text: string, overrides = {}) => loadTree(text, opts({ format: "paths", ...overrides }));

describe("loadTree(paths)", () => {
  it("loadTree(paths) makes the single common top segment the root, as `find .` prints", () => {
    const tree = paths(".\n./services\n./services/ledger.ts\n./README.md\n");
    expect(outline(tree)).toEqual([".", "  services", "    ledger.ts", "  README.md"]);
    expect(tree.syntheticRoot).toBe(false);
    expect([...tree.origin]).toEqual([1, 2, 3, 4]);
  });

  it("loadTree(paths) creates directories implicitly and lets a later line name one without error", () => {
    // du prints a directory after its contents.
    const tree = paths("12\ttidewater/gauge/main.c\n4096\ttidewater/gauge\n8\ttidewater\n");
    expect(outline(tree)).toEqual(["tidewater 8", "  gauge 4096", "    main.c 12"]);
    expect(tree.hasSizes).toBe(true);
    expect([...tree.origin]).toEqual([3, 2, 1]);
  });

  it("loadTree(paths) joins several top segments under a synthetic root", () => {
    const tree = paths("a/x\nb\n", { rootName: "top" });
    expect(outline(tree)).toEqual(["top", "  a", "    x", "  b"]);
    expect(tree.syntheticRoot).toBe(true);
  });

  it("loadTree(paths) roots absolute paths at a node named /", () => {
    expect(outline(paths("/srv/a\n/srv/b\n"))).toEqual(["/", "  srv", "    a", "    b"]);
  });

  it("loadTree(paths) ignores blank lines, trailing slashes and doubled slashes", () => {
    expect(outline(paths("a/\n\n  \na//b\n"))).toEqual(["a", "  b"]);
  });

  it("loadTree(paths) rejects an exact repeat of a listed path as DUPLICATE_PATH naming both lines", () => {
    const error = caught(() => paths("a\na/b\n\na/b\n", { file: "tree.txt" }));
    expect(error.code).toBe("DUPLICATE_PATH");
    expect(error.pos).toEqual({ file: "tree.txt", line: 4 });
    expect(error.message).toContain("line 2");
  });

  it("loadTree(paths) rejects a size that is not a number >= 0 as BAD_SIZE at its line", () => {
    const error = caught(() => paths("1\ta\n4.0K\ta/b\n"));
    expect(error.code).toBe("BAD_SIZE");
    expect(error.pos).toEqual({ line: 2, column: 1 });
  });

  it("loadTree(paths) requires a size column on every line once the first line has one", () => {
    const error = caught(() => paths("1\ta\na/b\n"));
    expect(error.code).toBe("PARSE_PATHS");
    expect(error.pos).toEqual({ line: 2 });
  });

  it("loadTree(paths) rejects a size with no path as PARSE_PATHS", () => {
    expect(caught(() => paths("1\ta\n2\t\n")).pos).toEqual({ line: 2, column: 3 });
  });

  it("loadTree(paths) stops with LIMIT_EXCEEDED at the line that adds one node too many", () => {
    const error = caught(() => paths("a\nb\nc/d/e\n", { maxNodes: 3 }));
    expect(error.code).toBe("LIMIT_EXCEEDED");
    expect(error.pos).toEqual({ line: 3 });
  });
});
