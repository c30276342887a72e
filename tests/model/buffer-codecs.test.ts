import { Buffer } from "node:buffer";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { byteCodecs, hasInternalCodecs } from "../../src/model/buffer-codecs.js";

describe("buffer-codecs", () => {
  it("this Node still has Buffer's undocumented utf8Slice, latin1Slice and utf8Write", () => {
    // When this fails, Node dropped them: espalier still works through toString/write (the fallback
    // below), only slower; look for their replacement before the next release.
    expect(hasInternalCodecs).toBe(true);
  });

  for (const useInternal of [true, false]) {
    const { utf8Slice, latin1Slice, utf8Write } = byteCodecs(useInternal);
    const which = useInternal ? "Buffer's own codecs" : "the toString/write fallback";

    it(`byteCodecs(${useInternal}) decodes any byte range as Buffer.toString does (${which})`, () => {
      // Buffer.toString("utf8"/"latin1") is Node's documented decoder: the reference answer.
      fc.assert(
        fc.property(fc.uint8Array({ maxLength: 64 }), fc.nat(), fc.nat(), (bytes, a, b) => {
          const buf = Buffer.from(bytes);
          const s = a % (buf.length + 1);
          const e = s + (b % (buf.length - s + 1));
          expect(utf8Slice(buf, s, e)).toBe(buf.toString("utf8", s, e));
          expect(latin1Slice(buf, s, e)).toBe(buf.toString("latin1", s, e));
        }),
      );
    });

    it(`byteCodecs(${useInternal}) writes text as Buffer.write does (${which})`, () => {
      fc.assert(
        fc.property(fc.string({ unit: "binary" }), fc.nat({ max: 8 }), (text, offset) => {
          const a = Buffer.alloc(offset + text.length * 3);
          const b = Buffer.alloc(offset + text.length * 3);
          expect(utf8Write(a, text, offset, text.length * 3)).toBe(b.write(text, offset, "utf8"));
          expect(a.equals(b)).toBe(true);
        }),
      );
    });
  }
});
