import fc from "fast-check";
import stringWidth from "string-width";
import { describe, expect, it } from "vitest";
import { diffTrees } from "../../src/diff/diff-trees.js";
import { measure } from "../../src/model/measure.js";
import { PathIndex } from "../../src/model/path-index.js";
import type { Tree } from "../../src/model/tree.js";
import { renderDiffText } from "../../src/render/diff-text.js";
import { displayWidth } from "../../src/render/display-width.js";
import { lineGroups } from "../../src/render/line-groups.js";
import { MIN_WIDTH } from "../../src/render/line-layout.js";
import { renderText } from "../../src/render/summary-text.js";
import { prepare, summarize } from "../../src/summarize.js";
import { arbEdited } from "../diff/edit-script.js";
import { makeTree } from "../helpers/make-tree.js";
import { arbTreeWithFoci } from "../helpers/random-tree.js";

/**
 * A summary of `tree` with the foci at `focusNodes` and chains on or off, at a budget `extra` lines
 * above the smallest that holds the root and the foci's paths (at most one line a node), so the
 * selection has folds as well as none; null when even that budget is too small (BUDGET_TOO_SMALL,
 * tested elsewhere).
 */
function arbitrarySummary(
  tree: Tree,
  focusNodes: readonly number[],
  extra: number,
  chains = true,
): ReturnType<typeof summarize> | null {
  const index = new PathIndex(tree, measure(tree));
  const foci = focusNodes.map((i) => index.path(i));
  const prepared = prepare(tree);
  const options = { foci, importance: "depth" as const, chains };
  const needed = summarize(prepared, { ...options, budget: tree.length + 1 });
  try {
    return summarize(prepared, {
      ...options,
      budget: Math.min(needed.selection.forcedCount + extra, tree.length),
    });
  } catch {
    return null;
  }
}

/**
 * The names a line's label stands for: each between ` / ` joins, and the k of a chain's `(k more)`,
 * the names left out of its middle (docs/selection.md).
 */
function namesIn(label: string): number {
  return label
    .split(" / ")
    .map((name) => /^\(([0-9,]+) more\)$/.exec(name))
    .reduce((sum, more) => sum + (more ? Number(more[1].replaceAll(",", "")) : 1), 0);
}

interface Line {
  level: number;
  /** Names on the line: a chain `a / b / c` has three. */
  names: number;
  /** The count printed beside the last name (1 when none is printed). */
  nodes: number;
  /** Nodes in the fold, 0 without one. */
  hidden: number;
}

// A tree line as docs/selection.md states it: indentation, a mark, the names, then the last name's
// count and the fold. Read with the lines alone, as a reader would.
const LINE =
  /^((?: {2})*)[*:.] (.+?)(?: {2}([0-9,]+) nodes)?(?: {2}\(hidden: [0-9,]+ child(?:ren)?, ([0-9,]+) nodes?(?:; [^)]*)?\))?$/;

function parse(text: string): Line[] {
  return text
    .trimEnd()
    .split("\n")
    .map((line) => {
      const m = LINE.exec(line);
      expect(m, line).not.toBeNull();
      const [, indent, label, nodes, hidden] = m!;
      const number = (s: string | undefined) => (s === undefined ? 0 : Number(s.replaceAll(",", "")));
      return {
        level: indent.length / 2,
        names: namesIn(label),
        nodes: nodes === undefined ? 1 : number(nodes),
        hidden: number(hidden),
      };
    });
}

/**
 * Checks `nodes = the line's names + the nodes on the lines below + hidden` on every line (a chain
 * `a / b / c` is three names, and its count is a's, docs/selection.md), and that the first line
 * accounts for the whole tree.
 */
