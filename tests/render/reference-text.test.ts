import { describe, expect, it } from "vitest";
import { formatCount } from "../../src/render/amount.js";
import { parentsText, referencesText } from "../../src/render/reference-text.js";
import { cli } from "../helpers/cli.js";

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

describe("a reference line too narrow for where its full entry is", () => {
  // Field test: `& @tidewater/ledger-core  ?` at 60 columns, a `?` the key calls a count cut, on a
  // line that carries no count. The mark alone says the entry is elsewhere.
  const args = [
    "fixtures/tidewater-deps.edges",
    "--input-format",
    "edges",
    "--nodes",
    "fixtures/tidewater-packages.csv",
    "--focus",
    "mooring-log",
    "--budget",
    "12",
  ];

  it("leaves the path out, never prints a '?' for it, at any width", async () => {
    let bare = 0;
    for (const width of [30, 40, 50, 60, 80, 120]) {
      const r = await cli([...args, "--width", String(width)]);
      expect(r.code, r.stderr).toBe(0);
      const refs = r.stdout.split("\n").filter((l) => /^ *(\d+ )?& /.test(l));
      for (const line of refs) expect(line, `${width}`).not.toMatch(/ \?$/);
      bare += refs.filter((l) => !l.includes("full entry at")).length;
    }
    expect(bare).toBeGreaterThan(0);
  });
});
