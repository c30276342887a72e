import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { interest } from "../../src/interest/doi.js";
import { importance, importanceOf } from "../../src/interest/importance.js";
import { interestNear } from "../../src/interest/near.js";
import { measure } from "../../src/model/measure.js";
import { arbTreeWithFoci } from "../helpers/random-tree.js";

// importanceOf works out API(x) when asked (a diff's interest reads it for the few nodes it scores);
// it must give the very doubles importance()'s array holds, so interestNear given either scores alike.
// API by depth and by size as defined in src/interest/importance.ts (Furnas 1986: API(x) = -depth(x)).

describe("importanceOf(tree, measures, kind)", () => {
  it("gives importance()'s value for every node, to the last bit", () => {
    fc.assert(
      fc.property(arbTreeWithFoci(80, 3), fc.constantFrom("depth", "size" as const), ([tree], kind) => {
        const measures = measure(tree);
        const array = importance(tree, measures, kind);
        const of = importanceOf(tree, measures, kind);
        for (let x = 0; x < tree.length; x++) expect(Object.is(of(x), array[x]), `node ${x}`).toBe(true);
      }),
    );
  });

  it("scores through interestNear as the array does, and as the whole-tree interest does", () => {
    fc.assert(
      fc.property(arbTreeWithFoci(80, 5), fc.constantFrom("depth", "size" as const), ([tree, list], kind) => {
        const measures = measure(tree);
        const array = importance(tree, measures, kind);
        const foci = Int32Array.from([...new Set(list)].sort((a, b) => a - b));
        const byFunction = interestNear(tree, importanceOf(tree, measures, kind), foci);
        const whole = interest(tree, array, foci);
        for (let x = 0; x < tree.length; x++) {
          expect(byFunction.interestOf(x)).toBe(whole.interestOf(x));
          expect(byFunction.distanceOf(x)).toBe(whole.distanceOf(x));
          expect(byFunction.isForced(x)).toBe(whole.isForced(x));
        }
      }),
    );
  });
});