function checkArithmetic(lines: Line[], total: number): void {
  for (let k = 0; k < lines.length; k++) {
    let below = 0;
    for (let j = k + 1; j < lines.length && lines[j].level > lines[k].level; j++)
      if (lines[j].level === lines[k].level + 1) below += lines[j].nodes;
    // A count that did not fit (`?`, narrow screens only) leaves its line and the one above unchecked.
    if (Number.isNaN(below + lines[k].nodes)) continue;
    // A fold's bare sign (`(hidden)`): its count is what the line's count leaves, at least one.
    if (Number.isNaN(lines[k].hidden)) {
      expect(lines[k].nodes, `line ${k}`).toBeGreaterThan(lines[k].names + below);
      continue;
    }
    expect(lines[k].nodes, `line ${k}`).toBe(lines[k].names + below + lines[k].hidden);
  }
  // A first line too narrow for its count (a diff's tag before one-letter names) says `?`.
  if (!Number.isNaN(lines[0].nodes)) expect(lines[0].nodes).toBe(total);
}

describe("nodes = names + shown children + folded, read from the printed lines alone", () => {
  it("holds on every line of a summary, with and without chains (property)", () => {
    fc.assert(
      fc.property(
        arbTreeWithFoci(50),
        fc.integer({ min: 1, max: 40 }),
        fc.boolean(),
        ([tree, f], extra, chains) => {
          const result = arbitrarySummary(tree, f, extra, chains);
          if (result === null) return;
          const text = renderText(result.view, { units: "plain", sizes: false, chains });
          checkArithmetic(parse(text), tree.length);
        },
      ),
    );
  });

  it("holds on every line of a diff, removed nodes counted, with and without chains (property)", () => {
    fc.assert(
      fc.property(arbEdited(), fc.integer({ min: 2, max: 30 }), fc.boolean(), (edited, budget, chains) => {
        const r = diffTrees(edited.oldTree, edited.newTree, {
          foci: [],
          budget,
          importance: "depth",
          chains,
          headerLines: 0,
        });
        const text = renderDiffText(r.view, r.totals, {
          units: "plain",
          sizes: false,
          by: r.combined.by,
          chains,
        });
        checkArithmetic(parse(text), r.combined.tree.length);
      }),
    );
  });
});

// A narrow line (docs/selection.md, Narrow screens): a name may be cut (`…`), the fold may drop its
// children and size (`(hidden: 41 nodes)`) or its words (`(41 hidden)`), a diff's fold its changes;
// a line whose sizes did not fit says `size cut` in their place.
// A size (plain units, compact from 10,000: `12.3k`) may follow a count or stand alone (one node); a
// deep line's indentation may end in its level in digits (`12 `); a `?` stands for a count that did
// not fit, and after it the fold may keep only its sign (`(hidden)`).
const NARROW =
  /^( *)(?:([0-9]+) )?[*:.] (.+?)(?: {2}(?:([0-9,]+) nodes(?:, [0-9.,]+k?|, size cut)?|[0-9.,]+k?|size cut|(\?)))?(?: {2}\((?:hidden: (?:[0-9,]+ child(?:ren)?, )?([0-9,]+) nodes?(?:, [0-9.,]+k?)?(?:; [^)]*)?|([0-9,]+) hidden(?:, [0-9.,]+k?)?(?:, [0-9,]+ changed)?|(hidden))\))?$/;

function parseNarrow(text: string, width: number): Line[] {
  return text
    .trimEnd()
    .split("\n")
    .map((line) => {
      const m = NARROW.exec(line);
      expect(m, `${width}: ${line}`).not.toBeNull();
      const [, indent, digits, label, nodes, gone, hidden, tiny, sign] = m!;
      // The fold keeps only its sign (`(hidden)`) before the line's count gives way (line-layout.ts,
      // step 9): its count is then the line's less its names and the lines below, which this line's
      // check cannot confirm, but the line above still can with the count.
      const number = (s: string | undefined) => (s === undefined ? 0 : Number(s.replaceAll(",", "")));
      const folded = sign ? Number.NaN : number(hidden ?? tiny);
      return {
        level: digits === undefined ? indent.length / 2 : Number(digits),
        names: namesIn(label),
        // No count fitted: the line's sum, and its parent's, cannot be checked (and are not). No
        // count printed: the line's names and its fold's (`mime  (665 hidden)`), so a line without
        // one that has lines below does not add up.
        nodes: gone ? Number.NaN : nodes === undefined ? namesIn(label) + folded : number(nodes),
        hidden: folded,
      };
    });
}

