import { describe, expect, it } from "vitest";
import { loadTree } from "../../../src/load/index.js";
import { loadTreeFromStream } from "../../../src/load/stream/index.js";
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
    // An entry is its whole line: column 1.
    expect(error.pos).toEqual({ file: "tree.txt", line: 4, column: 1 });
    expect(error.details).toEqual({ firstLine: 2 });
  });

  it("loadTree(paths) finds a folder's entries again when a listing comes back to it after others", () => {
    // Names are found among a folder's children while it stays on the walk (src/load/open-folders.ts):
    // here `a/b` is left for `c` and come back to, and `b` is left for `b.txt` (a sorted listing puts
    // "b.txt" before "b/x": "." sorts before "/").
    const tree = paths("a/b/x\nc/y\na/b/z\na/b\na/b.txt\na/b/w\n", { rootName: "top" });
    expect(outline(tree)).toEqual([
      "top",
      "  a",
      "    b",
      "      x",
      "      z",
      "      w",
      "    b.txt",
      "  c",
      "    y",
    ]);
    const error = caught(() => paths("a/b/x\nc/y\na/b/z\na/b/x\n"));
    expect(error.code).toBe("DUPLICATE_PATH");
    expect(error.pos).toEqual({ line: 4, column: 1 });
    expect(error.details).toEqual({ firstLine: 1 });
  });

  it("loadTree(paths) rejects a size that is not a number >= 0 as BAD_SIZE at its line", () => {
    const error = caught(() => paths("1\ta\n4.0K\ta/b\n"));
    expect(error.code).toBe("BAD_SIZE");
    expect(error.pos).toEqual({ line: 2, column: 1 });
  });

  it("loadTree(paths) requires a size column on every line once the first line has one", () => {
    const error = caught(() => paths("1\ta\na/b\n"));
    expect(error.code).toBe("PARSE_PATHS");
    expect(error.pos).toEqual({ line: 2, column: 1 });
  });

  it("loadTree(paths) reads a size with an empty path as the root, as find -printf '%s\\t%P\\n' lists the start", () => {
    // GNU find's manual: %P is the file's name with the starting point removed, so the start is "".
    const tree = paths("4096\t\n10\ta\n4096\tb\n5\tb/c\n", { rootName: "listing" });
    expect(outline(tree)).toEqual(["listing 4096", "  a 10", "  b 4096", "    c 5"]);
    expect(tree.syntheticRoot).toBe(false);
    // The root stands for the listed folder (a diff compares it with the other version's root).
    expect(tree.reading).toEqual({ shape: "paths", sizeUnit: "bytes", rootIsStart: true });
    expect(paths("10\t./a\n5\t./b\n").reading?.rootIsStart).toBe(true);
    expect(paths("10\tproj/a\n5\tproj/b\n").reading?.rootIsStart).toBeUndefined();
    // The root may come anywhere; a second one is a repeated path.
    expect(outline(paths("10\ta\n7\t\n", { rootName: "r" }))).toEqual(["r 7", "  a 10"]);
    const twice = caught(() => paths("1\t\n2\ta\n3\t\n"));
    expect(twice.code).toBe("DUPLICATE_PATH");
    expect(twice.pos).toEqual({ line: 3, column: 1 });
  });

  it("loadTree(paths) with nulSeparated reads entries ended by NUL, names with line breaks included", () => {
    // find -print0 and git ls-files -z end each name with a NUL byte (their manuals).
    const tree = paths("a/two\nlines\0a/b\r\0c\0", { nulSeparated: true, rootName: "r" });
    expect([...Array(tree.length).keys()].map((i) => tree.name.get(i))).toEqual([
      "r",
      "a",
      "two\nlines",
      "b\r",
      "c",
    ]);
    const sized = paths("3\ta b\0\0" + "4\tc\0", { nulSeparated: true, rootName: "r" });
    expect(outline(sized)).toEqual(["r 0", "  a b 3", "  c 4"]);
  });

  it("loadTree(paths) refuses a NUL byte in a line-separated list instead of reading it as a name", () => {
    // No file name holds a NUL byte (POSIX.1-2017, 3.170 Filename; from memory): find -print0 output
    // read without --nul-separated must not become one long chain of odd names with exit 0.
    const print0 = caught(() => paths("a/b\0a/c\0"));
    expect(print0.code).toBe("PARSE_PATHS");
    expect(print0.pos).toEqual({ line: 1, column: 4 });
    const later = caught(() => paths("a\n\nb/é\0c\n"));
    expect(later.code).toBe("PARSE_PATHS");
    expect(later.pos).toEqual({ line: 3, column: 4 });
    // The same bytes with the option are the list they are.
    expect(outline(paths("a/b\0a/c\0", { nulSeparated: true }))).toEqual(["a", "  b", "  c"]);
  });

  it("loadTree(paths) with nulSeparated refuses a list of one path per line instead of reading it as one entry", async () => {
    // du -ab and find -printf '%s\t%p\n' end each entry with a line break; find -print0 and git ls-files -z
    // end every entry, the last too, with NUL (their manuals; from memory). Read as one entry, du's
    // listing was "57 nodes, size 3 B" with exit 0 (espalier - --nul-separated, du -ab of a small folder).
    const du = "3\t/quill/nl\n4099\t/quill\n";
    const whole = caught(() => paths(du, { nulSeparated: true }));
    expect(whole.code).toBe("PARSE_PATHS");
    expect(whole.pos).toEqual({ line: 1, column: 12 });
    // Streamed in chunks, and past the longest line: the same error, not LIMIT_EXCEEDED.
    const limits = { maxLineBytes: 14 };
    const streamed = await loadTreeFromStream(
      (async function* () {
        for (let at = 0; at < du.length; at += 3) yield Buffer.from(du.slice(at, at + 3));
      })(),
      opts({ format: "paths", nulSeparated: true, limits }),
    ).catch((e: unknown) => e);
    expect(streamed).toMatchObject({ code: "PARSE_PATHS", pos: { line: 1, column: 12 } });
    // One path with no end and no line break is still one path; a NUL anywhere makes breaks part of names.
    expect(outline(paths("quill/a b", { nulSeparated: true }))).toEqual(["quill", "  a b"]);
    expect(outline(paths("quill/two\nlines\0quill/c", { nulSeparated: true }))).toEqual([
      "quill",
      "  two\nlines",
      "  c",
    ]);
  });

  it("loadTree(paths) stops with LIMIT_EXCEEDED at the line that adds one node too many", () => {
    const error = caught(() => paths("a\nb\nc/d/e\n", { maxNodes: 3 }));
    expect(error.code).toBe("LIMIT_EXCEEDED");
    expect(error.pos).toEqual({ line: 3 });
  });
});
