import type { HierarchyNode } from "d3-hierarchy";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { prepareDiff } from "../../src/diff/diff-trees.js";
import { EspalierError } from "../../src/errors.js";
import type { Key } from "../../src/explore/keys.js";
import { CURSOR_MARK, draw } from "../../src/explore/screen.js";
import { diffSession, type Session, summarySession } from "../../src/explore/session.js";
import type { ExploreState } from "../../src/explore/state.js";
import {
  type ExploreEvent,
  fitOf,
  GUTTER,
  STATUS_ROWS,
  specFoci,
  startState,
  update,
} from "../../src/explore/update.js";
import type { Tree } from "../../src/model/tree.js";
import { displayWidth } from "../../src/render/display-width.js";
import { prepare } from "../../src/summarize.js";
import type { ViewNode } from "../../src/view/view-node.js";
import { arbEdited } from "../diff/edit-script.js";
import { makeTree, nodeNamed } from "../helpers/make-tree.js";
import { arbTree } from "../helpers/random-tree.js";

const named = (name: Extract<Key, { name: string }>["name"]): Key => ({ name });
const char = (c: string): Key => ({ char: c });

/** Keys and resizes, weighted towards moves. */
const arbEvent: fc.Arbitrary<ExploreEvent> = fc.oneof(
  { weight: 6, arbitrary: fc.constantFrom(...(["down", "up", "left", "right"] as const).map(named)) },
  {
    weight: 4,
    arbitrary: fc.constantFrom(
      ...(["home", "end", "enter", "tab", "back-tab", "escape", "backspace", "f1"] as const).map(named),
    ),
  },
  { weight: 5, arbitrary: fc.constantFrom(..."o+-xnNiu/abh*w".split("").map(char)) },
  {
    weight: 1,
    arbitrary: fc
      .tuple(fc.integer({ min: 2, max: 30 }), fc.integer({ min: 8, max: 100 }))
      .map(([rows, cols]): ExploreEvent => ({ kind: "resize", rows, cols })),
  },
);

const arbSize = fc.tuple(fc.integer({ min: 2, max: 30 }), fc.integer({ min: 8, max: 100 }));

function session(tree: Tree, chains: boolean): Session {
  return summarySession(prepare(tree), { units: "bytes", chains });
}

function start(s: Session, rows: number, cols: number, foci: number[] = []): ExploreState {
  return startState(s, {
    rows,
    cols,
    foci: Int32Array.from(foci).sort(),
    importance: "depth",
    fociFile: "foci.txt",
  });
}

/**
 * Every screen is a valid summary of the tree for the state's foci: it fits the terminal, the cursor's
 * node is shown and marked once, and the five guarantees of docs/selection.md hold for the view.
 */
function checkScreen(s: Session, state: ExploreState): void {
  const screen = draw(s, state, false);
  expect(screen.rows.length).toBe(state.rows);
  for (const row of screen.rows) {
    expect(displayWidth(row)).toBeLessThanOrEqual(state.cols);
    expect(row).not.toContain("\u001b");
  }
  if (state.mode.kind === "help") return;
  const budget = state.rows - STATUS_ROWS;
  const fitted = fitOf(s, state.spec, state.rows, state.cols);
  if (fitted instanceof EspalierError) {
    // Only a resize can leave a view that does not fit: the screen says so and shows no tree.
    expect(fitted.code).toBe("BUDGET_TOO_SMALL");
    expect(screen.cursorRow).toBeNull();
    return;
  }
  const { tree, measures } = s;
  // 1. never more lines than the budget
  expect(fitted.lines.length).toBeLessThanOrEqual(budget);
  expect(fitted.selection.lines).toBe(fitted.lines.length);
  // The cursor's node is shown, and its row alone carries the cursor mark.
  expect(fitted.isShown[state.spec.cursor]).toBe(1);
  const marked = screen.rows.filter((row) => row.startsWith(CURSOR_MARK));
  expect(marked.length).toBe(1);
  expect(screen.rows.indexOf(marked[0])).toBe(screen.cursorRow);
  for (const f of specFoci(state.spec)) expect(fitted.isShown[f]).toBe(1);
  // 3. a prefix of one total order (no hidden node before a shown one), and connected
  const all = [...Array(tree.length).keys()].sort(fitted.order);
  const k = fitted.shown.length;
  expect(all.slice(0, k).every((i) => fitted.isShown[i] === 1)).toBe(true);
  expect(all.slice(k).every((i) => fitted.isShown[i] === 0)).toBe(true);
  // 4. the budget is used up whenever something is hidden
  if (k < tree.length) expect(fitted.lines.length).toBe(budget);
  // 2. nested: a larger budget hides nothing shown here, unless the key (and the header's rows) took
  // lines the tree had: docs/selection.md's one exception, as tests/cli/budget-nesting.test.ts has it
  // for the printed screen. (Found at 8 rows and 34 columns: the key left out, 5 lines for the tree;
  // at 11 rows it takes 3, and the header a row more, 4 for the tree.)
  const larger = s.fit(specFoci(state.spec), budget + 3, state.spec.importance, state.cols - GUTTER);
  if (larger.lines.length - larger.headerLines >= fitted.lines.length - fitted.headerLines)
    for (const i of fitted.shown) expect(larger.isShown[i]).toBe(1);
  // 5. conservation: nodes and sizes add up at every shown node, and the root holds the whole tree
  let hidden = 0;
  (fitted.view as HierarchyNode<ViewNode>).each(({ data: v }) => {
    const kids = v.children.reduce((a, c) => a + c.nodes, 0);
    expect(v.nodes).toBe(1 + kids + (v.hidden?.nodes ?? 0));
    const kidSize = v.children.reduce((a, c) => a + c.size, 0);
    expect(v.size).toBeCloseTo(tree.ownSize[v.index] + kidSize + (v.hidden?.size ?? 0), 6);
    hidden += v.hidden?.nodes ?? 0;
  });
  expect(k + hidden).toBe(tree.length);
  expect(fitted.view.data.nodes).toBe(measures.count[0]);
}

