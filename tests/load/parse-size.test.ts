import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { loadTree } from "../../src/load/index.js";
import { parseSize } from "../../src/load/parse-size.js";
import { opts, outline } from "./helpers.js";

describe("parseSize(text)", () => {
  it("parseSize(text) reads plain decimal numbers and treats an empty cell as 0", () => {
    expect(parseSize("")).toBe(0);
    expect(parseSize(" 12 ")).toBe(12);
    expect(parseSize("1.5")).toBe(1.5);
    expect(parseSize(".5")).toBe(0.5);
    expect(parseSize("2e3")).toBe(2000);
    expect(parseSize("+7")).toBe(7);
  });

  it("parseSize(text) is NaN for negative, hex, suffixed or non-finite sizes, and past 2^53 - 1", () => {
    for (const text of [
      "-1",
      "0x10",
      "4.0K",
      "NaN",
      "Infinity",
      "1e999",
      "1,000",
      ".",
      "9007199254740992",
      "1e16",
    ]) {
      expect(parseSize(text)).toBeNaN();
    }
  });
});

describe("parseSize(text) property", () => {
  it("parseSize(text) reads back any number from 0 to 2^53 - 1 that JavaScript prints", () => {
    fc.assert(
      fc.property(
        fc.oneof(fc.nat(), fc.maxSafeNat(), fc.double({ min: 0, max: Number.MAX_SAFE_INTEGER, noNaN: true })),
        (n) => parseSize(String(n)) === n,
      ),
    );
  });
});

describe("a size of -0 in every format", () => {
  // RFC 8259 section 6: a number may carry a minus sign, so -0 is valid JSON; YAML 1.2.2 10.3.2 (core
  // schema int) reads -0 as an integer; IEEE 754 -0 equals +0. So a size written -0 is the size 0 in
  // JSON, YAML, CSV and a path list alike, and never a BAD_SIZE in one of them only.
  it("parseSize reads -0, -0.0 and -0e3 as 0 (not -0), and still refuses any negative size", () => {
    for (const text of ["-0", "-0.0", "-0e3", "-.0"]) expect(Object.is(parseSize(text), 0)).toBe(true);
    for (const text of ["-1", "-0.5", "-1e-3"]) expect(parseSize(text)).toBeNaN();
  });

  it("loadTree gives the root size 0 from -0 in JSON, YAML, CSV and a path list", () => {
    const trees = [
      loadTree('{"name":"r","size":-0}', opts({ format: "json" })),
      loadTree("name: r\nsize: -0\n", opts({ format: "yaml" })),
      loadTree("id,parent,size\nr,,-0\n", opts({ format: "csv" })),
      loadTree("-0\tr\n", opts({ format: "paths" })),
    ];
    for (const tree of trees) {
      const root = tree.length === 1 ? 0 : 1; // a path list's "r" sits under the root espalier adds
      expect(Object.is(tree.ownSize[root], 0), outline(tree).join("|")).toBe(true);
    }
  });
});
