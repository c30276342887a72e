import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ByteIdIndex, viewOf } from "../../../src/load/table/byte-id-index.js";
import { IdIndex } from "../../../src/load/table/id-index.js";
import { NamePool } from "../../../src/model/names.js";

/** A pool of `ids` and a ByteIdIndex filled with them, row by row; what `add` answered for each. */
function indexOf(ids: string[]): { index: ByteIdIndex; added: number[] } {
  const pool = NamePool.from(ids);
  const index = new ByteIdIndex(pool.byteRuns()!, ids.length);
  return { index, added: ids.map((_, row) => index.add(row)) };
}

/** The row ByteIdIndex finds for `text` given as bytes. */
function byBytes(index: ByteIdIndex, text: string): number {
  const bytes = Buffer.from(`..${text}`, "utf8");
  return index.getBytes(viewOf(bytes), 2, bytes.length);
}

// Ids as a table writes them: plain numbers small and large, leading zeros, past 2^31, text, non-ASCII.
const idText = fc.oneof(
  fc.nat({ max: 40 }).map(String),
  fc.nat({ max: 5000 }).map((n) => `${n * 1000}`),
  fc.nat({ max: 40 }).map((n) => `0${n}`),
  fc.nat({ max: 40 }).map((n) => `${n + 2_147_483_640}`),
  fc.nat({ max: 40 }).map((n) => `${n}000000000000`),
  fc.string({ maxLength: 6 }),
  fc.constantFrom("日本", "é", "q7", "Q2417", ""),
);

describe("ByteIdIndex", () => {
  it("ByteIdIndex answers as IdIndex does for the same ids as text, on random ids (common practice, no source: IdIndex is the reference)", () => {
    fc.assert(
      fc.property(fc.array(idText, { maxLength: 40 }), fc.array(idText, { maxLength: 20 }), (ids, probes) => {
        const reference = new IdIndex(new Array(ids.length));
        const expectedAdds = ids.map((id, row) => reference.add(id, row));
        const { index, added } = indexOf(ids);
        expect(added).toEqual(expectedAdds);
        for (const probe of [...ids, ...probes]) {
          expect(byBytes(index, probe)).toBe(reference.get(probe));
          // A cell of plain digits is looked up by its number, standing for the same digits.
          if (/^(0|[1-9]\d{0,14})$/.test(probe))
            expect(index.getNumber(Number(probe))).toBe(reference.get(Number(probe)));
        }
      }),
      { numRuns: 300 },
    );
  });

  it("ByteIdIndex tells apart 12 and 012, and finds ids past the table by number by their digits", () => {
    const { index, added } = indexOf(["12", "012", "0", "q7", "4000000000", "1000", "12"]);
    expect(added).toEqual([-1, -1, -1, -1, -1, -1, 0]);
    expect([12, 0, 4_000_000_000, 1000, 7].map((n) => index.getNumber(n))).toEqual([0, 2, 4, 5, -1]);
    expect(["012", "q7", "00", "4000000000"].map((id) => byBytes(index, id))).toEqual([1, 3, -1, 4]);
  });
});
