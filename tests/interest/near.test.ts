import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { select } from "../../src/fit/select.js";
import { interest } from "../../src/interest/doi.js";
import { importance } from "../../src/interest/importance.js";
import { interestNear } from "../../src/interest/near.js";
import { nodeOrder } from "../../src/interest/order.js";
import { measure } from "../../src/model/measure.js";
import { makeTree, nodeNamed } from "../helpers/make-tree.js";
import { arbTreeWithFoci } from "../helpers/random-tree.js";

// interestNear scores on demand what interest (doi.ts) scores for the whole tree: the two must agree
// to the last bit, whatever order nodes are asked in, and give the fit the same selection.

describe("interestNear(tree, api, foci)", () => {
  it("gives the check values of the design brief for focus A1", () => {
    // Check values derived from Furnas (1986), DOI(x|y) = API(x) - D(x,y) with API = -depth, shifted by -API(y).
    const tree = makeTree("R{A{A1{A1a,A1b},A2{A2a}},B{B1{B1a},B2}}");
    const s = interestNear(
      tree,
      importance(tree, measure(tree), "depth"),
      Int32Array.of(nodeNamed(tree, "A1")),
    );
    const at = (n: string) => s.interestOf(nodeNamed(tree, n));
    for (const n of ["R", "A", "A1"]) expect(at(n)).toBe(0);
    for (const n of ["A1a", "A1b", "A2", "B"]) expect(at(n)).toBe(-2);
    for (const n of ["A2a", "B1", "B2"]) expect(at(n)).toBe(-4);
    expect(at("B1a")).toBe(-6);
  });

  it("equals interest's value, distance and forced flags for every node, asked in any order", () => {
    fc.assert(
      fc.property(
        arbTreeWithFoci(80, 5),
        fc.constantFrom("depth", "size" as const),
        fc.infiniteStream(fc.nat()),
        ([tree, list], kind, picks) => {
          const api = importance(tree, measure(tree), kind);
          const foci = Int32Array.from([...new Set(list)].sort((a, b) => a - b));
          const whole = interest(tree, api, foci);
          const near = interestNear(tree, api, foci);
          expect([...near.forcedNodes]).toEqual([...whole.forcedNodes]);
          // A random order of questions (children before parents too), then every node.
          const asked = [...picks.take(tree.length)].map((p) => p % tree.length);
          for (const x of [...asked, ...Array(tree.length).keys()]) {
            expect(Object.is(near.interestOf(x), whole.value[x])).toBe(true);
            expect(near.distanceOf(x)).toBe(whole.distance[x]);
            expect(near.isForced(x)).toBe(whole.forced[x] === 1);
          }
        },
      ),
      { numRuns: 300 },
    );
  });

  it("gives select the selection interest gives it", () => {
    fc.assert(
      fc.property(
        arbTreeWithFoci(80, 3),
        fc.integer({ min: 1, max: 60 }),
        fc.boolean(),
        fc.constantFrom("depth", "size" as const),
        ([tree, list], budget, chains, kind) => {
          const m = measure(tree);
          const api = importance(tree, m, kind);
          const foci = Int32Array.from([...new Set(list)].sort((a, b) => a - b));
          const run = (scores: ReturnType<typeof interestNear>) => {
            try {
              return select(
                { tree, measures: m, scores, order: nodeOrder(tree, m, scores) },
                { budget, chains },
              );
            } catch (error) {
              return (error as Error).message;
            }
          };
          expect(run(interestNear(tree, api, foci))).toEqual(run(interest(tree, api, foci)));
        },
      ),
    );
  });
});
