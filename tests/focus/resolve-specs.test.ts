import { describe, expect, it } from "vitest";
import type { FocusSpec } from "../../src/focus/focus-spec.js";
import { listedNode } from "../../src/focus/listed-node.js";
import { resolveSpecs } from "../../src/focus/resolve-specs.js";
import { loadTree } from "../../src/load/index.js";
import { defaultLoadOptions } from "../../src/load/load-options.js";
import { measure } from "../../src/model/measure.js";
import { PathIndex } from "../../src/model/path-index.js";
import { pseudonym } from "../../src/model/pseudonym.js";
import type { Tree } from "../../src/model/tree.js";
import { caught } from "../load/helpers.js";

const indexOf = (tree: Tree) => new PathIndex(tree, measure(tree));
const paths = (text: string, file = "files.paths") =>
  loadTree(text, { ...defaultLoadOptions, file, rootName: file });
const listed = (...lines: string[]): FocusSpec[] => lines.map((l, k) => ({ listed: l, line: k + 1 }));

// A listing as `git ls-files` prints one (paths relative to the top, `/`-separated); the names are
// invented, one with a `~` and one with glob characters, which are ordinary characters in a file name
// (POSIX.1-2017 §3.170: a file name holds any byte but `/` and NUL; from memory).
const LISTING = [
  "ledger/lib/jsr305-0.1~+svn49.jar",
  "ledger/lib/core.jar",
  "ledger/notes [draft]*.md",
  "ledger/src/main.ts",
  "riptide/src/main.ts",
].join("\n");

describe("listedNode(index, line)", () => {
  const tree = paths(LISTING);
  const index = indexOf(tree);
  const name = (node: number) => (node < 0 ? null : index.path(node));

  it("takes a `~` as part of a name, not as an escape", () => {
    expect(name(listedNode(index, "ledger/lib/jsr305-0.1~+svn49.jar"))).toBe(
      "ledger/lib/jsr305-0.1~0+svn49.jar",
    );
  });

  it("takes glob characters literally: a line names one file, never a pattern", () => {
    expect(name(listedNode(index, "ledger/notes [draft]*.md"))).toBe("ledger/notes [draft]*.md");
    expect(listedNode(index, "ledger/lib/*.jar")).toBe(-1);
    expect(listedNode(index, "**/main.ts")).toBe(-1);
  });

  it("drops a leading ./ or /, a trailing / and doubled slashes, as find and shells print them", () => {
    for (const line of ["./ledger/src/main.ts", "/ledger/src/main.ts", "ledger//src/main.ts"])
      expect(name(listedNode(index, line)), line).toBe("ledger/src/main.ts");
    expect(name(listedNode(index, "ledger/src/"))).toBe("ledger/src");
  });

  it("accepts a path that starts with the root's own name (a listing under one top folder)", () => {
    const under = paths("tidewater/a/x\ntidewater/a/y\ntidewater/b\n");
    expect(under.name.get(0)).toBe("tidewater");
    const i = indexOf(under);
    expect(i.path(listedNode(i, "tidewater/a/x"))).toBe("a/x");
    expect(i.path(listedNode(i, "a/x"))).toBe("a/x");
  });

  it("is -1 for a path that is not there (a file deleted since the listing)", () => {
    expect(listedNode(index, "ledger/src/gone.ts")).toBe(-1);
  });
});

describe("resolveSpecs(index, specs, key, unmatched)", () => {
  const tree = paths(LISTING);
  const index = indexOf(tree);

  it("fails on a listed line that matches nothing by default, naming the line number", () => {
    const err = caught(() => resolveSpecs(index, listed("ledger/src/main.ts", "ledger/src/gone.ts")));
    expect(err.code).toBe("FOCUS_NO_MATCH");
    expect(err.details).toMatchObject({ line: 2 });
  });

  it("with 'skip', leaves out and lists the unmatched lines and --focus specs, and keeps the rest", () => {
    const specs: FocusSpec[] = ["riptide/nope", ...listed("ledger/src/gone.ts", "ledger/src/main.ts")];
    const r = resolveSpecs(index, specs, undefined, "skip");
    expect([...r.foci].map((i) => index.path(i))).toEqual(["ledger/src/main.ts"]);
    expect(r.unmatched).toEqual(["riptide/nope", "ledger/src/gone.ts"]);
  });

  it("with 'skip' and nothing matched, has no foci and lists every line", () => {
    const r = resolveSpecs(index, listed("a", "b"), undefined, "skip");
    expect(r.foci.length).toBe(0);
    expect(r.unmatched).toEqual(["a", "b"]);
  });

  it("never expands a listed glob, even when skipping", () => {
    const r = resolveSpecs(index, listed("ledger/lib/*.jar"), undefined, "skip");
    expect(r.foci.length).toBe(0);
    expect(r.unmatched).toEqual(["ledger/lib/*.jar"]);
    expect(caught(() => resolveSpecs(index, listed("ledger/lib/*.jar"))).code).toBe("FOCUS_NO_MATCH");
  });

  it("reads a line as espalier prints paths when no literal path matches (a list the view wrote)", () => {
    // A name holding "/" prints escaped (RFC 6901 §3: "/" -> "~1"); the literal path cannot name it.
    const doc = loadTree('{"name":"r","children":[{"name":"a/b"},{"name":"c"}]}', {
      ...defaultLoadOptions,
      file: "d.json",
    });
    const i = indexOf(doc);
    const r = resolveSpecs(i, listed("a~1b"));
    expect([...r.foci].map((n) => doc.name.get(n))).toEqual(["a/b"]);
    // A pseudonymous path as the view writes it under a key reads back with the same key.
    const key = "test-secret";
    const hidden = resolveSpecs(i, listed(pseudonym(key, "c")), key);
    expect([...hidden.foci].map((n) => doc.name.get(n))).toEqual(["c"]);
  });

  it("lists unmatched foci as pseudonyms under a key, never as given", () => {
    const key = "test-secret";
    const r = resolveSpecs(index, listed("ledger/src/gone.ts"), key, "skip");
    expect(r.unmatched).toEqual([
      `${pseudonym(key, "ledger")}/${pseudonym(key, "src")}/${pseudonym(key, "gone.ts")}`,
    ]);
  });

  it("resolves --focus strings as before: globs expand there", () => {
    const r = resolveSpecs(index, ["ledger/lib/*.jar"]);
    expect(r.foci.length).toBe(2);
  });
});
