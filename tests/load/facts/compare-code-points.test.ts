import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { compareCodePoints } from "../../../src/load/facts/rollup-tree.js";

describe("compareCodePoints(a, b)", () => {
  it("orders as the UTF-8 bytes do (property)", () => {
    // RFC 3629, section 1: sorting UTF-8 strings by byte value gives the order of their code points.
    const text = fc.string({
      unit: fc.constantFrom("a", "z", "\u00e9", "\uD7FF", "\uE000", "\uFFFD", "\u{1F30A}", "\u{10000}"),
    });
    fc.assert(
      fc.property(text, text, (a, b) => {
        const bytes = Buffer.compare(Buffer.from(a, "utf8"), Buffer.from(b, "utf8"));
        expect(Math.sign(compareCodePoints(a, b))).toBe(bytes);
      }),
      { numRuns: 2000 },
    );
  });

  it("puts a code point above U+FFFF after U+E000..U+FFFF, unlike UTF-16 order", () => {
    // RFC 3629 section 1 (byte order is code point order); U+1F30A is 0xD83C 0xDF0A in UTF-16.
    expect(compareCodePoints("\u{1F30A}", "\uFFFD")).toBeGreaterThan(0);
    expect(compareCodePoints("x\uE000", "x\u{10000}")).toBeLessThan(0);
    expect("\u{1F30A}" < "\uFFFD").toBe(true);
  });
});
