import type { HierarchyNode } from "d3-hierarchy";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { prepare, summarize } from "../../src/summarize.js";
import type { ViewNode } from "../../src/view/view-node.js";
import { arbTree } from "../helpers/random-tree.js";

/** Each shown node's children, by index, in the order the view gives them. */
const childOrder = (view: HierarchyNode<ViewNode>) =>
  view.descendants().map((h) => h.data.children.map((c) => c.index));

describe("orderSiblings(root, order, sizes) through summarize({ siblingOrder })", () => {
  it("orders shown siblings biggest first or by name, shows the same nodes as input order, and changes no number (property)", () => {
    fc.assert(
      fc.property(arbTree(40), fc.integer({ min: 1, max: 30 }), (tree, budget) => {
        const prepared = prepare(tree);
        const run = (siblingOrder: "input" | "size" | "name") =>
          summarize(prepared, { foci: [], budget, importance: "depth", siblingOrder }).view;
        const input = run("input");
        // Input order: children in pre-order index order, as the input lists them.
        for (const kids of childOrder(input)) expect(kids).toEqual([...kids].sort((a, b) => a - b));
        const lines = (v: HierarchyNode<ViewNode>) =>
          new Map(v.descendants().map((h) => [h.data.index, [h.data.nodes, h.data.size, h.data.hidden]]));
        for (const order of ["size", "name"] as const) {
          const v = run(order);
          expect(lines(v)).toEqual(lines(input));
          for (const h of v.descendants()) {
            const kids = h.data.children;
            for (let k = 1; k < kids.length; k++) {
              const [a, b] = [kids[k - 1], kids[k]];
              if (order === "size") {
                expect(a.size).toBeGreaterThanOrEqual(b.size);
                if (a.size === b.size && a.nodes === b.nodes) expect(a.index).toBeLessThan(b.index);
              } else {
                // UTF-16 code-unit order of the lower-cased label (ECMAScript string comparison), no locale.
                expect(a.label.toLowerCase() <= b.label.toLowerCase()).toBe(true);
              }
            }
          }
        }
      }),
      { numRuns: 60 },
    );
  });
});
