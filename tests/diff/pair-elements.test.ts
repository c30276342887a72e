import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { commonSubsequence } from "../../src/diff/pair-elements.js";

/** Length of a longest common subsequence by plain recursion over prefixes (the textbook definition). */
function lcsLength(a: readonly string[], b: readonly string[]): number {
  const memo = new Map<string, number>();
  const go = (i: number, j: number): number => {
    if (i === a.length || j === b.length) return 0;
    const key = `${i},${j}`;
    const hit = memo.get(key);
    if (hit !== undefined) return hit;
    const v = a[i] === b[j] ? 1 + go(i + 1, j + 1) : Math.max(go(i + 1, j), go(i, j + 1));
    memo.set(key, v);
    return v;
  };
  return go(0, 0);
}

describe("commonSubsequence(a, b)", () => {
  it("returns ascending index pairs of equal keys, as long as a longest common subsequence", () => {
    // The longest-common-subsequence problem as a line diff solves it (Hunt and McIlroy, 1976): the
    // pairs are a common subsequence (both indices rising, keys equal) of the greatest length.
    const keys = fc.array(fc.constantFrom("ledger", "harbour", "kelp", "audit", "tern"), { maxLength: 12 });
    fc.assert(
      fc.property(keys, keys, (a, b) => {
        const pairs = commonSubsequence(a, b);
        for (let k = 0; k < pairs.length; k += 2) {
          expect(a[pairs[k]]).toBe(b[pairs[k + 1]]);
          if (k > 0) {
            expect(pairs[k]).toBeGreaterThan(pairs[k - 2]);
            expect(pairs[k + 1]).toBeGreaterThan(pairs[k - 1]);
          }
        }
        expect(pairs.length / 2).toBe(lcsLength(a, b));
      }),
      { seed: 4180, numRuns: 400 },
    );
  });

  it("keeps an element put first apart and pairs the rest in place", () => {
    expect(commonSubsequence(["ledger", "kelp"], ["audit", "ledger", "kelp"])).toEqual([0, 1, 1, 2]);
    expect(commonSubsequence([], ["audit"])).toEqual([]);
  });
});
