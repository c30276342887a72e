import fc from "fast-check";
import stringWidth from "string-width";
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
  it("agrees with string-width on any text, printable ASCII or not (property)", () => {
    // Source: string-width, the reference library for terminal widths (UAX #11). Printable ASCII is
    // answered without it (one column a character), which must give exactly its answer.
    const text = fc.oneof(
      fc.string({ unit: fc.integer({ min: 0x20, max: 0x7e }).map((c) => String.fromCharCode(c)) }),
      fc.string({ unit: "grapheme" }),
      fc.string({ unit: "binary" }),
      fc.string(),
    );
    fc.assert(fc.property(text, (t) => displayWidth(t) === stringWidth(t)));
  });
});

describe("shortenMiddle(text, width) and shortenEnd(text, width)", () => {
  it("keeps both ends around an ellipsis", () => {
    expect(shortenMiddle("services/ledger/src/events", 12)).toBe(`servic${ELLIPSIS}vents`);
    expect(shortenMiddle("short", 12)).toBe("short");
  });

  it("cuts printable ASCII where a grapheme segmenter would (property)", () => {
    // Source: UAX #29 (grapheme clusters), through Intl.Segmenter: each printable ASCII character is a
    // cluster of its own. A combining mark (U+0301) after the last character joins that character's
    // cluster without adding a column, and sends the text down the segmenter's path: with the mark
    // taken out again, both paths must give the same cut.
    const ascii = fc.string({
      unit: fc.integer({ min: 0x20, max: 0x7e }).map((c) => String.fromCharCode(c)),
      maxLength: 40,
    });
    fc.assert(
      fc.property(ascii, fc.integer({ min: 0, max: 45 }), (t, width) => {
        const marked = `${t}\u0301`;
        expect(shortenMiddle(marked, width).replace("\u0301", "")).toBe(shortenMiddle(t, width));
        expect(shortenEnd(marked, width).replace("\u0301", "")).toBe(shortenEnd(t, width));
      }),
    );
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
