import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { EspalierError } from "../../src/errors.js";
import { lineCost, select } from "../../src/fit/select.js";
import { interest } from "../../src/interest/doi.js";
import { importance } from "../../src/interest/importance.js";
import { nodeOrder } from "../../src/interest/order.js";
import { buildTree } from "../../src/model/build-tree.js";
import { measure } from "../../src/model/measure.js";
import { PathIndex } from "../../src/model/path-index.js";
import type { Tree } from "../../src/model/tree.js";
import { renderText } from "../../src/render/summary-text.js";
import { buildView } from "../../src/view/build-view.js";
import type { ViewNode } from "../../src/view/view-node.js";
import { arbTreeWithFoci } from "../helpers/random-tree.js";

function setup(tree: Tree, focusList: number[], kind: "depth" | "size" = "depth", chains = false) {
  const m = measure(tree);
  const foci = Int32Array.from([...focusList].sort((a, b) => a - b));
  const scores = interest(tree, importance(tree, m, kind), foci);
  const order = nodeOrder(tree, m, scores);
  // Lines the forced nodes need (a chain link costs none).
  const forcedCount = [...scores.forced.keys()]
    .filter((i) => scores.forced[i])
    .reduce((a, i) => a + lineCost(tree, m, scores, chains, i), 0);
  const run = (budget: number) => select({ tree, measures: m, scores, order }, { budget, chains });
  return { m, foci, scores, order, forcedCount, run };
}

const budgets = fc.integer({ min: 1, max: 80 });
const kinds = fc.constantFrom<"depth" | "size">("depth", "size");

