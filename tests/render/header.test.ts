import { describe, expect, it } from "vitest";
import type { DiffTotals } from "../../src/diff/prepared-diff.js";
import { displayWidth } from "../../src/render/display-width.js";
import { diffHeaderLines, type HeaderOptions, summaryHeaderLines } from "../../src/render/header.js";

// A listing diffed after a clean-up (invented figures): files removed and resized, none moved,
// renamed or edited.
const totals: DiffTotals = {
  changes: { added: 3, removed: 340, moved: 0, renamed: 0, edited: 0, resized: 4093, linked: 0, unlinked: 0 },
  old: { nodes: 53359, size: 570_167_460 },
  new: { nodes: 53022, size: 568_249_000 },
  delta: -1_918_460,
  graph: false,
};
const header: HeaderOptions = { budget: 20, lines: 20, foci: [] };
const numbers = { units: "bytes" as const, sizes: true };
/** The header's words as one text, its wrapped lines joined. */
const said = (lines: string[]) => lines.map((l) => l.trim()).join(" ");

describe("diffHeaderLines(totals, by, header, options, width)", () => {
  it("says the kinds no node has once where that takes fewer lines (30 columns: 8, not 9)", () => {
    const lines = diffHeaderLines(totals, "path", header, numbers, 30);
    const text = said(lines);
    expect(text).toContain("3 added, 340 removed, 4,093 resized, 0 moved, renamed or edited;");
    expect(lines).toHaveLength(8);
    for (const line of lines) expect(displayWidth(line)).toBeLessThanOrEqual(30);
  });

  it("lists every kind with its count, in their order, where grouping saves no line", () => {
    for (const width of [40, 120, undefined]) {
      const text = said(diffHeaderLines(totals, "path", header, numbers, width));
      expect(text).toContain("3 added, 340 removed, 0 moved, 0 renamed, 0 edited, 4,093 resized;");
    }
  });

  it("keeps the fields compared beside `edited` when it is grouped", () => {
    const lines = diffHeaderLines(totals, "path", { ...header, compared: ["version"] }, numbers, 30);
    expect(said(lines)).toContain("0 moved, renamed or edited (compared: version);");
  });
});

describe("summaryHeaderLines(root, header, options, width)", () => {
  const root = { nodes: 53359, size: 570_167_460 };
  const deep = "doc/harbour-ledger-reconciliation/examples/plugin/bazel/java/com/tidewater/sample/BUILD";

  it("cuts a focus path longer than a line beside `focus`, not on a line of its own", () => {
    for (const width of [30, 32, 40, 60]) {
      const lines = summaryHeaderLines(root, { budget: 14, lines: 14, foci: [deep] }, numbers, width);
      const at = lines.findIndex((l) => l.includes("focus"));
      expect(lines[at], `${width}`).toMatch(/^ {2}focus doc\/harbour-.*…;?$/);
      for (const line of lines) expect(displayWidth(line)).toBeLessThanOrEqual(width);
    }
  });

  it("keeps a path that fits its line whole", () => {
    const lines = summaryHeaderLines(root, { budget: 14, lines: 14, foci: ["doc/harbour"] }, numbers, 30);
    expect(said(lines)).toContain("focus doc/harbour;");
  });
});
