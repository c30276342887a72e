import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { compileWildcard, matchWildcard, wildcardWork } from "../../src/focus/wildcard.js";

/**
 * The reference: an ECMAScript regular expression (ECMA-262, section 22.2) with the literal pieces escaped
 * and `*` as `.*`; the `s` flag lets `.` match line breaks and the `u` flag makes it match code points.
 * It backtracks, so it is only run on short inputs.
 */
function byRegExp(pattern: string, name: string): boolean {
  const source = pattern
    .split("*")
    .map((part) => part.replace(/[.*+?^${}()|[\]\\]/g, "\\$&"))
    .join(".*");
  return new RegExp(`^${source}$`, "su").test(name);
}

// Few letters, so matches and near misses both happen; a surrogate pair and lone surrogates, so
// matching by code point (not by code unit) is exercised.
const letter = fc.constantFrom("a", "b", "ab", "\u{1F600}", "\ud83d", "\ude00", "\n", "~");
const nameArb = fc.array(letter, { maxLength: 12 }).map((xs) => xs.join(""));
const patternArb = fc.array(fc.oneof(letter, fc.constant("*")), { maxLength: 8 }).map((xs) => xs.join(""));

describe("matchWildcard(compileWildcard(pattern), name)", () => {
  it("agrees with the ECMAScript RegExp of the same pattern (property)", () => {
    fc.assert(
      fc.property(patternArb, nameArb, (pattern, name) => {
        expect(matchWildcard(compileWildcard(pattern), name)).toBe(byRegExp(pattern, name));
      }),
      { numRuns: 2000 },
    );
  });

  it("matches every name built by filling the stars of a pattern (property; well-formed text)", () => {
    const word = fc
      .array(fc.constantFrom("a", "b", "\u{1F600}", "~"), { maxLength: 6 })
      .map((xs) => xs.join(""));
    fc.assert(
      fc.property(
        fc.array(word, { minLength: 1, maxLength: 5 }),
        fc.array(word, { minLength: 5, maxLength: 5 }),
        (lits, fill) => {
          const pattern = lits.join("*");
          const name = lits.map((l, k) => (k === 0 ? l : `${fill[k]}${l}`)).join("");
          expect(matchWildcard(compileWildcard(pattern), name)).toBe(true);
        },
      ),
    );
  });

  it("takes * as any run of code points, none included", () => {
    const w = compileWildcard("a*b*c");
    expect(matchWildcard(w, "abc")).toBe(true);
    expect(matchWildcard(w, "a-b-c")).toBe(true);
    expect(matchWildcard(w, "acb")).toBe(false);
    expect(matchWildcard(compileWildcard("*"), "")).toBe(true);
    expect(matchWildcard(compileWildcard("**x"), "x")).toBe(true);
    expect(matchWildcard(compileWildcard("plain"), "plain")).toBe(true);
    expect(matchWildcard(compileWildcard("plain"), "plainer")).toBe(false);
    // A piece may overlap neither the head nor the tail: "aba" needs two a's around the b.
    expect(matchWildcard(compileWildcard("a*a"), "a")).toBe(false);
    expect(matchWildcard(compileWildcard("ab*ba"), "aba")).toBe(false);
  });

  // Benchmark-style bound, counted, not timed: a backtracking matcher needs about n^k/k! steps for k
  // stars on these names; KMP needs at most 2 comparisons per character scanned, plus the head and the
  // tail, so at most 3n + 1 comparisons for a name of n code units (Knuth, Morris, Pratt 1977, section 2).
  it("costs at most 3n + 1 comparisons whatever the pattern (adversarial patterns)", () => {
    const n = 100_000;
    const cases: [string, string][] = [
      [`${"*a".repeat(16)}*b`, "a".repeat(n)],
      [`${"*a".repeat(16)}*b`, `${"a".repeat(n - 1)}b`],
      [`*${"a".repeat(50)}b*`, "a".repeat(n)],
      [`*${"ab".repeat(40)}c*`, "ab".repeat(n / 2)],
      [`${"a*".repeat(500)}`, "a".repeat(n)],
      [`*${"aaab".repeat(100)}*`, "aaa".repeat(n / 3)],
    ];
    for (const [pattern, name] of cases) {
      const w = compileWildcard(pattern);
      wildcardWork.comparisons = 0;
      matchWildcard(w, name);
      expect(wildcardWork.comparisons, pattern.slice(0, 40)).toBeLessThanOrEqual(3 * name.length + 1);
    }
  });

  it("never matches half of a surrogate pair (matching is by code point)", () => {
    const pair = "\u{1F600}"; // \ud83d\ude00
    expect(matchWildcard(compileWildcard("*\ud83d"), pair)).toBe(false);
    expect(matchWildcard(compileWildcard("\ude00*"), pair)).toBe(false);
    expect(matchWildcard(compileWildcard("*\ude00*"), `x${pair}x`)).toBe(false);
    expect(matchWildcard(compileWildcard("*\ud83d*"), `x\ud83dx`)).toBe(true);
    expect(matchWildcard(compileWildcard(`*${pair}*`), `x${pair}x`)).toBe(true);
  });
});
