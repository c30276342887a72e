import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { KEY_MAP } from "../../src/explore/key-map.js";
import type { Key } from "../../src/explore/keys.js";
import { CURSOR_MARK, draw } from "../../src/explore/screen.js";
import { summarySession } from "../../src/explore/session.js";
import { type ExploreEvent, MIN_COLUMNS, startState, update } from "../../src/explore/update.js";
import { resolveFoci } from "../../src/focus/resolve.js";
import { loadTree } from "../../src/load/index.js";
import { defaultLoadOptions } from "../../src/load/load-options.js";
import { namesToArray } from "../../src/model/names.js";
import { displayWidth } from "../../src/render/display-width.js";
import { legendLines } from "../../src/render/marks.js";
import { palette } from "../../src/render/palette.js";
import { prepare } from "../../src/summarize.js";
import { leakedNames } from "../helpers/leaked-names.js";

const org = loadTree(readFileSync("fixtures/quillfeather-org.csv", "utf8"), {
  ...defaultLoadOptions,
  file: "quillfeather-org.csv",
  parentField: "manager",
  sizeField: "cost",
  rootName: "quillfeather-org.csv",
});
const prepared = prepare(org);
/** Every real name below the root, once (names of 1-2 characters would match pseudonyms' hex digits). */
const realNames = namesToArray(org.name).filter((n, i) => i > 0 && n.length >= 3);
const named = (name: Extract<Key, { name: string }>["name"]): Key => ({ name });
const typed = (text: string): Key[] => Array.from(text, (c) => ({ char: c }));
const ESC = "\u001b";

function sessionWith(options: { colour?: boolean; key?: string; sizeName?: string }) {
  return summarySession(prepared, {
    units: "plain",
    chains: true,
    pseudonymKey: options.key,
    palette: palette(options.colour ?? false),
    ...(options.sizeName === undefined ? {} : { inputFacts: { sizeName: options.sizeName } }),
  });
}

function screens(
  options: { colour?: boolean; key?: string; sizeName?: string },
  rows: number,
  cols: number,
  events: ExploreEvent[],
) {
  const s = sessionWith(options);
  s.search.advance(Number.MAX_SAFE_INTEGER);
  let state = startState(s, {
    rows,
    cols,
    foci: resolveFoci(prepared.index, ["Q2417"]),
    importance: "depth",
    fociFile: "foci.txt",
  });
  const out = [draw(s, state, options.colour ?? false)];
  for (const e of events) {
    state = update(s, state, e);
    out.push(draw(s, state, options.colour ?? false));
  }
  return out;
}

const walk: ExploreEvent[] = [
  named("down"),
  named("left"),
  named("left"),
  { char: "o" },
  { char: "i" },
  { char: "/" },
  ...typed("Esme"),
  named("enter"),
  { char: "n" },
  { kind: "resize", rows: 12, cols: 40 },
  named("up"),
  { char: "h" },
  named("down"),
];

