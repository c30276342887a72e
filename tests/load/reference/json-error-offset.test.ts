import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { jsonErrorOffset } from "./json-error-offset.js";

/** V8's own offset, when its message gives one. */
function v8Offset(text: string): number | undefined {
  try {
    JSON.parse(text);
    return -1;
  } catch (error) {
    const at = /at position (\d+)/.exec((error as Error).message);
    return at ? Number(at[1]) : undefined;
  }
}

describe("jsonErrorOffset(text)", () => {
  it("jsonErrorOffset(text) is -1 for any valid JSON text", () => {
    // RFC 8259: JSON.stringify output is valid JSON text.
    fc.assert(fc.property(fc.json(), (text) => jsonErrorOffset(text) === -1));
  });

  it("jsonErrorOffset(text) puts the fault of a cut-off document at its end", () => {
    fc.assert(
      fc.property(fc.json(), fc.nat(), (text, cut) => {
        const prefix = text.slice(0, cut % (text.length + 1));
        const offset = jsonErrorOffset(prefix);
        return offset === -1 || offset === prefix.length;
      }),
    );
  });

  it("jsonErrorOffset(text) agrees with V8 wherever V8 gives a position", () => {
    fc.assert(
      fc.property(fc.json(), fc.nat(), fc.constantFrom(...'{}[],:"x01-.e \\tn'), (text, at, ch) => {
        const k = at % (text.length + 1);
        const broken = text.slice(0, k) + ch + text.slice(k);
        const expected = v8Offset(broken);
        return expected === undefined || jsonErrorOffset(broken) === expected;
      }),
      { numRuns: 2000 },
    );
  });

  it("jsonErrorOffset(text) finds faults V8 reports without a position", () => {
    // RFC 8259 section 2: the literal names are lowercase; section 5: no empty array elements.
    expect(jsonErrorOffset('{"a":}')).toBe(5);
    expect(jsonErrorOffset("[1,,2]")).toBe(3);
    expect(jsonErrorOffset('{"a": TRUE}')).toBe(6);
    expect(jsonErrorOffset('{"a": nulL}')).toBe(9);
  });
});
