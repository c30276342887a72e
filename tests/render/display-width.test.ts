import fc from "fast-check";
import stringWidth from "string-width";
import { describe, expect, it } from "vitest";
import type { EspalierError } from "../../src/errors.js";
import { measure } from "../../src/model/measure.js";
import { PathIndex } from "../../src/model/path-index.js";
import {
  displayWidth,
  ELLIPSIS,
  shortenEnd,
  shortenKeeping,
  shortenMiddle,
} from "../../src/render/display-width.js";
import { lineGroups } from "../../src/render/line-groups.js";
import { MIN_WIDTH } from "../../src/render/line-layout.js";
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
    // answered without it (one column a character), and so is the ellipsis a cut leaves (U+2026),
    // which must give exactly its answer: text of both, a combining mark after an ellipsis too.
    const text = fc.oneof(
      fc.string({ unit: fc.integer({ min: 0x20, max: 0x7e }).map((c) => String.fromCharCode(c)) }),
      fc.string({ unit: fc.constantFrom("a", " ", "~", ELLIPSIS, "\u0301", "名") }),
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

  it("puts the ellipsis right after the last character kept, never after a space", () => {
    // An explore screen cut its status text as "size …": a cut word read as a word left out.
    expect(shortenEnd("size 1.4 MiB", 6)).toBe(`size${ELLIPSIS}`);
    expect(shortenEnd("size 1.4 MiB", 7)).toBe(`size 1${ELLIPSIS}`);
    expect(shortenMiddle("ledger / core / src", 9)).toBe(`ledg${ELLIPSIS}src`);
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
        fc.integer({ min: MIN_WIDTH, max: 80 }),
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
          // No fold goes without a sign: every line whose node hides children says so.
          const folds = lineGroups(result.view, chains).filter((g) => g.nodes[g.nodes.length - 1].hidden);
          expect(
            lines.filter((l) => / \([0-9,]+ hidden(?:, [^)]*)?\)$| \(hidden: | \(hidden\)$/.test(l)),
          ).toHaveLength(folds.length);
        },
      ),
    );
  });

  it("refuses a width too narrow for a mark, a few characters and a fold (USAGE)", () => {
    const result = summarize(prepare(makeTree("R{a,b}")), { foci: [], budget: 10, importance: "depth" });
    for (const width of [0, 3, MIN_WIDTH - 1]) {
      const error = (() => {
        try {
          renderText(result.view, { units: "plain", sizes: false, width });
        } catch (e) {
          return e as EspalierError;
        }
      })();
      expect(error?.code).toBe("USAGE");
    }
    expect(renderText(result.view, { units: "plain", sizes: false, width: MIN_WIDTH })).toContain(". a");
  });

  it("cuts names before numbers, leaves sizes out before a count, a chain keeps its joins", () => {
    const tree = makeTree("R{Esme Orby Lead Firmware Engineer:123456{a:1,b:2},alpha{beta{gamma:5{q,r}}}}");
    const result = summarize(prepare(tree), { foci: [], budget: 3, importance: "depth", chains: true });
    const lines = (width: number) =>
      renderText(result.view, { units: "plain", sizes: true, width, chains: true }).split("\n");
    const at = (width: number) => lines(width)[1];
    expect(at(200)).toBe(
      "  . Esme Orby Lead Firmware Engineer  3 nodes, 123,459  (hidden: 2 children, 2 nodes, 3)",
    );
    // First the fold's count of children goes, every number kept exact: 3 = 1 + 2 hidden.
    expect(at(76)).toBe("  . Esme Orby Lead Firmware Engineer  3 nodes, 123,459  (hidden: 2 nodes, 3)");
    // Then the fold says its numbers in fewest words, both kept.
    expect(at(75)).toBe("  . Esme Orby Lead Firmware Engineer  3 nodes, 123,459  (2 hidden, 3)");
    // Then the name is cut at its end (an ellipsis marks it), down to 8 columns, numbers exact.
    expect(at(53)).toBe("  . Esme Orby Lead…  3 nodes, 123,459  (2 hidden, 3)");
    expect(at(46)).toBe("  . Esme Orb…  3 nodes, 123,459  (2 hidden, 3)");
    // Then down to 4 columns, every number still exact (compact numbers, 123k, would save fewer
    // columns than the name gives). The chain's line, with no lines below it, keeps its names whole
    // with its fold's count alone before any name is cut: the fold is all below the line, its size
    // the line's less the line's own.
    expect(lines(42).slice(0, 3)).toEqual([
      ". R  9 nodes, 123,464",
      "  . Esme…  3 nodes, 123,459  (2 hidden, 3)",
      "  . alpha / beta  5 nodes, 5  (3 hidden)",
    ]);
    // Narrower, the chain's line, with no lines below it, keeps its sizes with its fold's count alone:
    // the fold is all below the line, its size the line's less the line's own; Esme's size is compact.
    expect(lines(40).slice(0, 3)).toEqual([
      ". R  9 nodes, 123,464",
      "  . Esme…  3 nodes, 123k  (2 hidden, 3)",
      "  . alpha / beta  5 nodes, 5  (3 hidden)",
    ]);
    // Narrower still, Esme's line cannot keep its count and its sizes, nor say `size cut` beside its
    // count: every line leaves its sizes out (the key says so), every count kept.
    expect(lines(38).slice(0, 3)).toEqual([
      ". R  9 nodes",
      "  . Esme Orby Le…  3 nodes  (2 hidden)",
      "  . alpha / beta  5 nodes  (3 hidden)",
    ]);
    // The count stays down to the narrowest width the renderers take: the name gives way.
    expect(at(36)).toBe("  . Esme Orby…  3 nodes  (2 hidden)");
    expect(at(MIN_WIDTH)).toBe("  . Esme…  3 nodes  (2 hidden)");
    const chain = (width: number) => lines(width)[2];
    // The line's numbers are alpha's (with all below it); the narrow fold counts beta's hidden nodes,
    // not children (gamma and its q and r under beta's one hidden child), so 5 = 2 names + 3 hidden.
    expect(chain(50)).toBe("  . alpha / beta  5 nodes, 5  (hidden: 3 nodes, 5)");
    // A chain's names are cut at their ends, its " / " kept: the line's 5 = 2 names + 3 hidden still
    // reads off the screen.
    expect(chain(35)).toBe("  . alp… / be…  5 nodes  (3 hidden)");
    // Narrowest, the fold keeps only its sign (3 = 5 less the 2 names) before a name goes under two
    // characters; the line's count, which the line above adds up, stays.
    expect(chain(MIN_WIDTH)).toBe("  . a… / b…  5 nodes  (hidden)");
  });

  it("prints a run of only children as one line carrying its top node's numbers and its last node's fold", () => {
    // services holds 4 of its own: the line's 12 = 4 + 0 (ledger) + 5 (src) + 1 + 2, so R's own
    // size, 15 - 12 - 3 = 0, reads off the screen (docs/selection.md, Numbers a reader can check).
    const tree = makeTree("R{services:4{ledger{src:5{a:1,b:2}}},docs:3}");
    const result = summarize(prepare(tree), { foci: [], budget: 10, importance: "depth", chains: true });
    const text = renderText(result.view, { units: "plain", sizes: true, chains: true });
    expect(text).toBe(
      [
        ". R  7 nodes, 15",
        "  . services / ledger / src  5 nodes, 12",
        "    . a  1",
        "    . b  2",
        "  . docs  3",
        "",
      ].join("\n"),
    );
    expect(result.selection.lines).toBe(5);
  });

  it("does not join a focus's only child onto the focus's line", () => {
    const tree = makeTree("R{a{b{c}}}");
    const result = summarize(prepare(tree), { foci: ["a/b"], budget: 10, importance: "depth", chains: true });
    const text = renderText(result.view, { units: "plain", sizes: false, chains: true });
    // The chain R / a / b ends at the focus; c, the focus's only child, gets a line of its own. The
    // numbers are R's: 3 names + 1 below.
    expect(text).toBe(["* R / a / b  4 nodes", "  . c", ""].join("\n"));
  });
});