describe("draw(session, state, colour)", () => {
  it("writes no control sequence at all without colour (NO_COLOR): the @ gutter carries the cursor", () => {
    for (const screen of screens({}, 20, 80, walk)) {
      for (const row of screen.rows) expect(row).not.toContain(ESC);
      if (screen.cursorRow !== null) expect(screen.rows[screen.cursorRow].startsWith(CURSOR_MARK)).toBe(true);
    }
  });

  it("with colour, puts the cursor's row and the status row in negative image (SGR 7 ... SGR 27)", () => {
    // ECMA-48 8.3.117: SGR 7 negative image, SGR 27 positive image.
    const [first] = screens({ colour: true }, 20, 80, []);
    const row = first.rows[first.cursorRow ?? -1];
    expect(row.startsWith(`${ESC}[7m${CURSOR_MARK}`)).toBe(true);
    expect(row.endsWith(`${ESC}[27m`)).toBe(true);
    expect(first.rows[19].startsWith(`${ESC}[7m`)).toBe(true);
  });

  it("fits 40 columns: no row is wider, in the tree, the status row or the help", () => {
    for (const screen of screens({}, 14, 40, walk)) {
      for (const row of screen.rows) expect(displayWidth(row)).toBeLessThanOrEqual(40);
    }
  });

  it("lists every key of the key map in the help", () => {
    const [, help] = screens({}, 80, 100, [{ char: "h" }]);
    const text = help.rows.join("\n");
    for (const binding of KEY_MAP) if (binding.label !== "") expect(text).toContain(binding.label);
    // Every bound key is named by some label (a pair such as "Down / Up" names both).
    const labels = KEY_MAP.map((b) => b.label).join(" ");
    const spelled: Record<string, string> = {
      down: "Down",
      up: "Up",
      left: "Left",
      right: "Right",
      home: "Home",
      end: "End",
      enter: "Enter",
      tab: "Tab",
      "back-tab": "Shift-Tab",
      f1: "F1",
      "ctrl-c": "Ctrl-C",
      "ctrl-l": "Ctrl-L",
    };
    for (const binding of KEY_MAP)
      for (const key of binding.keys)
        expect(labels).toContain(typeof key === "string" ? spelled[key] : key.char);
  });

  it("explains the marks and numbers of the lines after the keys, as --legend does", () => {
    const [, help] = screens({}, 200, 100, [{ char: "h" }]);
    const text = help.rows.join("\n");
    expect(text).toContain("the lines");
    // Each legend line starts a row of its own (a long one wraps onto further rows).
    for (const line of legendLines("summary", 100)) expect(help.rows).toContain(line);
  });

  it("calls sizes in the help what the header and key call them (the size field's name, a value size)", () => {
    // espalier explore org.csv --size-field cost: the header and the printed legend say "a cost:".
    const [, help] = screens({ sizeName: "cost" }, 200, 100, [{ char: "h" }]);
    for (const line of legendLines("summary", 100, "cost")) expect(help.rows).toContain(line);
    const text = help.rows.join(" ");
    expect(text).toContain("a cost:");
    expect(text).not.toContain("a size:");
  });

  it("with --pseudonymize, shows no real name anywhere: tree, status, search, help", () => {
    const key = "a-secret-kept-out-of-logs";
    // The walk visits the tree, a move, an opened fold, a search with matches, a resize to 40 columns and
    // the help; then a search for a real name, which must find nothing (the search reads pseudonyms only).
    const all = screens({ key }, 24, 100, [...walk, named("escape"), { char: "/" }, ...typed("Rosa")]);
    const last = all[all.length - 1];
    expect(last.rows[last.rows.length - 1]).toContain("no match");
    // Without a key the same search matches, so "no match" above is the pseudonyms' doing.
    const plain = screens({}, 24, 100, [{ char: "/" }, ...typed("Rosa")]);
    const status = plain[plain.length - 1].rows;
    expect(status[status.length - 1]).not.toContain("no match");
    // And the check below can fail: the screens without a key do show real names.
    expect(leakedNames(plain.map((screen) => screen.rows.join("\n")).join("\n"), realNames)).not.toEqual([]);
    const shown = all.map((screen) => screen.rows.join("\n")).join("\n");
    expect(leakedNames(shown, realNames)).toEqual([]);
  });
  it("on a screen narrower than its lines' floor, says how many columns it needs instead of cutting the key", () => {
    // Below GUTTER + MIN_WIDTH columns the key and the lines would be cut short of what they say
    // (docs/cli.md, explore): the screen names the narrowest width that shows the view.
    const s = sessionWith({});
    const at = (cols: number) =>
      draw(
        s,
        startState(s, {
          rows: 20,
          cols,
          foci: resolveFoci(prepared.index, ["Q2417"]),
          importance: "depth",
          fociFile: "f",
        }),
        false,
      ).rows;
    expect(at(MIN_COLUMNS - 1)[0]).toBe(`needs ${MIN_COLUMNS} columns`);
    for (let cols = 16; cols < MIN_COLUMNS; cols++) {
      const rows = at(cols);
      expect(rows[0], `${cols}`).toMatch(new RegExp(`needs ${MIN_COLUMNS} columns$`));
      for (const row of rows) expect(displayWidth(row)).toBeLessThanOrEqual(cols);
      expect(rows.join("\n")).not.toMatch(/^key: /m);
    }
    // From the floor on, the tree is drawn with its key, every row within the width.
    const wide = at(MIN_COLUMNS);
    expect(wide.some((r) => /^ *key: /.test(r))).toBe(true);
    for (const row of wide) expect(displayWidth(row)).toBeLessThanOrEqual(MIN_COLUMNS);
  });

  it("on a screen too short for the view, names the fewest rows that show it", () => {
    const s = sessionWith({});
    const start = (rows: number) =>
      startState(s, {
        rows,
        cols: 60,
        foci: resolveFoci(prepared.index, ["Q2417"]),
        importance: "depth",
        fociFile: "f",
      });
    // Q2417's path takes its depth + 1 rows and the status row one more: shrink below that.
    const tall = start(40);
    const short = update(s, tall, { kind: "resize", rows: 4, cols: 60 });
    const rows = draw(s, short, false).rows;
    expect(rows).toHaveLength(4);
    let fewest = 4;
    while (
      draw(s, update(s, tall, { kind: "resize", rows: fewest, cols: 60 }), false).rows[0].startsWith(
        "too small",
      )
    )
      fewest++;
    expect(fewest).toBeGreaterThan(4);
    expect(rows[0].match(/\d+/g)?.map(Number)).toEqual([fewest]);
  });
});
