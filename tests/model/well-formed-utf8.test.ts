import { isUtf8 } from "node:buffer";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { wellFormedUtf8 } from "../../src/model/well-formed-utf8.js";

// The reference: Node's buffer.isUtf8 (node:buffer, the runtime's own validator), and the WHATWG
// decoder in fatal mode (TextDecoder), which refuses exactly the bytes that are not UTF-8.
const fatal = new TextDecoder("utf-8", { fatal: true });
const decodes = (bytes: Uint8Array) => {
  try {
    fatal.decode(bytes);
    return true;
  } catch {
    return false;
  }
};

// Bytes around every boundary of the Unicode Standard's table 3-7 (lead bytes C0..C2, DF..E0, ED, EF..F0,
// F4..F5, continuation bytes 7F..80, 8F..90, 9F..A0, BF..C0) and some of each kind.
const BYTES = [
  0x00, 0x41, 0x7f, 0x80, 0x8f, 0x90, 0x9f, 0xa0, 0xbf, 0xc0, 0xc1, 0xc2, 0xdf, 0xe0, 0xe1, 0xec, 0xed, 0xee,
  0xef, 0xf0, 0xf1, 0xf3, 0xf4, 0xf5, 0xff,
];

describe("wellFormedUtf8(bytes, from, to)", () => {
  it("says of any bytes what buffer.isUtf8 and a fatal TextDecoder say", () => {
    fc.assert(
      fc.property(
        fc.array(fc.constantFrom(...BYTES), { maxLength: 12 }),
        fc.nat(3),
        fc.nat(3),
        (list, head, tail) => {
          const bytes = Uint8Array.from([...Array(head).fill(0x62), ...list, ...Array(tail).fill(0x62)]);
          const part = bytes.subarray(head, head + list.length);
          expect(wellFormedUtf8(bytes, head, head + list.length)).toBe(isUtf8(part));
          expect(wellFormedUtf8(bytes, head, head + list.length)).toBe(decodes(part));
        },
      ),
      { numRuns: 5000 },
    );
  });

  it("takes the text of any string, and no lone surrogate", () => {
    fc.assert(
      fc.property(fc.string({ unit: "binary" }), (text) => {
        const bytes = Buffer.from(text, "utf8");
        expect(wellFormedUtf8(bytes, 0, bytes.length)).toBe(true);
      }),
    );
    // CESU-8's lone high surrogate U+D800 (ED A0 80) and an overlong "/" (C0 AF) are no UTF-8.
    expect(wellFormedUtf8(Uint8Array.from([0xed, 0xa0, 0x80]), 0, 3)).toBe(false);
    expect(wellFormedUtf8(Uint8Array.from([0xc0, 0xaf]), 0, 2)).toBe(false);
  });
});