describe("select({tree, measures, scores, order}, {budget, headerLines, chains})", () => {
  it("never renders more lines than the budget, and refuses budgets below the forced nodes", () => {
    fc.assert(
      fc.property(arbTreeWithFoci(), budgets, kinds, fc.boolean(), ([tree, f], budget, kind, chains) => {
        const { m, foci, scores, forcedCount, run } = setup(tree, f, kind, chains);
        if (forcedCount > budget) {
          const err = (() => {
            try {
              run(budget);
            } catch (e) {
              return e;
            }
          })();
          expect(err).toBeInstanceOf(EspalierError);
          expect((err as EspalierError).code).toBe("BUDGET_TOO_SMALL");
          expect((err as EspalierError).details).toEqual({
            budget,
            smallest: forcedCount,
            before: 0,
            // The error names focus paths only when the forced set is more than the root.
            focused: scores.forcedNodes.length > 1,
          });
          return;
        }
        const sel = run(budget);
        const view = buildView({ index: new PathIndex(tree, m), scores, foci, selection: sel });
        const text = renderText(view, { units: "bytes", sizes: true, chains });
        const lines = text.split("\n").length - 1;
        expect(lines).toBe(sel.lines);
        expect(lines).toBeLessThanOrEqual(budget);
      }),
    );
  });

  it("nests selections: raising the budget never hides a shown node", () => {
    fc.assert(
      fc.property(
        arbTreeWithFoci(),
        budgets,
        fc.integer({ min: 0, max: 40 }),
        fc.boolean(),
        ([tree, f], b, extra, chains) => {
          const { forcedCount, run } = setup(tree, f, "depth", chains);
          const budget = Math.max(b, forcedCount);
          const small = run(budget).shown;
          const large = run(budget + extra).shown;
          for (let i = 0; i < tree.length; i++) if (small[i]) expect(large[i]).toBe(1);
        },
      ),
    );
  });

  it("shows exactly a prefix of the total order (no hidden node precedes a shown one)", () => {
    fc.assert(
      fc.property(arbTreeWithFoci(), budgets, kinds, fc.boolean(), ([tree, f], b, kind, chains) => {
        const { forcedCount, order, run } = setup(tree, f, kind, chains);
        const sel = run(Math.max(b, forcedCount));
        const all = [...Array(tree.length).keys()].sort(order);
        const k = sel.admitted.length;
        expect(all.slice(0, k).every((i) => sel.shown[i] === 1)).toBe(true);
        expect(all.slice(k).every((i) => sel.shown[i] === 0)).toBe(true);
        // Connected: every shown node's parent is shown.
        for (let i = 1; i < tree.length; i++) if (sel.shown[i]) expect(sel.shown[tree.parent[i]]).toBe(1);
      }),
      { numRuns: 500 },
    );
  });

  it("uses the whole budget whenever anything is hidden (one line per admission)", () => {
    fc.assert(
      fc.property(arbTreeWithFoci(), budgets, fc.boolean(), ([tree, f], b, chains) => {
        const { forcedCount, run } = setup(tree, f, "depth", chains);
        const budget = Math.max(b, forcedCount);
        const sel = run(budget);
        if (sel.admitted.length < tree.length) expect(sel.lines).toBe(budget);
        else expect(sel.lines).toBeLessThanOrEqual(budget);
        if (!chains && sel.admitted.length === tree.length) expect(sel.lines).toBe(tree.length);
      }),
    );
  });

  it("counts every hidden node in exactly one folded remainder, so totals add up at every shown node", () => {
    fc.assert(
      fc.property(arbTreeWithFoci(), budgets, ([tree, f], b) => {
        const { m, foci, scores, forcedCount, run } = setup(tree, f);
        const sel = run(Math.max(b, forcedCount));
        const view = buildView({ index: new PathIndex(tree, m), scores, foci, selection: sel });
        let hiddenNodes = 0;
        let shownNodes = 0;
        view.each((h) => {
          const v: ViewNode = h.data;
          shownNodes++;
          const childNodes = v.children.reduce((a, c) => a + c.nodes, 0);
          const childSize = v.children.reduce((a, c) => a + c.size, 0);
          expect(v.nodes).toBe(1 + childNodes + (v.hidden?.nodes ?? 0));
          expect(v.size).toBe(tree.ownSize[v.index] + childSize + (v.hidden?.size ?? 0));
          hiddenNodes += v.hidden?.nodes ?? 0;
        });
        expect(shownNodes + hiddenNodes).toBe(tree.length);
        expect(view.data.nodes).toBe(tree.length);
        expect(view.data.size).toBe(tree.ownSize.reduce((a, b) => a + b, 0));
      }),
    );
  });

  it("solves the tree knapsack: beyond the forced nodes, the shown ones carry the highest interests", () => {
    // With one line per node, no set of k nodes that contains the forced ones (connected or not) has a
    // larger total interest: the admitted non-forced nodes are the top ones among all non-forced nodes.
    fc.assert(
      fc.property(arbTreeWithFoci(), budgets, kinds, ([tree, f], b, kind) => {
        const { scores, forcedCount, run } = setup(tree, f, kind);
        const sel = run(Math.max(b, forcedCount));
        const free = [...sel.admitted].filter((i) => !scores.forced[i]);
        const best = [...scores.value.keys()]
          .filter((i) => !scores.forced[i])
          .map((i) => scores.value[i])
          .sort((x, y) => y - x)
          .slice(0, free.length);
        const sum = (xs: number[]) => xs.reduce((a, x) => a + x, 0);
        expect(sum(free.map((i) => scores.value[i]))).toBeCloseTo(sum(best), 9);
      }),
    );
  });

  it("stops at the first node that does not fit even when a later one would cost no line (regression)", () => {
    // Found by the prefix property: with chains and the budget used up, a parent's children that each
    // cost a line must still stop an only child further down the order.
    const parentOf = Int32Array.from([-1, 0, 1, 2, 3, 4, 3, 2, 2, 0, 9, 0, 11, 12, 0, 14]);
    const tree = buildTree({
      parentOf,
      name: [...parentOf].map((_, i) => `n${i}`),
      ownSize: new Float64Array(parentOf.length),
      hasSizes: false,
      ids: null,
      origin: new Int32Array(parentOf.length),
      originIsRow: false,
      fields: new Map(),
      rootName: "(root)",
    });
    for (let budget = 1; budget <= 16; budget++) {
      const { order, run, forcedCount } = setup(tree, [], "depth", true);
      if (budget < forcedCount) continue;
      const sel = run(budget);
      const all = [...Array(tree.length).keys()].sort(order);
      const k = sel.admitted.length;
      expect(all.slice(0, k).every((i) => sel.shown[i] === 1)).toBe(true);
      expect(all.slice(k).every((i) => sel.shown[i] === 0)).toBe(true);
    }
  });
});
