import { describe, expect, it } from "vitest";
import { loadTree } from "../../src/load/index.js";
import { sizeTextHint } from "../../src/load/size-text-hint.js";
import { caught, opts } from "./helpers.js";

describe("sizeTextHint: what a size that is no number probably is", () => {
  it("names thousands separators, sizes with units and extra fields; nothing for other text", () => {
    expect(sizeTextHint("1,200")).toContain("thousands separators");
    expect(sizeTextHint("12,345,678.5")).toContain("thousands separators");
    expect(sizeTextHint("1.200.300")).toContain("thousands separators");
    // GNU du -h / ls -lh print sizes such as 4.0K, 12M, 1.5G (from memory: coreutils' human-readable form).
    for (const s of ["4.0K", "12M", "1.5G", "512B", "3 KiB", "20 bytes"])
      expect(sizeTextHint(s)).toContain("du -ab");
    // git-ls-tree(1) --long: "<mode> SP <type> SP <object> SP <object size> TAB <file>" (from memory).
    expect(sizeTextHint("100644 blob 44d8a528c3c6014a6f0aadb61613fec4ed4b53ae      69")).toContain(
      "git ls-tree",
    );
    for (const s of ["abc", "-5", "0x10", "NaN", "1,2", "12 apples"]) expect(sizeTextHint(s)).toBe("");
  });

  it("ends the BAD_SIZE of a path list and of a table cell", () => {
    const listing = caught(() => loadTree("4.0K\tdocs/a.txt\n", opts({ format: "paths" })));
    expect(listing.code).toBe("BAD_SIZE");
    expect(listing.message).toContain("du -ab");
    const table = caught(() =>
      loadTree('id,parent,cost\nQ1,,"1,200"\n', opts({ format: "csv", sizeField: "cost" })),
    );
    expect(table.code).toBe("BAD_SIZE");
    expect(table.message).toContain("thousands separators");
  });
});
