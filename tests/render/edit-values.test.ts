import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { MAX_LABEL } from "../../src/model/safe-text.js";
import { editValues } from "../../src/render/edit-values.js";
import { cli } from "../helpers/cli.js";

/** The text of `shown` without its `[...]` markers at either end. */
const inner = (shown: string) => shown.replace(/^\[\.\.\.\]/, "").replace(/\[\.\.\.\]$/, "");

describe("editValues(old, new)", () => {
  it("returns values that fit as they are", () => {
    expect(editValues("1.4.0", "1.5.0")).toEqual(["1.4.0", "1.5.0"]);
    expect(editValues("", "x".repeat(MAX_LABEL))).toEqual(["", "x".repeat(MAX_LABEL)]);
  });

  it("leaves out the long ends both share, keeping the part that changed", () => {
    const before = `${"a".repeat(300)}shed-4${"z".repeat(300)}`;
    const after = `${"a".repeat(300)}shed-5${"z".repeat(300)}`;
    const [old, now] = editValues(before, after);
    expect(old).toMatch(/^\[\.\.\.\]a+shed-4z+\[\.\.\.\]$/);
    expect(now).toMatch(/^\[\.\.\.\]a+shed-5z+\[\.\.\.\]$/);
    expect(old.length).toBeLessThan(MAX_LABEL);
  });

  it("keeps, of any two long values, a slice of each that still differs and is in it", () => {
    fc.assert(
      fc.property(
        fc.string({ maxLength: 400 }),
        fc.string({ maxLength: 40 }),
        fc.string({ maxLength: 40 }),
        fc.string({ maxLength: 400 }),
        (head, a, b, tail) => {
          const before = head + a + tail;
          const after = head + b + tail;
          const [old, now] = editValues(before, after, 100);
          expect(before.includes(inner(old))).toBe(true);
          expect(after.includes(inner(now))).toBe(true);
          if (before !== after) expect(inner(old)).not.toBe(inner(now));
        },
      ),
    );
  });
});

describe("espalier diff: a long field that changed inside", () => {
  it("shows on the edit's line the words that changed, not the ends both share", async () => {
    // An invented team charter, 500 characters long, one word changed in its middle.
    const charter = (word: string) =>
      `${"Keeps the depot's tide tables. ".repeat(8)}${word}${" Signs off each berth plan.".repeat(8)}`;
    const table = (word: string) =>
      `id,manager,name,charter\nT1,,depot,"${charter(word)}"\nT2,T1,berths,short\n`;
    const result = await cli(
      ["diff", "old.csv", "new.csv", "--parent-field", "manager", "--compare-field", "charter"],
      {
        files: { "old.csv": table("Quarterly."), "new.csv": table("Monthly.") },
      },
    );
    expect(result.code).toBe(0);
    const line = result.stdout.split("\n").find((l) => l.includes("[edited charter"))!;
    expect(line).toMatch(
      /\[edited charter \[\.\.\.\].*Quarterly\..*\[\.\.\.\] -> \[\.\.\.\].*Monthly\..*\[\.\.\.\]\] depot/,
    );
  });
});