describe("shortenKeeping(text, width, needs)", () => {
  // Widths by string-width, the reference library for terminal widths (Unicode UAX #11): a CJK
  // ideograph (class W) takes two columns.
  it("cuts at the end when that keeps the places needed, else keeps them from the end or around them", () => {
    // Where "@tidewater/cli-android-arm64" differs from "…-darwin-arm64" (13) and "…-android-x64" (21).
    expect(shortenKeeping("@tidewater/cli-android-arm64", 14, [15, 23])).toBe(
      `${ELLIPSIS}-android-arm${ELLIPSIS}`,
    );
    expect(shortenKeeping("ledger-linux-x64-musl", 12, [3])).toBe(`ledger-linu${ELLIPSIS}`);
    expect(shortenKeeping("ledger-linux-x64-musl", 12, [16])).toBe(`ledger${ELLIPSIS}-musl`);
    expect(shortenKeeping("report-2031-04-final-summary.csv", 14, [13])).toBe(
      `repo${ELLIPSIS}04-final${ELLIPSIS}`,
    );
    expect(shortenKeeping("部門名名名名名名名名一", 12, [10])).toBe(`部門名${ELLIPSIS}名一`);
  });

  it("fits the width and keeps the grapheme at `at`, so two texts that differ there stay apart (property)", () => {
    const unit = fc.constantFrom("a", "b", "-", "名", "ｶ", "e\u0301", "🌊");
    const texts = fc.tuple(
      fc.array(unit, { minLength: 0, maxLength: 30 }),
      unit,
      unit,
      fc.array(unit, { maxLength: 30 }),
    );
    fc.assert(
      fc.property(texts, fc.integer({ min: 8, max: 40 }), ([stem, x, y, rest], width) => {
        fc.pre(x !== y);
        const a = stem.join("") + x + rest.join("");
        const b = stem.join("") + y + rest.join("");
        const at = stem.join("").length;
        const cutA = shortenKeeping(a, width, [at]);
        const cutB = shortenKeeping(b, width, [at]);
        expect(stringWidth(cutA)).toBeLessThanOrEqual(width);
        expect(stringWidth(cutB)).toBeLessThanOrEqual(width);
        expect(cutA).not.toBe(cutB);
      }),
      { numRuns: 2000 },
    );
  });

  it("keeps platform builds' names apart when the places where they first differ fit the width (property)", () => {
    // Names as a package's builds are named: a long shared start, then system, machine and variant.
    const build = fc
      .tuple(
        fc.constantFrom("android", "darwin", "linux", "win32", "freebsd", "潮汐"),
        fc.constantFrom("arm64", "x64", "ia32", "arm"),
        fc.constantFrom("", "-musl", "-gnu", "-msvc"),
      )
      .map(([os, cpu, variant]) => `@tidewater/ledger-bindings-${os}-${cpu}${variant}`);
    fc.assert(
      fc.property(
        fc.uniqueArray(build, { minLength: 2, maxLength: 16 }),
        fc.integer({ min: 16, max: 40 }),
        (names, width) => {
          const common = (a: string, b: string) => {
            let k = 0;
            while (k < a.length && k < b.length && a[k] === b[k]) k++;
            return k;
          };
          const needs = names.map((n) => names.filter((o) => o !== n).map((o) => common(n, o)));
          // Where the places a name needs span more than the width holds, no window keeps them all.
          fc.pre(needs.every((p) => Math.max(...p) - Math.min(...p) + 4 <= width));
          const cuts = names.map((n, k) => shortenKeeping(n, width, needs[k]));
          for (const cut of cuts) expect(stringWidth(cut)).toBeLessThanOrEqual(width);
          expect(new Set(cuts).size).toBe(names.length);
        },
      ),
      { numRuns: 1000 },
    );
  });
});
