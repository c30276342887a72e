import { describe, expect, it } from "vitest";
import { loadTree } from "../../../src/load/index.js";
import { defaultLoadOptions, type LoadOptions } from "../../../src/load/load-options.js";
import { caught as errorOf } from "../helpers.js";

const load = (text: string, options: Partial<LoadOptions> = {}) =>
  loadTree(text, { ...defaultLoadOptions, file: "listing.txt", ...options });

// Shapes as GNU find -printf '%s %p\n' and GNU wc -c print them (a space, not a tab, after the size);
// paths invented. Read as names, each size would become a top-level folder and exit 0.
describe("path lists whose every line starts with a number and a space", () => {
  it("are PARSE_PATHS at the first line, naming the tab form, when the format was detected", () => {
    // find DIR -printf '%s %P\n': relative paths, not told apart from names that start with a number.
    const find = "890 harbor/tide.log\n8038 harbor/charts/reef.svg\n";
    const e = errorOf(() => load(find));
    expect(e.code).toBe("PARSE_PATHS");
    expect(e.pos).toMatchObject({ line: 1, column: 1 });
    expect(e.message).toContain("'%s\\t%p\\n'");
    const wc = "\n   890 harbor/tide.log\n  8038 harbor/charts/reef.svg\n  8928 total\n";
    expect(errorOf(() => load(wc)).pos).toMatchObject({ line: 2, column: 1 });
  });

  it("are read as sizes when the first path starts with ./ or / (find . or find /DIR -printf '%s %p\\n')", () => {
    const tree = load("890 ./harbor/tide.log\n8038 ./harbor/charts/reef.svg\n");
    expect(tree.hasSizes).toBe(true);
    expect(tree.length).toBe(5);
  });

  it("read as paths with --input-format paths, and as usual when one line does not start so", () => {
    const album = "01 Tidal Overture.flac\n02 Reef Song.flac\n";
    expect(load(album, { format: "paths" }).length).toBe(3);
    expect(load("01 Tidal Overture.flac\nbooklet.pdf\n").length).toBe(3);
  });
});
