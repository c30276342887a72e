import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { changeKinds } from "../../src/diff/changes.js";
import { diffTrees } from "../../src/diff/diff-trees.js";
import { renderDiffText } from "../../src/render/diff-text.js";
import { displayWidth } from "../../src/render/display-width.js";
import { MIN_WIDTH } from "../../src/render/line-layout.js";
import { LEGEND_LINES, legendLines, MARK } from "../../src/render/marks.js";
import { palette } from "../../src/render/palette.js";
import { renderText } from "../../src/render/summary-text.js";
import { prepare, summarize } from "../../src/summarize.js";
import { arbEdited } from "../diff/edit-script.js";
import { makeIdTree } from "../diff/id-tree.js";
import { arbTree } from "../helpers/random-tree.js";

const marks = Object.values(MARK);
/** Every line after the header: an indent, one of the marks, a space. */
const marked = new RegExp(`^ *[${marks.map((m) => `\\${m}`).join("")}] `);

describe("MARK and legendLines(kind)", () => {
  it("gives each meaning its own mark, none of them a sign a line diff uses", () => {
    // POSIX.1-2017 diff: '<' and '>' mark the lines of each file, '!' a changed line in context
    // output, and the unified format (diff -u, in POSIX since 2008) '+' and '-'.
    expect(new Set(marks).size).toBe(marks.length);
    for (const m of marks) expect(["+", "-", "<", ">", "!"]).not.toContain(m);
  });

  it("starts every line of a summary and of a diff with an indent and a mark, the same set in both (property)", () => {
    fc.assert(
      fc.property(arbTree(30), arbEdited(25), fc.integer({ min: 2, max: 20 }), (tree, edited, budget) => {
        const summary = summarize(prepare(tree), { foci: [], budget, importance: "depth" });
        const text = renderText(summary.view, { units: "plain", sizes: true });
        const diff = diffTrees(edited.oldTree, edited.newTree, { foci: [], budget, importance: "depth" });
        const diffText = renderDiffText(diff.view, diff.totals, { units: "plain", sizes: true, by: "id" });
        for (const line of [...text.trimEnd().split("\n"), ...diffText.trimEnd().split("\n")])
          expect(line).toMatch(marked);
      }),
      { numRuns: 40 },
    );
  });

  it("explains every mark a summary or diff line uses, in as many lines as LEGEND_LINES says", () => {
    for (const kind of ["summary", "diff"] as const) {
      const lines = legendLines(kind);
      expect(lines).toHaveLength(LEGEND_LINES[kind]);
      for (const m of Object.values(MARK)) expect(lines[0]).toContain(` ${m} `);
    }
    // Every kind a diff line can carry, the graphs' edge kinds included.
    for (const kind of changeKinds) expect(legendLines("diff").join(" ")).toContain(`[${kind}`);
  });

  it("wraps the legend to any width from MIN_WIDTH at spaces, every word kept, none cut (property)", () => {
    // Widths in terminal columns as Unicode UAX #11 counts them (displayWidth); the ± of a diff's
    // legend is one column wide (East Asian Width: Ambiguous, narrow outside East Asian contexts).
    const words = (lines: string[]) => lines.join(" ").split(" ").filter(Boolean);
    fc.assert(
      fc.property(
        fc.constantFrom("summary", "diff"),
        fc.integer({ min: MIN_WIDTH, max: 250 }),
        (kind, width) => {
          const wrapped = legendLines(kind, width);
          for (const line of wrapped) expect(displayWidth(line)).toBeLessThanOrEqual(width);
          expect(words(wrapped)).toEqual(words(legendLines(kind)));
          // No cut: the only "…" is the one the legend explains (a cut name's mark).
          const ellipses = (text: string) => text.split("…").length - 1;
          expect(ellipses(wrapped.join("\n"))).toBe(ellipses(legendLines(kind).join("\n")));
          // Each legend line starts at the margin, its further lines two columns in.
          const starts = wrapped.filter((l) => !l.startsWith("  "));
          expect(starts.map((l) => l.split(":")[0])).toEqual(legendLines(kind).map((l) => l.split(":")[0]));
        },
      ),
      { numRuns: 60 },
    );
  });

  it("says it all in fewer lines at 32 columns (field test: 36 lines for a summary, 50 for a diff)", () => {
    expect(legendLines("summary", 32).length).toBeLessThanOrEqual(29);
    expect(legendLines("diff", 32).length).toBeLessThanOrEqual(44);
    for (const kind of ["summary", "diff"] as const) {
      const text = legendLines(kind).join(" ");
      for (const said of [
        "level in digits",
        "(3 more)",
        "a / b",
        "?",
        "…",
        "(hidden)",
        "(k hidden)",
        "size cut",
      ])
        expect(text, `${kind}: ${said}`).toContain(said);
    }
  });

  it("explains the fold's narrowest form, which a line at MIN_WIDTH uses", () => {
    const tree = makeIdTree("R{A{A1:1,A2:1,A3:1},B{B1:1,B2:1}}");
    const summary = summarize(prepare(tree), { foci: [], budget: 2, importance: "depth" });
    // Without sizes: with them, R's fold keeps its size at this width, `(3 hidden, 2)`.
    const text = renderText(summary.view, { units: "plain", sizes: false, width: MIN_WIDTH });
    // R's line: 8 nodes = 1 + 4 on A's line + 3 hidden (B and its two children: nodes, not B alone),
    // the sum the legend states.
    expect(text.split("\n")[0]).toMatch(/^[.:] R {2}8 nodes.* \(3 hidden\)$/);
    expect(legendLines("summary")[1]).toContain("(k hidden, S): k nodes hidden, S their size");
    expect(legendLines("diff")[1]).toContain("(k hidden, c changed): k nodes hidden, c of them changed");
  });

  it("says in the diff legend that counts include removed nodes, as the lines' arithmetic does", () => {
    // R keeps A and B; C is removed and D added: 4 -> 4 nodes, yet R's line counts 5 (C included).
    const diff = diffTrees(makeIdTree("R{A:1,B:1,C:1}"), makeIdTree("R{A:1,B:1,D:1}"), {
      foci: [],
      budget: 10,
      importance: "depth",
    });
    const text = renderDiffText(diff.view, diff.totals, { units: "plain", sizes: true, by: "id" });
    expect([diff.totals.old.nodes, diff.totals.new.nodes]).toEqual([4, 4]);
    expect(text.split("\n")[0]).toMatch(/^: R {2}5 nodes/);
    expect(legendLines("diff")[1]).toContain("removed nodes included");
    expect(legendLines("summary")[1]).not.toContain("removed");
  });

  it("colours each change kind differently (the tag's word carries the kind without colour)", () => {
    const p = palette(true);
    const styled = changeKinds.map((k) => p.change[k]("x"));
    expect(new Set(styled).size).toBe(changeKinds.length);
    for (const k of changeKinds) expect(palette(false).change[k]("x")).toBe("x");
  });
});
