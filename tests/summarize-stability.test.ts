import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { Tree } from "../src/model/tree.js";
import { renderText } from "../src/render/summary-text.js";
import { prepare, summarize } from "../src/summarize.js";
import { arbTreeWithFoci } from "./helpers/random-tree.js";

function summaryText(tree: Tree, foci: string[], budget: number, units: "bytes" | "plain") {
  const result = summarize(prepare(tree), { foci, budget, importance: "depth" });
  return { result, text: renderText(result.view, { units, sizes: true }) };
}

describe("summarize(prepared, options) across versions", () => {
  it("changes at most (depth of the nearest shown ancestor + 1) lines when one hidden leaf changes size", () => {
    fc.assert(
      fc.property(
        arbTreeWithFoci(60, 2),
        fc.integer({ min: 1, max: 40 }),
        fc.nat(),
        fc.integer({ min: -1000, max: 5000 }).filter((d) => d !== 0),
        fc.constantFrom<"bytes" | "plain">("bytes", "plain"),
        ([tree, focusNodes], b, pick, change, units) => {
          const { index } = prepare(tree);
          const foci = focusNodes.map((f) => index.path(f));
          const forced = new Set<number>([0]);
          for (const f of focusNodes) for (let a = f; a >= 0; a = tree.parent[a]) forced.add(a);
          const budget = Math.max(b, forced.size);
          const before = summaryText(tree, foci, budget, units);
          const { shown } = before.result.selection;
          const hiddenLeaves = [...Array(tree.length).keys()].filter(
            (i) => !shown[i] && (i + 1 >= tree.length || tree.parent[i + 1] !== i),
          );
          if (hiddenLeaves.length === 0) return;
          const leaf = hiddenLeaves[pick % hiddenLeaves.length];
          const ownSize = Float64Array.from(tree.ownSize);
          ownSize[leaf] = Math.max(0, ownSize[leaf] + change);
          const after = summaryText({ ...tree, ownSize }, foci, budget, units);
          let anchor = tree.parent[leaf];
          while (!shown[anchor]) anchor = tree.parent[anchor];
          const a = before.text.split("\n");
          const c = after.text.split("\n");
          expect(c.length).toBe(a.length);
          const changed = a.filter((line, i) => line !== c[i]).length;
          expect(changed).toBeLessThanOrEqual(tree.depth[anchor] + 1);
        },
      ),
    );
  });
});