/** `checkArithmetic` on a narrow screen's text, which a failure shows. */
function checkOn(text: string, width: number, total: number): void {
  try {
    checkArithmetic(parseNarrow(text, width), total);
  } catch (err) {
    throw new Error(`at ${width} columns:\n${text}\n${(err as Error).message}`);
  }
}

describe("the sums hold on narrow screens too: names give way before counts", () => {
  it("holds on every line of a summary at any width from MIN_WIDTH to 200 columns, sizes on (property)", () => {
    fc.assert(
      fc.property(
        arbTreeWithFoci(50),
        fc.integer({ min: 1, max: 40 }),
        fc.integer({ min: MIN_WIDTH, max: 200 }),
        ([tree, f], extra, width) => {
          const result = arbitrarySummary(tree, f, extra);
          if (result === null) return;
          const text = renderText(result.view, { units: "plain", sizes: true, chains: true, width });
          const counts = renderText(result.view, { units: "plain", sizes: false, chains: true, width });
          // Every line has its size, or says `size cut` where it would be; only when a line could
          // say neither are sizes off every line (see screen-lines.ts).
          if (text !== counts)
            for (const line of text.trimEnd().split("\n"))
              expect(line, `${width}: ${text}`).toMatch(
                /(?:(?: {2}|, )[0-9][0-9.,]*k?| {2}(?:[0-9,]+ nodes, )?size cut)(?: {2}\(.*)?$/,
              );
          checkOn(text, width, tree.length);
        },
      ),
    );
  });

  it("holds on every line of a diff at any width from MIN_WIDTH to 200 columns (property)", () => {
    fc.assert(
      fc.property(
        arbEdited(),
        fc.integer({ min: 2, max: 30 }),
        fc.integer({ min: MIN_WIDTH, max: 200 }),
        (edited, budget, width) => {
          const r = diffTrees(edited.oldTree, edited.newTree, {
            foci: [],
            budget,
            importance: "depth",
            chains: true,
            headerLines: 0,
          });
          const text = renderDiffText(r.view, r.totals, {
            units: "plain",
            sizes: false,
            by: r.combined.by,
            chains: true,
            width,
          });
          // Tags may stand before the last name: they hold no ` / ` of their own here (no moves
          // from a path), so the names still count.
          checkOn(text.replace(/\[[^\]]*\] /g, ""), width, r.combined.tree.length);
        },
      ),
    );
  });
});

// A sized tree line: names, the count (when above one) and the size, then the fold's count and size.
const SIZED =
  /^((?: {2})*)[*:.] (.+?) {2}(?:([0-9,]+) nodes, )?([0-9,]+)(?: {2}\(hidden: [0-9,]+ child(?:ren)?, [0-9,]+ nodes?, ([0-9,]+)\))?$/;

describe("own size = size - the sizes on the lines below - the hidden size, read from the printed lines", () => {
  // Field test: on a chained line `regrtestdata / import_from_tests` (a Python library listing, each
  // folder 4,096 bytes of its own) the size printed was the last folder's, so the line above could
  // not be added up from the screen: regrtestdata's own 4,096 bytes were in no number shown.
  it("is the own size of the line's names, chains included (property)", () => {
    fc.assert(
      fc.property(arbTreeWithFoci(50), fc.integer({ min: 1, max: 40 }), ([tree, f], extra) => {
        const result = arbitrarySummary(tree, f, extra);
        if (result === null) return;
        const text = renderText(result.view, { units: "plain", sizes: true, chains: true });
        const number = (s: string | undefined) => (s === undefined ? 0 : Number(s.replaceAll(",", "")));
        const lines = text
          .trimEnd()
          .split("\n")
          .map((line) => {
            const m = SIZED.exec(line);
            expect(m, line).not.toBeNull();
            return { level: m![1].length / 2, size: number(m![4]), hidden: number(m![5]) };
          });
        const groups = lineGroups(result.view, true);
        expect(groups).toHaveLength(lines.length);
        lines.forEach((line, k) => {
          let below = 0;
          for (let j = k + 1; j < lines.length && lines[j].level > line.level; j++)
            if (lines[j].level === line.level + 1) below += lines[j].size;
          const own = groups[k].nodes.reduce((sum, n) => sum + tree.ownSize[n.index], 0);
          expect(line.size - below - line.hidden, `line ${k}: ${text}`).toBe(own);
        });
      }),
    );
  });
});

