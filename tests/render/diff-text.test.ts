import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { diffTrees } from "../../src/diff/diff-trees.js";
import { StringNames } from "../../src/model/names.js";
import type { Tree } from "../../src/model/tree.js";
import { renderDiffText } from "../../src/render/diff-text.js";
import { displayWidth } from "../../src/render/display-width.js";
import { MIN_WIDTH } from "../../src/render/line-layout.js";
import { arbEdited } from "../diff/edit-script.js";
import { makeIdTree } from "../diff/id-tree.js";
import { makeTree } from "../helpers/make-tree.js";

function text(
  oldTree: Tree,
  newTree: Tree,
  budget = 40,
  sizes = oldTree.hasSizes || newTree.hasSizes,
  chains = false,
) {
  const r = diffTrees(oldTree, newTree, { foci: [], budget, importance: "depth", chains });
  const header = { budget, lines: r.selection.lines, foci: r.fociPaths };
  return renderDiffText(r.view, r.totals, { units: "bytes", sizes, by: r.combined.by, chains, header });
}

describe("renderDiffText(view, totals, options)", () => {
  it("opens with the totals per kind and tags each change in words", () => {
    expect(text(makeIdTree("R{A{x,y},B{z}}"), makeIdTree("R{A{y},B{z,x},C}"))).toBe(
      [
        "diff by id: 1 added, 0 removed, 1 moved, 0 renamed, 0 edited, 0 resized; 6 -> 7 nodes; no focus; 8 of 40 lines",
        ": R  7 nodes",
        "  . A  2 nodes",
        "    . y",
        "  : B  3 nodes",
        "    . z",
        "    : [moved from A] x",
        "  : [added] C",
        "",
      ].join("\n"),
    );
  });

  it("signs size changes and says what changed inside each folded remainder", () => {
    const oldTree = makeTree("R{A{x:10,y:20},B{z:5},D{d:1}}");
    const newTree = makeTree("R{A{y:26},B{z:5,w:3},D{d:1}}");
    expect(text(oldTree, newTree)).toBe(
      [
        "diff by path: 1 added, 1 removed, 0 moved, 0 renamed, 0 edited, 1 resized; 8 -> 8 nodes, 9 with the 1 removed, size 36 B -> 35 B (net -1 B); no focus; 10 of 40 lines",
        ": R  9 nodes, 35 B, net -1 B",
        "  : A  3 nodes, 26 B, net -4 B",
        "    : [removed -10 B] x",
        "    : [resized +6 B] y  26 B",
        "  : B  3 nodes, 8 B, net +3 B",
        "    . z  5 B",
        "    : [added +3 B] w  3 B",
        "  . D  2 nodes, 1 B",
        "    . d  1 B",
        "",
      ].join("\n"),
    );
    expect(text(oldTree, newTree, 4).split("\n").slice(1, 4)).toEqual([
      ": R  9 nodes, 35 B, net -1 B  (hidden: 1 child, 2 nodes, 1 B; none changed)",
      "  : A  3 nodes, 26 B, net -4 B  (hidden: 2 children, 2 nodes, 26 B; 1 removed, 1 resized, net -4 B)",
      "  : B  3 nodes, 8 B, net +3 B  (hidden: 2 children, 2 nodes, 8 B; 1 added, net +3 B)",
    ]);
  });

  it("joins a run of only children onto one line, as a summary does, but never below a change", () => {
    const oldTree = makeTree("R{A{B{C{x:1}}},D{E{F:2}}}");
    const newTree = makeTree("R{A{B{C{x:1,y:4}}},D{E{F:3}}}");
    expect(text(oldTree, newTree, 40, true, true)).toBe(
      [
        "diff by path: 1 added, 0 removed, 0 moved, 0 renamed, 0 edited, 1 resized; 8 -> 9 nodes, size 3 B -> 8 B (net +5 B); no focus; 6 of 40 lines",
        ": R  9 nodes, 8 B, net +5 B",
        // The numbers are the chain's top node's: A with all below it (3 names + 2 lines below).
        "  : A / B / C  5 nodes, 5 B, net +4 B",
        "    . x  1 B",
        "    : [added +4 B] y  4 B",
        "  : D / E / [resized +1 B] F  3 nodes, 3 B, net +1 B",
        "",
      ].join("\n"),
    );
  });

  it("names a renamed node's old name and a move from the root, escaping control characters", () => {
    const oldTree = makeIdTree("R{A{b},k}");
    const newTree: Tree = {
      ...makeIdTree("R{A{k},b}"),
      ids: new StringNames(["R", "A", "k", "b"]),
      name: new StringNames(["R", "A", "k", "b\u001b[31m"]),
    };
    const out = text(oldTree, newTree);
    // The old parent was the root: named, so the tag does not read as "k was a top node".
    expect(out).toContain(": [moved from R (the root)] k");
    // b also has a new name: moved wins as its kind, and its old name is said too.
    expect(out).toContain(": [moved from A, renamed from b] b\\u{1b}[31m");
    const renamed: Tree = { ...makeIdTree("R{A{b},k}"), name: new StringNames(["R", "A", "b", "k2"]) };
    const oldWithEscape: Tree = { ...oldTree, name: new StringNames(["R", "A", "b", "k\u2028"]) };
    expect(text(oldWithEscape, renamed)).toContain(": [renamed from k\\u{2028}] k2");
  });

  it("states on the header the root line's node count when nodes were removed (NEW's plus the removed)", () => {
    // The lines count removed nodes at their old places (docs/diff.md, The combined tree), so the root's
    // count passed NEW's total on the header with nothing on screen to say why (seen on two find
    // listings, one file removed and one added: header 53,359 -> 53,359, root 53,360).
    fc.assert(
      fc.property(arbEdited(), fc.integer({ min: 2, max: 30 }), (edited, b) => {
        const r = diffTrees(edited.oldTree, edited.newTree, { foci: [], budget: b, importance: "depth" });
        const header = { budget: b, lines: r.selection.lines, foci: r.fociPaths };
        const out = renderDiffText(r.view, r.totals, {
          units: "bytes",
          sizes: true,
          by: r.combined.by,
          header,
        });
        const [headerLine, rootLine] = out.split("\n");
        const removed = r.totals.changes.removed;
        const said = /, ([\d,]+) with the ([\d,]+) removed/.exec(headerLine);
        if (removed === 0) {
          expect(said).toBeNull();
          return;
        }
        expect(said).not.toBeNull();
        const count = (text: string) => Number(text.replace(/,/g, ""));
        expect(count(said![2])).toBe(removed);
        // The root line's count, as printed (a root of one node prints none).
        const onRoot = / {2}([\d,]+) nodes/.exec(rootLine);
        expect(count(said![1])).toBe(onRoot ? count(onRoot[1]) : 1);
        expect(count(said![1])).toBe(r.view.data.nodes);
      }),
    );
  });

  it("keeps every line within the width, the change tags and the changes folded inside first", () => {
    fc.assert(
      fc.property(
        arbEdited(),
        fc.integer({ min: 2, max: 30 }),
        fc.integer({ min: MIN_WIDTH, max: 90 }),
        (edited, b, width) => {
          const r = diffTrees(edited.oldTree, edited.newTree, { foci: [], budget: b, importance: "depth" });
          const wide = renderDiffText(r.view, r.totals, { units: "bytes", sizes: true, by: r.combined.by });
          const out = renderDiffText(r.view, r.totals, {
            units: "bytes",
            sizes: true,
            by: r.combined.by,
            width,
          });
          const lines = out.trimEnd().split("\n");
          expect(lines).toHaveLength(wide.trimEnd().split("\n").length);
          for (const line of lines) expect(displayWidth(line)).toBeLessThanOrEqual(width);
          // With room for the indent and a tag, every tag survives (the old parent's path is cut first).
          const deepest = Math.max(...r.combined.tree.depth);
          if (width >= 60 && 2 * deepest + 30 <= width) {
            const tags = (text: string) => text.match(/\[(added|removed|moved|renamed|resized)/g);
            expect(tags(out)).toEqual(tags(wide));
          }
        },
      ),
    );
  });
});

describe("renderDiffText(view, totals, { width }): a fold's sizes in a diff", () => {
  const render = (oldTree: Tree, newTree: Tree, budget: number, width?: number) => {
    const r = diffTrees(oldTree, newTree, { foci: [], budget, importance: "depth", chains: false });
    return renderDiffText(r.view, r.totals, { units: "plain", sizes: true, by: r.combined.by, width });
  };

  it("says only the count and net change of a fold of removed nodes, which hold no size now", () => {
    // docs/selection.md (Narrow screens): a removed node's line has no size; nor has a fold of removed nodes.
    const oldTree = makeTree("R{zones:4{a:10,b:20,c:30},keep:5}");
    const newTree = makeTree("R{zones:4,keep:5}");
    const out = render(oldTree, newTree, 3);
    // zones' 4 = its own 4 + nothing hidden now; its net -60 = the three removed files' 10 + 20 + 30.
    expect(out).toContain(
      "  : zones  4 nodes, 4, net -60  (hidden: 3 children, 3 nodes; 3 removed, net -60)",
    );
    expect(out).not.toMatch(/nodes, 0;/);
  });

  it("counts a fold's changes in one number before the line's sizes are cut", () => {
    // 11 = 1 + 10 hidden (g removed counted); 117 = R's own 0 + 117 hidden; net +6 = +5 (c) + 1 (h)
    // + 1 (i) - 1 (g): every number read off the line alone, at 90 columns and at 70.
    const oldTree = makeTree("R{lib:8{a:10,b:20,c:30,d:40,e:1,f:1,g:1}}");
    const newTree = makeTree("R{lib:8{a:10,b:20,c:35,d:40,e:1,f:1,h:1,i:1}}");
    expect(render(oldTree, newTree, 2, 90)).toContain(
      ": R  11 nodes, 117, net +6  (hidden: 10 nodes, 117; 2 added, 1 removed, 1 resized, net +6)",
    );
    expect(render(oldTree, newTree, 2, 70)).toContain(
      ": R  11 nodes, 117, net +6  (10 hidden, 117; 4 changed, net +6)",
    );
  });
});

describe("renderDiffText(view, totals, { width }): a name kept whole before numbers said twice", () => {
  const render = (oldTree: Tree, newTree: Tree, budget: number, width: number, sizes = true) => {
    const r = diffTrees(oldTree, newTree, { foci: [], budget, importance: "depth", chains: false });
    return renderDiffText(r.view, r.totals, { units: "plain", sizes, by: r.combined.by, width });
  };
  // A removed folder with all below it folded: its fold's count and net are the line's less its own
  // (13 = 1 + 12; -30 = -4 own - 26 hidden), so the fold's words give way before the name is cut.
  const oldTree = makeTree(
    "R{keep:1,harbour-ledger-reconciliation:4{a:1,b:2,c:3,d:4,e:5,f:6,g:1,h:1,i:1,j:1,k:0,l:1}}",
  );
  const newTree = makeTree("R{keep:1}");

  it("keeps the removed folder's name whole with its fold's count alone", () => {
    const wide = render(oldTree, newTree, 3, 200);
    expect(wide).toContain(
      "  : [removed -4] harbour-ledger-reconciliation  13 nodes, net -30  (hidden: 12 children, 12 nodes; 12 removed, net -26)",
    );
    // At 80 columns the full fold does not fit: the name stays, the fold says its count.
    const narrow = render(oldTree, newTree, 3, 80);
    expect(narrow).toContain(
      "  : [removed -4] harbour-ledger-reconciliation  13 nodes, net -30  (12 hidden)",
    );
    expect(narrow).not.toContain("…");
  });

  it("without sizes, leaves out the count the fold says (13 = 1 + 12) before cutting the name", () => {
    const out = render(oldTree, newTree, 3, 58, false);
    expect(out).toContain("  : [removed] harbour-ledger-reconciliation  (12 hidden)");
    for (const line of out.split("\n")) expect(line.length).toBeLessThanOrEqual(58);
  });
});
