import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { interest } from "../../src/interest/doi.js";
import { importance } from "../../src/interest/importance.js";
import { measure } from "../../src/model/measure.js";
import type { Tree } from "../../src/model/tree.js";
import { arbTreeWithFoci } from "../helpers/random-tree.js";

/** Edges between x and y, through their lowest common ancestor. */
function distance(tree: Tree, x: number, y: number): number {
  const above = new Set<number>();
  for (let a = x; a !== -1; a = tree.parent[a]) above.add(a);
  let lca = y;
  while (!above.has(lca)) lca = tree.parent[lca];
  return tree.depth[x] + tree.depth[y] - 2 * tree.depth[lca];
}

describe("interest", () => {
  it("interest(tree, api, foci, scratch) equals max over foci of API(x) - D(x,y) - API(y), computed directly", () => {
    // Furnas (1986) DOI with the per-focus shift of the design brief, node by node and focus by focus.
    const scratch = new Float64Array(200).fill(12345);
    fc.assert(
      fc.property(arbTreeWithFoci(60, 4), fc.constantFrom("depth", "size" as const), ([tree, list], kind) => {
        const api = importance(tree, measure(tree), kind);
        const foci = Int32Array.from([...new Set(list)].sort((a, b) => a - b));
        for (const s of [interest(tree, api, foci), interest(tree, api, foci, scratch)]) {
          for (let x = 0; x < tree.length; x++) {
            const value =
              foci.length === 0
                ? api[x] - api[0]
                : Math.max(...[...foci].map((y) => api[x] - distance(tree, x, y) - api[y]));
            expect(s.value[x]).toBeCloseTo(value, 9);
            const near =
              foci.length === 0 ? 0x7fffffff : Math.min(...[...foci].map((y) => distance(tree, x, y)));
            expect(s.distance[x]).toBe(near);
            let forced = x === 0;
            for (const y of foci) for (let a = y; a !== -1; a = tree.parent[a]) if (a === x) forced = true;
            expect(s.forced[x]).toBe(forced ? 1 : 0);
          }
        }
      }),
      { numRuns: 300 },
    );
  });
});
