import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { parseSize } from "../../src/load/parse-size.js";

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