describe("update(session, state, event)", () => {
  const everyScreenValid = fc.property(
    arbTree(40),
    fc.boolean(),
    arbSize,
    fc.array(arbEvent, { maxLength: 40 }),
    (tree, chains, [rows, cols], events) => {
      const s = session(tree, chains);
      let state = start(s, rows, cols);
      checkScreen(s, state);
      for (const event of events) {
        state = update(s, state, event);
        checkScreen(s, state);
      }
    },
  );

  it("keeps every screen a valid summary: fits the terminal, the five selection guarantees, conservation", () => {
    fc.assert(everyScreenValid, { numRuns: 150 });
  });

  it("keeps the rows its fit counted where a shorter header lets the key say all in fewer rows", () => {
    // Met once in a land: 27 nodes, resized to 15 x 34, focus deep; the header shortened from 4 rows to
    // 2 gave the key 5, of which it took 4, and the screen had 13 rows of a budget of 14 (the fit had
    // counted 14). Replayed from fast-check's seed and path for the property above.
    fc.assert(everyScreenValid, { seed: -523048119, path: "114", endOnFailure: true });
  });

  it("draws the lines its fit counted after a search on a 23 x 33 screen", () => {
    // Met in a land: 39 nodes, 23 rows and 33 columns, chains, then "/": the fit counted 22 lines and
    // 20 were drawn, once the view's key took a row more for every three rows of budget (b9d4f73):
    // the fit gave the key the 4 rows the first screen's marks needed, and the screen laid out with
    // them needed 2. The key now keeps the rows counted for it, blank below. Replayed from
    // fast-check's seed and path for the property above.
    fc.assert(everyScreenValid, { seed: -92160201, path: "142", endOnFailure: true });
  });

  it("keeps every screen of a diff a valid summary of the combined tree", () => {
    fc.assert(
      fc.property(
        arbEdited(30),
        arbSize,
        fc.array(arbEvent, { maxLength: 30 }),
        (edited, [rows, cols], events) => {
          const s = diffSession(prepareDiff(edited.oldTree, edited.newTree), {
            units: "plain",
            chains: false,
          });
          let state = start(s, rows, cols);
          for (const event of events) {
            state = update(s, state, event);
            const screen = draw(s, state, false);
            expect(screen.rows.length).toBe(state.rows);
            for (const row of screen.rows) expect(displayWidth(row)).toBeLessThanOrEqual(state.cols);
            const fitted = fitOf(s, state.spec, state.rows, state.cols);
            if (fitted instanceof EspalierError || state.mode.kind === "help") continue;
            // The totals header (wrapped to the width, as espalier diff prints it), then one line per
            // shown node, within the budget.
            expect(fitted.headerLines).toBeGreaterThanOrEqual(1);
            expect(fitted.lines.length).toBe(fitted.headerLines + fitted.shown.length);
            expect(fitted.lines.length).toBeLessThanOrEqual(state.rows - STATUS_ROWS);
            expect(fitted.isShown[state.spec.cursor]).toBe(1);
            const all = [...Array(s.tree.length).keys()].sort(fitted.order);
            const k = fitted.shown.length;
            expect(all.slice(0, k).every((i) => fitted.isShown[i] === 1)).toBe(true);
            expect(all.slice(k).every((i) => fitted.isShown[i] === 0)).toBe(true);
            // Conservation in the combined tree: nodes add up at every shown node, the root holds all.
            let hidden = 0;
            (fitted.view as HierarchyNode<ViewNode>).each(({ data: v }) => {
              expect(v.nodes).toBe(1 + v.children.reduce((a, c) => a + c.nodes, 0) + (v.hidden?.nodes ?? 0));
              hidden += v.hidden?.nodes ?? 0;
            });
            expect(k + hidden).toBe(s.tree.length);
          }
        },
      ),
      { numRuns: 80 },
    );
  });

  it("undo, pressed once per remembered step, brings back the first view", () => {
    fc.assert(
      fc.property(
        arbTree(40),
        arbSize,
        fc.array(arbEvent, { maxLength: 30 }),
        (tree, [rows, cols], events) => {
          const s = session(tree, true);
          const first = start(s, rows, cols);
          let state = first;
          for (const event of events) if (!("kind" in event)) state = update(s, state, event);
          // Escape leaves a search (going back to where it began), a file prompt or the help.
          state = update(s, state, named("escape"));
          expect(state.mode.kind).toBe("browse");
          const steps = state.undo.length;
          for (let k = 0; k < steps; k++) state = update(s, state, char("u"));
          expect(state.spec).toEqual(first.spec);
          expect(update(s, state, char("u")).spec).toEqual(first.spec);
        },
      ),
      { numRuns: 100 },
    );
  });

  it("is pure: the same events from the same state give equal states and byte-identical screens", () => {
    fc.assert(
      fc.property(
        arbTree(30),
        arbSize,
        fc.array(arbEvent, { maxLength: 25 }),
        (tree, [rows, cols], events) => {
          const run = () => {
            const s = session(tree, true);
            let state = start(s, rows, cols);
            const screens: string[] = [];
            for (const event of events) {
              state = update(s, state, event);
              screens.push(draw(s, state, true).rows.join("\n"));
            }
            return screens;
          };
          expect(run()).toEqual(run());
        },
      ),
      { numRuns: 50 },
    );
  });
});

