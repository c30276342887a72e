import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { prepareDiff } from "../../src/diff/diff-trees.js";
import { draw } from "../../src/explore/screen.js";
import { diffSession, summarySession } from "../../src/explore/session.js";
import { GUTTER, startState } from "../../src/explore/update.js";
import { resolveFoci } from "../../src/focus/resolve.js";
import { loadTree } from "../../src/load/index.js";
import { defaultLoadOptions } from "../../src/load/load-options.js";
import { displayWidth } from "../../src/render/display-width.js";
import { palette } from "../../src/render/palette.js";
import { prepare } from "../../src/summarize.js";
import { checkText } from "../screens/read-screen.mjs";

// An invented monorepo's listing (`size<TAB>path`): a deep only-child chain down to the focus and
// long names, so a narrow screen cuts names, chains them and leaves names out of a chain's middle.
const deep = "services/harbour-ledger-reconciliation/examples/plugin/bazel/java/com/tidewater/ledger/sample";
const rows = [`4096\t${deep}/BUILD`, `812\t${deep}/README`];
for (let k = 0; k < 30; k++) rows.push(`${1000 + k}\tservices/harbour-ledger-reconciliation/notes-${k}.md`);
for (let k = 0; k < 30; k++) rows.push(`${2000 + k}\tpackages/quayside-dashboards/src/module-${k}/index.ts`);
const tree = loadTree(`${rows.join("\n")}\n`, {
  ...defaultLoadOptions,
  file: "listing.tsv",
  format: "paths",
  rootName: "listing.tsv",
});
const prepared = prepare(tree);

describe("summarySession(prepared, look): the key's rows", () => {
  it("takes the rows its screen needs to explain every mark and cut, as espalier prints it (common practice, no source)", () => {
    const session = summarySession(prepared, { units: "plain", chains: true, palette: palette(false) });
    const failures: string[] = [];
    for (const [height, cols] of [
      [20, 48],
      [24, 42],
      [16, 62],
    ]) {
      const state = startState(session, {
        rows: height,
        cols,
        foci: resolveFoci(prepared.index, [`${deep}/BUILD`]),
        importance: "depth",
        fociFile: "foci.txt",
      });
      const screen = draw(session, state, false);
      // The view as espalier prints it: the gutter (the cursor's column) and the status row off.
      const text = `${screen.rows
        .slice(0, -1)
        .map((r) => r.slice(GUTTER))
        .join("\n")
        .trimEnd()}\n`;
      const problems = checkText(text, { budget: height - 1, width: cols - GUTTER });
      if (problems.length > 0) failures.push(`${height}x${cols}: ${problems.join("; ")}\n${text}`);
    }
    expect(failures).toEqual([]);
  });

  it("points the status row to the help for the marks where the key says only part of them, or had no room", () => {
    const session = summarySession(prepared, { units: "plain", chains: true, palette: palette(false) });
    const drawn = (height: number, cols: number) => {
      const state = startState(session, {
        rows: height,
        cols,
        foci: resolveFoci(prepared.index, [`${deep}/BUILD`]),
        importance: "depth",
        fociFile: "foci.txt",
      });
      const screen = draw(session, state, false);
      return {
        key: screen.rows.some((r) => r.slice(GUTTER).startsWith("key: ")),
        status: screen.rows.at(-1)!,
      };
    };
    // A key in part: 11 rows at 32; whole: 14 rows at 32, 20 at 48 (the header gives the key its rows,
    // see below). At 14 rows a key of 3 rows said part (check-screens: a `find /usr/share` listing's
    // deep focus at 14x34 pointed to the help for `a / b` alone): 13 rows of budget give it 2 more
    // than its fewest, one for every three rows above the key's least budget, so it says all in 6.
    expect(drawn(14, 32).status).toMatch(/ h: keys$/);
    const part = drawn(11, 32);
    expect(part.key).toBe(true);
    expect(part.status).toMatch(/ h: keys, marks$/);
    const whole = drawn(20, 48);
    expect(whole.key).toBe(true);
    expect(whole.status).toMatch(/ h: keys$/);
  });

  it("gives the key the header's rows where its own cannot say all: the lines used go, then the foci (the status row names them)", () => {
    const session = summarySession(prepared, { units: "plain", chains: true, palette: palette(false) });
    const failures: string[] = [];
    // 10-16 rows at 40 columns: the key said part of the marks on 44a9f63's screens of 11, 12, 15 and
    // 16 rows (the header spent a row on `11 of 11 lines`, another on the focus's path); on 10 rows it
    // still says part.
    for (let height = 10; height <= 16; height++) {
      const state = startState(session, {
        rows: height,
        cols: 40,
        foci: resolveFoci(prepared.index, [`${deep}/BUILD`]),
        importance: "depth",
        fociFile: "foci.txt",
      });
      const screen = draw(session, state, false);
      const text = `${screen.rows
        .slice(0, -1)
        .map((r) => r.slice(GUTTER))
        .join("\n")
        .trimEnd()}\n`;
      const problems = checkText(text, { budget: height - 1, width: 40 - GUTTER });
      if (height >= 11 && (problems.length > 0 || / h: keys, marks$/.test(screen.rows.at(-1)!)))
        failures.push(`${height}x40: ${problems.join("; ")}\n${screen.rows.join("\n")}`);
      // The header keeps its totals: the root's count is checked against them.
      expect(screen.rows[0]).toMatch(/^ {2}summary: 106 nodes/);
      // One cursor row: the view is drawn, not refused.
      expect(screen.rows.filter((r) => r.startsWith("@"))).toHaveLength(1);
    }
    expect(failures).toEqual([]);
  });

  it("on a screen too short for the view, names the fewest rows that show it (every taller one shows it)", () => {
    const session = summarySession(prepared, { units: "plain", chains: true, palette: palette(false) });
    for (const cols of [32, 40, 60]) {
      const drawn = (height: number) =>
        draw(
          session,
          startState(session, {
            rows: height,
            cols,
            foci: resolveFoci(prepared.index, [`${deep}/BUILD`]),
            importance: "depth",
            fociFile: "foci.txt",
          }),
          false,
        );
      let fewest = 3;
      while (drawn(fewest).cursorRow === null) fewest++;
      for (let height = 3; height < fewest; height++)
        expect(drawn(height).rows[0], `${height}x${cols}`).toMatch(new RegExp(`needs ${fewest} rows$`));
      for (let height = fewest; height < fewest + 12; height++)
        expect(drawn(height).cursorRow, `${height}x${cols}`).not.toBeNull();
    }
  });
});

