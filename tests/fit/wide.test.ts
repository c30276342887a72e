import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { select } from "../../src/fit/select.js";
import { resolvePath } from "../../src/focus/resolve.js";
import { interest } from "../../src/interest/doi.js";
import { importance } from "../../src/interest/importance.js";
import { childrenByDepthOrder, nodeOrder } from "../../src/interest/order.js";
import { buildTree } from "../../src/model/build-tree.js";
import { measure } from "../../src/model/measure.js";
import { PathIndex } from "../../src/model/path-index.js";
import type { Tree } from "../../src/model/tree.js";
import { buildView } from "../../src/view/build-view.js";
import type { ViewNode } from "../../src/view/view-node.js";
import { arbTreeWithFoci } from "../helpers/random-tree.js";

// Shortcuts for nodes with very many children (kept child orders, folded rests from totals, name
// tables by hash) must give exactly what the plain walk gives.

describe("shortcuts for wide nodes", () => {
  it("select with the kept child order admits what the scan admits (importance by depth)", () => {
    fc.assert(
      fc.property(
        arbTreeWithFoci(80),
        fc.integer({ min: 1, max: 60 }),
        fc.boolean(),
        ([tree, f], budget, chains) => {
          const m = measure(tree);
          const foci = Int32Array.from([...f].sort((a, b) => a - b));
          const scores = interest(tree, importance(tree, m, "depth"), foci);
          const order = nodeOrder(tree, m, scores);
          const run = (hint?: (p: number) => Int32Array | null) => {
            try {
              return select({ tree, measures: m, scores, order }, { budget, chains, childrenInOrder: hint });
            } catch (error) {
              return (error as Error).message;
            }
          };
          const plain = run();
          const hinted = run((p) => (m.children[p] >= 2 ? childrenByDepthOrder(m, p) : null));
          expect(hinted).toEqual(plain);
        },
      ),
    );
  });

  it("folded rests match the sums of the hidden children, whole and fractional sizes", () => {
    fc.assert(
      fc.property(
        arbTreeWithFoci(80),
        fc.integer({ min: 1, max: 40 }),
        fc.boolean(),
        ([base, f], budget, frac) => {
          const tree: Tree = frac
            ? { ...base, ownSize: base.ownSize.map((s, i) => (i % 3 === 0 ? s + 0.1 : s / 7)) }
            : base;
          const m = measure(tree);
          const foci = Int32Array.from([...f].sort((a, b) => a - b));
          const scores = interest(tree, importance(tree, m, "size"), foci);
          let sel: ReturnType<typeof select>;
          try {
            sel = select({ tree, measures: m, scores, order: nodeOrder(tree, m, scores) }, { budget });
          } catch {
            return;
          }
          const view = buildView({ index: new PathIndex(tree, m), scores, foci, selection: sel });
          view.each(({ data }: { data: ViewNode }) => {
            const i = data.index;
            let children = 0;
            let nodes = 0;
            let size = 0;
            for (let c = i + 1, end = i + m.count[i]; c < end; c += m.count[c]) {
              if (sel.shown[c]) continue;
              children++;
              nodes += m.count[c];
              size += m.size[c];
            }
            if (children === 0) expect(data.hidden).toBeNull();
            else expect(data.hidden).toEqual({ children, nodes, size });
          });
        },
      ),
    );
  });

  it("a parent with hundreds of children finds every printed path again, repeated names included", () => {
    // 600 children (past the table threshold), names repeating so ~~N ranks occur, some non-ASCII.
    const names = [
      "root",
      ...Array.from({ length: 600 }, (_, k) => ["ledger", "Ærø", `item-${k % 250}`, "a~b/c"][k % 4]),
    ];
    const tree = buildTree({
      parentOf: Int32Array.from(names.map((_, k) => (k === 0 ? -1 : 0))),
      name: names,
      ownSize: new Float64Array(names.length),
      hasSizes: false,
      ids: null,
      origin: Int32Array.from(names.map((_, k) => k + 1)),
      originIsRow: false,
      fields: new Map(),
      rootName: "(root)",
    });
    const index = new PathIndex(tree, measure(tree));
    const seen = new Set<string>();
    for (let i = 1; i < tree.length; i++) {
      const path = index.path(i);
      expect(seen.has(path)).toBe(false);
      seen.add(path);
      // Read back through a fresh index (its table built by the lookup, not by printing).
      expect(resolvePath(new PathIndex(tree, measure(tree)), path)).toBe(i);
    }
    expect(index.path(2)).toBe("Ærø");
    expect(index.path(6)).toBe("Ærø~~2");
    expect(index.path(4)).toBe("a~0b~1c");
  });
});
