import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { diffInterest } from "../../src/diff/diff-interest.js";
import { prepareDiff } from "../../src/diff/diff-trees.js";
import { interest } from "../../src/interest/doi.js";
import { importance } from "../../src/interest/importance.js";
import { measure } from "../../src/model/measure.js";
import { arbEdited, withoutIds } from "./edit-script.js";

// A diff scores every changed node as a focus (Furnas 1986, DOI(x|y) = API(x) − D(x, y), shifted by
// −API(y); docs/interest.md), the user's foci too. diffInterest works it out from the change paths'
// list; the whole-tree interest of doi.ts, given the changed nodes and the user's foci as foci, is the
// reference: every node's value and distance must agree to the last bit.

describe("diffInterest(tree, api, foci, kind, changes)", () => {
  it("equals the whole-tree interest with the changed nodes and the user's foci as foci, for every node", () => {
    fc.assert(
      fc.property(
        arbEdited(),
        fc.boolean(),
        fc.constantFrom("depth", "size" as const),
        fc.array(fc.nat(), { maxLength: 3 }),
        fc.boolean(),
        (edited, byId, kind, picks, same) => {
          const [oldTree, newTree] = byId ? [edited.oldTree, edited.newTree] : withoutIds(edited);
          const prepared = prepareDiff(same ? newTree : oldTree, newTree);
          const { tree, kind: kinds } = prepared.combined;
          const user = Int32Array.from(new Set(picks.map((p) => p % tree.length))).sort();
          const scores = diffInterest(
            tree,
            prepared.importanceOf(kind),
            user,
            kinds,
            prepared.changeMeasures,
          );
          const all = new Set<number>(user);
          for (let x = 0; x < tree.length; x++) if (kinds[x] !== 0) all.add(x);
          const api = importance(tree, measure(tree), kind);
          const whole = interest(tree, api, Int32Array.from(all).sort());
          // Asked in reverse order (the nearest listed ancestor found for each, then remembered).
          for (let x = tree.length - 1; x >= 0; x--) {
            expect(scores.interestOf(x), `interest of ${x}`).toBe(whole.interestOf(x));
            expect(scores.distanceOf(x), `distance of ${x}`).toBe(whole.distanceOf(x));
          }
          // Forced: the root and the user's focus paths only.
          for (let x = 0; x < tree.length; x++) {
            let forced = x === 0;
            for (const f of user) for (let a = f; a >= 0; a = tree.parent[a]) if (a === x) forced = true;
            expect(scores.isForced(x), `forced ${x}`).toBe(forced);
          }
        },
      ),
    );
  });
});