// R{A{A1{A1a,A1b},A2{A2a}},B{B1{B1a},B2}}: the check tree of docs/interest.md.
const tree = makeTree("R{A{A1{A1a,A1b},A2{A2a}},B{B1{B1a},B2}}");
const at = (name: string) => nodeNamed(tree, name);

describe("moves on the check tree", () => {
  const s = session(tree, false);
  const big = start(s, 20, 60);
  const keys = (state: ExploreState, ...events: ExploreEvent[]) =>
    events.reduce((st, e) => update(s, st, e), state);

  it("Down and Up focus the next and previous shown node in pre-order", () => {
    const down = keys(big, named("down"));
    expect(down.spec.cursor).toBe(at("A"));
    expect(keys(down, named("down"), named("down")).spec.cursor).toBe(at("A1a"));
    expect(keys(down, named("up")).spec.cursor).toBe(at("R"));
    expect(keys(big, named("up")).message).not.toBeNull();
  });

  it("Left focuses the parent, Right the first shown child", () => {
    const a1 = keys(big, named("down"), named("right"));
    expect(a1.spec.cursor).toBe(at("A1"));
    expect(keys(a1, named("left")).spec.cursor).toBe(at("A"));
    expect(keys(a1, named("right"), named("right")).message).toBe("a leaf");
  });

  // Under the importance by size a big subtree far away can outrank a focus's small children (see
  // docs/selection.md): here B's children fill the screen before A's.
  const sized = makeTree("R{A{a1:1,a2:1},B{B1:500,B2:500,B3:500}}");
  const ss = session(sized, false);
  const onA = startState(ss, {
    rows: 6,
    cols: 60,
    foci: Int32Array.of(nodeNamed(sized, "A")),
    importance: "size",
    fociFile: "foci.txt",
  });

  it("Right on a node whose children are all folded focuses the first of them in the fit's order", () => {
    const before = fitOf(ss, onA.spec, 6, 60);
    if (before instanceof EspalierError) throw before;
    expect(before.isShown[nodeNamed(sized, "a1")]).toBe(0);
    expect(before.isShown[nodeNamed(sized, "a2")]).toBe(0);
    // a1 and a2 tie on every key but input order.
    expect(update(ss, onA, named("right")).spec.cursor).toBe(nodeNamed(sized, "a1"));
  });

  it("Enter opens the fold on the cursor's line: its best hidden children join the foci as opened", () => {
    const opened = update(ss, onA, named("enter"));
    expect(opened.spec.extra.filter((e) => e.how === "opened").map((e) => e.node)).toEqual([
      nodeNamed(sized, "a1"),
    ]);
    const after = fitOf(ss, opened.spec, 6, 60);
    if (after instanceof EspalierError) throw after;
    expect(after.isShown[nodeNamed(sized, "a1")]).toBe(1);
    expect(opened.spec.cursor).toBe(onA.spec.cursor);
    // Undo closes it again; on a node with nothing folded, Enter says so.
    expect(update(ss, opened, char("u")).spec).toEqual(onA.spec);
    expect(update(ss, update(ss, onA, named("left")), named("enter")).message).toBe("nothing folded here");
  });

  it("+ pins the node so that it stays a focus after the cursor moves; - and x drop extra foci", () => {
    const pinned = keys(big, named("down"), named("right"), char("+"), named("home"));
    expect(pinned.spec.cursor).toBe(0);
    expect([...specFoci(pinned.spec)]).toEqual([at("A"), at("A1")].filter((i) => i === at("A1")));
    expect(keys(pinned, char("-")).spec.extra).toEqual([]);
    expect(keys(pinned, char("x")).spec.extra).toEqual([]);
    expect(keys(pinned, named("tab")).spec.cursor).toBe(at("A1"));
  });

  it("/ follows the first match as the query grows, Enter keeps it, Escape goes back, n and N cycle", () => {
    const typing = keys(big, char("/"), char("a"), char("2"));
    expect(typing.spec.cursor).toBe(at("A2"));
    expect(keys(typing, named("escape")).spec).toEqual(big.spec);
    const one = keys(typing, named("backspace"));
    // "a" matches A, A1, A1a, A1b, A2, A2a and B1a (A-Z match a-z), in pre-order.
    expect(one.mode).toMatchObject({ kind: "search", count: 7, countedTo: tree.length, matched: true });
    const kept = keys(one, named("enter"));
    expect(kept.spec.cursor).toBe(at("A"));
    expect(keys(kept, char("n")).spec.cursor).toBe(at("A1"));
    expect(keys(kept, char("N")).spec.cursor).toBe(at("B1a"));
    expect(keys(kept, char("u")).spec).toEqual(big.spec);
  });

  it("i switches the importance, and q, p and Ctrl-C ask the edge to leave", () => {
    expect(keys(big, char("i")).spec.importance).toBe("size");
    expect(keys(big, char("q")).request).toEqual({ kind: "quit" });
    expect(keys(big, char("p")).request).toEqual({ kind: "print" });
    expect(keys(big, named("ctrl-c")).request).toEqual({ kind: "interrupt" });
  });

  it("w asks for a file name, then asks the edge to write there", () => {
    const typed = keys(
      big,
      char("w"),
      named("backspace"),
      named("backspace"),
      named("backspace"),
      char("y"),
      char("a"),
      char("m"),
      char("l"),
    );
    expect(typed.mode).toEqual({ kind: "write", file: "foci.yaml" });
    expect(keys(typed, named("enter")).request).toEqual({ kind: "write", file: "foci.yaml" });
    expect(keys(typed, named("escape")).request).toBeNull();
  });

  it("refuses a move whose focus paths would not fit, and says how many rows it needs", () => {
    // Four rows: the header, two lines of tree and the status row.
    const tiny = start(s, 4, 60);
    const moved = keys(tiny, named("down"), named("right"), named("right"));
    expect(fitOf(s, moved.spec, 4, 60)).not.toBeInstanceOf(EspalierError);
    // Right from A (to A1) is what was refused: on a tall screen it is taken. The fewest rows that show
    // it are the number the message names (from the error's smallest budget, never from its wording).
    const wanted = keys(start(s, 30, 60), named("down"), named("right")).spec;
    expect([moved.spec.cursor, wanted.cursor]).toEqual([at("A"), at("A1")]);
    let fewest = 3;
    while (fitOf(s, wanted, fewest, 60) instanceof EspalierError) fewest++;
    expect(moved.message?.match(/\d+/g)?.map(Number)).toEqual([fewest]);
  });
});
