import { describe, expect, it } from "vitest";
import { formatCount } from "../../src/render/amount.js";
import { parentsText, referencesText } from "../../src/render/reference-text.js";

describe("referencesText and parentsText", () => {
  it("write their counts as every other count is written: grouped, compact when asked", () => {
    // The same style as a fold's node count (formatCount): a reader compares them on one line.
    expect(referencesText(1)).toBe(", 1 reference");
    expect(referencesText(1449)).toBe(`, ${formatCount(1449)} references`);
    expect(referencesText(1449)).toBe(", 1,449 references");
    expect(referencesText(123_456, true)).toBe(", 123k references");
    expect(referencesText(0)).toBe("");
    expect(referencesText(undefined)).toBe("");
    expect(parentsText({ count: 1_200, hidden: 1_199 })).toBe("1,200 parents, 1,199 not shown");
    expect(parentsText({ count: 2, hidden: 0 })).toBe("2 parents");
    expect(parentsText({ count: 1, hidden: 0 })).toBe("");
  });
});
