import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { measure } from "../../src/model/measure.js";
import { PathIndex } from "../../src/model/path-index.js";
import { displayWidth, ELLIPSIS, shortenEnd, shortenMiddle } from "../../src/render/display-width.js";
import { renderText } from "../../src/render/summary-text.js";
import { prepare, summarize } from "../../src/summarize.js";
import { makeTree } from "../helpers/make-tree.js";
import { arbTreeWithFoci } from "../helpers/random-tree.js";

describe("displayWidth(text)", () => {
  // Source: Unicode Standard Annex #11 (East Asian Width): characters of class W (wide) and F
  // (fullwidth) take two columns, Na/H/N one; ambiguous (A) is read as narrow outside East Asian
  // contexts; combining marks (general category Mn) take none. Emoji with default emoji presentation
  // (UTS #51) are treated as wide by terminals, as UAX #11 section 5 recommends.
  it("counts CJK ideographs (class W) as two columns", () => {
    expect(displayWidth("山田")).toBe(4);
    expect(displayWidth("林 澄雨")).toBe(7);
  });

  it("counts fullwidth forms (class F) as two columns", () => {
    expect(displayWidth("ＡＢ")).toBe(4);
  });

  it("counts a combining mark as no column and an emoji as two", () => {
    expect(displayWidth("e\u0301")).toBe(1);
    expect(displayWidth("🌊")).toBe(2);
  });

  it("counts Latin letters with diacritics and halfwidth katakana (class H) as one column each", () => {
    expect(displayWidth("Zoé Łukasz")).toBe(10);
    expect(displayWidth("ｶﾀ")).toBe(2);
  });
});

describe("shortenMiddle(text, width) and shortenEnd(text, width)", () => {
  it("keeps both ends around an ellipsis", () => {
    expect(shortenMiddle("services/ledger/src/events", 12)).toBe(`servic${ELLIPSIS}vents`);
    expect(shortenMiddle("short", 12)).toBe("short");
  });

  it("never cuts a wide character or a grapheme cluster in half", () => {
    const out = shortenMiddle("山田太郎山田太郎", 7);
    expect(displayWidth(out)).toBeLessThanOrEqual(7);
    expect(out).toBe(`山${ELLIPSIS}太郎`);
    expect(shortenEnd("👩‍🔬👩‍🔬👩‍🔬", 5)).toBe(`👩‍🔬👩‍🔬${ELLIPSIS}`);
  });
});

describe("renderText(view, { width })", () => {
  it("never prints a line wider than the width (property)", () => {
    fc.assert(
      fc.property(
        arbTreeWithFoci(40),
        fc.integer({ min: 1, max: 60 }),
        fc.boolean(),
        ([tree, f], width, chains) => {
          const index = new PathIndex(tree, measure(tree));
          const result = summarize(prepare(tree), {
            foci: f.map((i) => index.path(i)),
            budget: 1000,
            importance: "depth",
            label: "{path}",
            chains,
          });
          const text = renderText(result.view, { units: "bytes", sizes: true, width, chains });
          const lines = text.trimEnd().split("\n");
          for (const line of lines) expect(displayWidth(line)).toBeLessThanOrEqual(width);
          expect(lines.length).toBe(result.selection.lines);
        },
      ),
    );
  });

  it("prints a run of only children as one line carrying the top node's numbers", () => {
    const tree = makeTree("R{services{ledger{src:5{a:1,b:2}}},docs:3}");
    const result = summarize(prepare(tree), { foci: [], budget: 10, importance: "depth", chains: true });
    const text = renderText(result.view, { units: "plain", sizes: true, chains: true });
    expect(text).toBe(
      [
        "- R  7 nodes, 11",
        "  - services / ledger / src  5 nodes, 8",
        "    - a  1",
        "    - b  2",
        "  - docs  3",
        "",
      ].join("\n"),
    );
    expect(result.selection.lines).toBe(5);
  });

  it("does not join a focus's only child onto the focus's line", () => {
    const tree = makeTree("R{a{b{c}}}");
    const result = summarize(prepare(tree), { foci: ["a/b"], budget: 10, importance: "depth", chains: true });
    const text = renderText(result.view, { units: "plain", sizes: false, chains: true });
    // The chain R / a / b ends at the focus; c, the focus's only child, gets a line of its own.
    expect(text).toBe(["* R / a / b  4 nodes", "  - c", ""].join("\n"));
  });
});