// A narrow sized line: the count and an exact or compact size (`123k`), or `size cut` where the sizes
// did not fit; the fold with its size (`(hidden: 41 nodes, 123k)`, `(41 hidden, 123k)`), or without it
// once the line's sizes are cut.
const SIZED_NARROW =
  /^( *)(?:([0-9]+) )?[*:.] (.+?)(?: {2}(?:[0-9,]+ nodes, )?(?:([0-9][0-9.,]*k?)|(size cut)))(?: {2}\((?:hidden: (?:[0-9,]+ child(?:ren)?, )?[0-9,]+ nodes?(?:, ([0-9][0-9.,]*k?))?|[0-9,]+ hidden(?:, ([0-9][0-9.,]*k?))?)\))?$/;

/**
 * Reads a sized narrow screen (`SIZED_NARROW`) as a reader would and checks, on every line whose size
 * and whose lines' sizes below are exact, that its size less those and the hidden size is the own size
 * of its names, and that the first line's size, when exact, is the whole tree's. False when the screen
 * prints no size at all.
 */
function checkSizes(text: string, width: number, tree: Tree, result: ReturnType<typeof summarize>): boolean {
  const rows = text.trimEnd().split("\n");
  // Sizes off every line (a line could not even say `size cut`): nothing to add up by size.
  if (!rows.some((r) => SIZED_NARROW.test(r))) return false;
  // An exact size, or NaN: compact (`123k`) or cut.
  const exact = (s: string | undefined) =>
    s === undefined || s.endsWith("k") ? Number.NaN : Number(s.replaceAll(",", ""));
  const lines = rows.map((row) => {
    const m = SIZED_NARROW.exec(row);
    expect(m, `${width}: ${row}\n${text}`).not.toBeNull();
    const [, indent, digits, , size, cut, hiddenLong, hiddenShort] = m!;
    const hidden = hiddenLong ?? hiddenShort;
    const folded = /\((?:hidden|[0-9,]+ hidden)/.test(row);
    return {
      level: digits === undefined ? indent.length / 2 : Number(digits),
      size: cut ? Number.NaN : exact(size),
      hidden: folded ? exact(hidden) : 0,
      // A fold without its size beside the line's own (docs/selection.md): all below the line.
      sizeInLine: !cut && folded && hidden === undefined,
    };
  });
  // With its sizes kept, a line's fold keeps its size too, but on a line with none below it: there
  // the fold is all below the line, and its size is the line's less the line's own (no number on
  // screen is half a sum; that line's own size is not said).
  lines.forEach((line, k) => {
    if (line.sizeInLine)
      expect(lines[k + 1]?.level ?? 0, `${width}: ${rows[k]}`).toBeLessThanOrEqual(line.level);
  });
  const groups = lineGroups(result.view, true);
  expect(groups).toHaveLength(lines.length);
  lines.forEach((line, k) => {
    let below = 0;
    for (let j = k + 1; j < lines.length && lines[j].level > line.level; j++)
      if (lines[j].level === line.level + 1) below += lines[j].size;
    // A size compact or cut, here or on a line below: the key says this line does not add up.
    if (Number.isNaN(line.size - below - line.hidden)) return;
    const own = groups[k].nodes.reduce((sum, n) => sum + tree.ownSize[n.index], 0);
    expect(line.size - below - line.hidden, `line ${k} at ${width}: ${text}`).toBe(own);
  });
  const total = Array.from(tree.ownSize).reduce((sum, x) => sum + x, 0);
  if (!Number.isNaN(lines[0].size)) expect(lines[0].size, `total at ${width}: ${text}`).toBe(total);
  return true;
}

describe("own size = size - the sizes below - the hidden size on narrow screens, a line's `size cut` aside", () => {
  it("holds on every line whose size and whose lines' sizes below are shown exactly, widths MIN_WIDTH-200 (property)", () => {
    fc.assert(
      fc.property(
        arbTreeWithFoci(50),
        fc.integer({ min: 1, max: 40 }),
        fc.integer({ min: MIN_WIDTH, max: 200 }),
        ([tree, f], extra, width) => {
          const result = arbitrarySummary(tree, f, extra);
          if (result === null) return;
          const text = renderText(result.view, { units: "plain", sizes: true, chains: true, width });
          checkSizes(text, width, tree, result);
        },
      ),
      { numRuns: 300 },
    );
  });
});

// Names a narrow screen must measure right (Unicode UAX #11, East Asian Width): CJK ideographs and
// katakana (class W) and fullwidth letters (class F) take two columns each, halfwidth katakana
// (class H) one, a combining acute accent (U+0301, general category Mn) none. The organisation is
// invented (a fictional company's folders).
const WIDE_NAMES = ["東京", "データ基盤", "ＡＢ", "ｶﾀｶﾅ", "e\u0301te\u0301", "kelp-log", "a"];

describe("at every width from the floor (MIN_WIDTH) to 200, counts and sizes add up to the totals", () => {
  it("holds with wide and combining names, every line measured as string-width measures it (property)", () => {
    fc.assert(
      fc.property(
        arbTreeWithFoci(50, 3, WIDE_NAMES),
        fc.integer({ min: 1, max: 40 }),
        fc.integer({ min: MIN_WIDTH, max: 200 }),
        ([tree, f], extra, width) => {
          const result = arbitrarySummary(tree, f, extra);
          if (result === null) return;
          const text = renderText(result.view, { units: "plain", sizes: true, chains: true, width });
          for (const line of text.trimEnd().split("\n")) {
            // Source: string-width, the reference library for terminal widths (UAX #11).
            expect(displayWidth(line), line).toBe(stringWidth(line));
            expect(stringWidth(line), `${width}: ${line}`).toBeLessThanOrEqual(width);
          }
          checkOn(text, width, tree.length);
          checkSizes(text, width, tree, result);
        },
      ),
      { numRuns: 200 },
    );
  });

  it("holds at each width 30 to 200 on one screen of wide names, its sizes kept from 60 columns", () => {
    // An invented company's shared drive: 東京 (Tokyo office) with a data platform folder and some
    // files; names measured per UAX #11 as above. Every width is laid out, not a sample.
    const tree = makeTree(
      "R{東京:4{データ基盤:40000{ｶﾀｶﾅ:1,ＡＢ:2,c:3},e\u0301te\u0301{kelp-log:5{q:7,r:9}},x:11},backups{a:100,b:200}}",
    );
    const result = summarize(prepare(tree), { foci: [], budget: 4, importance: "depth", chains: true });
    for (let width = MIN_WIDTH; width <= 200; width++) {
      const text = renderText(result.view, { units: "plain", sizes: true, chains: true, width });
      for (const line of text.trimEnd().split("\n"))
        expect(stringWidth(line), `${width}: ${line}`).toBeLessThanOrEqual(width);
      checkOn(text, width, tree.length);
      const sized = checkSizes(text, width, tree, result);
      // Where every line can hold its count and its sizes, they are there (the reader sees the bytes).
      if (width >= 60) expect(sized, `${width}:\n${text}`).toBe(true);
    }
  });
});
