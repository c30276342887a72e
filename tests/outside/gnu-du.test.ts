import { execFileSync } from "node:child_process";
import { linkSync, mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { loadTree } from "../../src/load/index.js";
import { defaultLoadOptions } from "../../src/load/load-options.js";
import { type Measures, measure } from "../../src/model/measure.js";
import type { Tree } from "../../src/model/tree.js";
import { isGnuTool, writeFiles } from "../helpers/file-tree.js";

// Source: GNU coreutils du -b (apparent size in bytes, including directory entries) vs our subtree sums.
// `du -b` is `--apparent-size --block-size=1`: for each directory, the sum of the sizes that
// `find -printf '%s'` prints for the directory itself and everything below it (files, directories, symlinks).
// The listing comes from GNU find's -printf, the path-list format espalier documents.

const gnuTools = isGnuTool("du") && isGnuTool("find");

/** Files of known sizes (bytes) below the tree root; directories are implied, plus those in `emptyDirs`. */
const files: Record<string, number> = {
  "README.md": 1234,
  "a/one.bin": 4097,
  "a/b/zero": 0,
  "a/b/c/deep.txt": 1000,
  "a/b/c/d/e/f/g/h/leaf.dat": 65537,
  "with space.txt": 123,
  "naïve-ø-潮汐.txt": 77,
  "dir with space/ünïcødé dir/x.json": 512,
  "wide/big.bin": 300000,
};
const emptyDirs = ["empty", "a/b/empty-too"];

let base = "";

beforeAll(() => {
  if (!gnuTools) return;
  base = mkdtempSync(join(tmpdir(), "espalier-du-"));
  const top = join(base, "tree-root");
  mkdirSync(top);
  writeFiles(top, files);
  // Enough entries that the directory may outgrow one block on some file systems.
  for (let k = 0; k < 300; k++)
    writeFileSync(join(top, "wide", `entry-${String(k).padStart(3, "0")}.txt`), "x");
  for (const d of emptyDirs) mkdirSync(join(top, d), { recursive: true });
  symlinkSync("../README.md", join(top, "a", "link-to-readme"));
});

afterAll(() => {
  if (base) rmSync(base, { recursive: true, force: true });
});

/** Node at `segments` below node 0, walking children in the pre-order layout. */
function findByPath(tree: Tree, m: Measures, segments: readonly string[]): number {
  let i = 0;
  for (const s of segments) {
    let found = -1;
    for (let c = i + 1; c < i + m.count[i]; c += m.count[c]) {
      if (tree.name.get(c) === s) {
        found = c;
        break;
      }
    }
    if (found < 0) return -1;
    i = found;
  }
  return i;
}

/** `du -b` lines: "<bytes>\t<path>", one per directory. */
function duSizes(cwd: string, start: string): Map<string, number> {
  const out = execFileSync("du", ["-b", start], { cwd, encoding: "utf8" });
  const sizes = new Map<string, number>();
  for (const line of out.split("\n")) {
    if (line === "") continue;
    const tab = line.indexOf("\t");
    sizes.set(line.slice(tab + 1), Number(line.slice(0, tab)));
  }
  return sizes;
}

describe.skipIf(!gnuTools)("loadTree(find -printf '%s\\t%p\\n' output, paths) against du -b", () => {
  // Started as "." from inside the tree, and by name from its parent directory.
  const cases = [
    { label: "find .", cwd: () => join(base, "tree-root"), start: "." },
    { label: "find tree-root", cwd: () => base, start: "tree-root" },
  ];
  const dirCount = () => {
    const dirs = new Set(["", ...emptyDirs]);
    for (const p of Object.keys(files)) {
      const parts = p.split("/");
      for (let k = 1; k < parts.length; k++) dirs.add(parts.slice(0, k).join("/"));
    }
    return dirs.size;
  };

  it.each(cases)("gives every directory the subtree size du -b reports ($label)", ({ cwd, start }) => {
    const listing = execFileSync("find", [start, "-printf", "%s\\t%p\\n"], { cwd: cwd(), encoding: "utf8" });
    const tree = loadTree(listing, { ...defaultLoadOptions, format: "paths" });
    const m = measure(tree);
    expect(tree.length).toBe(listing.split("\n").length - 1);

    const du = duSizes(cwd(), start);
    expect(du.size).toBe(dirCount());
    for (const [path, bytes] of du) {
      // du prints the start point first in every path; the tree's node 0 stands for it.
      const segments = path === start ? [] : path.slice(start.length + 1).split("/");
      const i = findByPath(tree, m, segments);
      expect(i, path).toBeGreaterThanOrEqual(0);
      expect(m.size[i], path).toBe(bytes);
    }
  });
});

describe.skipIf(!gnuTools)(
  "loadTree(find listings as engineers save them) against du -sb --apparent-size",
  () => {
    /** `du -sb --apparent-size DIR`: the whole folder's apparent size in bytes. */
    const duTotal = (dir: string) =>
      Number(execFileSync("du", ["-sb", "--apparent-size", dir], { encoding: "utf8" }).split("\t")[0]);
    const total = (tree: Tree) => measure(tree).size[0];

    it("reads -printf '%s\\t%P\\n' saved as .tsv: the empty path is the root, its size du's total", () => {
      const top = join(base, "tree-root");
      const listing = execFileSync("find", [top, "-printf", "%s\\t%P\\n"], { encoding: "utf8" });
      // GNU find prints the starting point first, with %P empty (find(1), -printf %P).
      expect(listing.startsWith(`${listing.split("\t")[0]}\t\n`)).toBe(true);
      const tree = loadTree(listing, { ...defaultLoadOptions, file: "listing.tsv", rootName: "listing.tsv" });
      expect(tree.reading?.shape).toBe("paths");
      expect(tree.syntheticRoot).toBe(false);
      expect(tree.length).toBe(listing.split("\n").length - 1);
      expect(total(tree)).toBe(duTotal(top));
    });

    it("reads absolute paths under one root named /", () => {
      const top = join(base, "tree-root");
      const listing = execFileSync("find", [top, "-printf", "%s\\t%p\\n"], { encoding: "utf8" });
      const tree = loadTree(listing, { ...defaultLoadOptions, format: "paths" });
      expect(tree.name.get(0)).toBe("/");
      const i = findByPath(tree, measure(tree), top.split("/").slice(1));
      expect(measure(tree).size[i]).toBe(duTotal(top));
    });

    it("reads -printf '%s\\t%P\\0' with nulSeparated, names holding line breaks included", () => {
      const top = join(base, "nul-root");
      mkdirSync(join(top, "two\nlines"), { recursive: true });
      writeFileSync(join(top, "two\nlines", "a\r.txt"), "abc");
      writeFileSync(join(top, "plain.txt"), "x".repeat(99));
      const listing = execFileSync("find", [top, "-printf", "%s\\t%P\\0"], { encoding: "utf8" });
      const tree = loadTree(listing, { ...defaultLoadOptions, format: "paths", nulSeparated: true });
      expect(tree.length).toBe(4);
      const m = measure(tree);
      expect(m.size[findByPath(tree, m, ["two\nlines", "a\r.txt"])]).toBe(3);
      expect(m.size[0]).toBe(duTotal(top));
    });

    it("reads a JSON document as values: the root's size is the file's byte length", () => {
      const file = join(base, "doc.json");
      writeFileSync(file, `${JSON.stringify({ tide: [1, 2, { 潮: "ü" }], q: null }, null, 2)}\n`);
      const text = execFileSync("cat", [file], { encoding: "utf8" });
      const tree = loadTree(text, { ...defaultLoadOptions, file: "doc.json" });
      expect(tree.reading?.shape).toBe("values");
      expect(total(tree)).toBe(duTotal(file));
    });
  },
);

describe.skipIf(!gnuTools)("loadTree(du -ab and du -b output itself, paths): folder lines are totals", () => {
  // Source: GNU coreutils du(1): -a lists files too, -b is --apparent-size --block-size=1, and each
  // directory is printed after its contents with the total of itself and everything below it.
  // Read as own sizes, every byte would count once per folder above it (found on `du -ab /usr/share/doc`:
  // 366.6 MiB for 107.2 MiB of entries).
  const duListing = (flags: string[]) =>
    execFileSync("du", [...flags, "tree-root"], { cwd: base, encoding: "utf8" });

  it.each([
    ["du -ab", ["-ab"]],
    ["du -b", ["-b"]],
  ])("%s: every folder's subtree size is du's line for it, and the reading says so", (_label, flags) => {
    const listing = duListing(flags);
    const tree = loadTree(listing, { ...defaultLoadOptions, format: "paths" });
    expect(tree.reading?.folderTotals).toBe(true);
    const m = measure(tree);
    const du = duSizes(base, "tree-root");
    for (const [path, bytes] of du) {
      const i = findByPath(tree, m, path === "tree-root" ? [] : path.slice("tree-root/".length).split("/"));
      expect(i, path).toBeGreaterThanOrEqual(0);
      expect(m.size[i], path).toBe(bytes);
    }
  });

  it("du -ab: a file's size is find's %s for it", () => {
    const tree = loadTree(duListing(["-ab"]), { ...defaultLoadOptions, format: "paths" });
    const m = measure(tree);
    const i = findByPath(tree, m, ["wide", "big.bin"]);
    expect(m.size[i]).toBe(files["wide/big.bin"]);
    expect(m.count[i]).toBe(1);
  });

  it("find -depth (each folder after its contents, own sizes) is not read as totals", () => {
    const listing = execFileSync("find", ["tree-root", "-depth", "-printf", "%s\\t%p\\n"], {
      cwd: base,
      encoding: "utf8",
    });
    const tree = loadTree(listing, { ...defaultLoadOptions, format: "paths" });
    expect(tree.reading?.folderTotals).toBeUndefined();
    expect(measure(tree).size[0]).toBe(duSizes(base, "tree-root").get("tree-root"));
  });
});

describe.skipIf(!gnuTools)(
  "loadTree(listings of a file with two names, paths): counted once per name listed",
  () => {
    // Source: GNU coreutils du(1): a file with several hard links is counted once (its first name met),
    // unless -l (--count-links) counts it per name; GNU find lists every name. docs/input.md, Hard links.
    const top = () => join(base, "linked-root");
    const sizeOf = (listing: string) =>
      measure(loadTree(listing, { ...defaultLoadOptions, format: "paths" })).size[0];
    const du = (flags: string) =>
      Number(execFileSync("du", [flags, top()], { encoding: "utf8" }).split("\n").at(-2)!.split("\t")[0]);

    beforeAll(() => {
      writeFiles(top(), { "charts/neap.bin": 5000, "tide.txt": 3 });
      mkdirSync(join(top(), "backup"));
      linkSync(join(top(), "charts", "neap.bin"), join(top(), "backup", "neap.bin"));
    });

    it("a find listing counts the file under both names: du -sbl's size, 5,000 bytes over du -sb's", () => {
      const size = sizeOf(execFileSync("find", [top(), "-printf", "%s\\t%p\\n"], { encoding: "utf8" }));
      expect(size).toBe(du("-sbl"));
      expect(size - du("-sb")).toBe(5000);
    });

    it("du -ab lists it once, at du -sb's size; du -abl under both names, at du -sbl's", () => {
      expect(sizeOf(execFileSync("du", ["-ab", top()], { encoding: "utf8" }))).toBe(du("-sb"));
      expect(sizeOf(execFileSync("du", ["-abl", top()], { encoding: "utf8" }))).toBe(du("-sbl"));
    });
  },
);
