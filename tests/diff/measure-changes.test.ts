import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { changeKinds } from "../../src/diff/changes.js";
import { measureChanges } from "../../src/diff/measure-changes.js";
import { arbTree } from "../helpers/random-tree.js";

const K = changeKinds.length;

/** A random tree with a kind (0: none) and a whole-number size change for each node. */
const arbChanged = arbTree(80).chain((tree) =>
  fc.tuple(
    fc.constant(tree),
    fc.array(fc.oneof(fc.constant(0), fc.integer({ min: 1, max: K })), {
      minLength: tree.length,
      maxLength: tree.length,
    }),
    fc.array(fc.integer({ min: -1000, max: 1000 }), { minLength: tree.length, maxLength: tree.length }),
  ),
);

describe("measureChanges(tree, kind, deltaOf, changed)", () => {
  it("lists every changed node's ancestors in pre-order with their parents' slots, counts and net changes", () => {
    fc.assert(
      fc.property(arbChanged, fc.boolean(), ([tree, kinds, deltas], listed) => {
        const kind = Uint8Array.from(kinds);
        const changed = Int32Array.from(kinds.flatMap((k, i) => (k === 0 ? [] : [i])));
        const cm = measureChanges(tree, kind, (i) => deltas[i], listed ? changed : undefined);
        // Reference: a node is on a change path when its subtree holds a changed node.
        const inside = (x: number, y: number) => {
          for (let a = y; a >= 0; a = tree.parent[a]) if (a === x) return true;
          return false;
        };
        const onPath: number[] = [];
        for (let x = 0; x < tree.length; x++) if (changed.some((c) => inside(x, c))) onPath.push(x);
        expect([...cm.onPath]).toEqual(onPath);
        for (let x = 0; x < tree.length; x++) expect(cm.onChangePath[x]).toBe(onPath.includes(x) ? 1 : 0);
        onPath.forEach((x, s) => {
          expect(cm.up[s], `up of ${x}`).toBe(x === 0 ? -1 : onPath.indexOf(tree.parent[x]));
          const below = [...changed].filter((c) => inside(x, c));
          for (let k = 0; k < K; k++)
            expect(cm.counts[s * K + k]).toBe(below.filter((c) => kinds[c] === k + 1).length);
          // Whole numbers: the sum is exact in any order.
          expect(cm.net[s]).toBe(below.reduce((t, c) => t + deltas[c], 0));
        });
      }),
    );
  });
});