describe("diffSession(prepared, look): a key of one row", () => {
  it("says the marks in one row where a narrow screen's shorter header frees only that (field test: npm ls diff at 10x32)", () => {
    // Field test: a diff of two `npm ls --all --json` listings at 10x32 showed its seven header rows
    // and the tree, and no key: the shorter header freed one row, where a 32-column key takes two.
    // Here the invented org charts of fixtures/examples (March and April), at 8 and 9 rows.
    const load = (file: string) =>
      loadTree(readFileSync(file, "utf8"), {
        ...defaultLoadOptions,
        parentField: "manager",
        file,
        format: "csv",
        rootName: file.split("/").pop() ?? file,
      });
    const diff = prepareDiff(
      load("fixtures/examples/org-march.csv"),
      load("fixtures/examples/org-april.csv"),
      {},
    );
    const session = diffSession(diff, { units: "plain", chains: true, palette: palette(false) });
    for (const [height, cols] of [
      [8, 34],
      [9, 32],
      [9, 34],
    ]) {
      const state = startState(session, {
        rows: height,
        cols,
        foci: new Int32Array(0),
        importance: "depth",
        fociFile: "foci.txt",
      });
      const rows = draw(session, state, false).rows.map((r) => r.slice(GUTTER));
      const tree = rows.findIndex((r) => r.startsWith(": "));
      expect(tree, rows.join("\n")).toBeGreaterThan(0);
      // The row above the tree is the key, and it says the mark every line of the tree starts with.
      expect(rows[tree - 1], rows.join("\n")).toMatch(/^key: ':' /);
      for (const r of rows) expect(displayWidth(r)).toBeLessThanOrEqual(cols - GUTTER);
    }
  });
});
