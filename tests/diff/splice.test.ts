import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { combineListing } from "../../src/diff/combine.js";
import { matchTrees } from "../../src/diff/match.js";
import { subtreeCounts } from "../../src/diff/subtree-counts.js";
import { buildTree } from "../../src/model/build-tree.js";
import { namesToArray } from "../../src/model/names.js";
import type { Tree } from "../../src/model/tree.js";
import { arbEdited, withoutIds } from "./edit-script.js";

/** The same tree with each node's children in the order `keys` gives them (a rebuilt pre-order). */
function reordered(tree: Tree, keys: number[]): Tree {
  const n = tree.length;
  // Rows in an order where each parent still comes first (by depth), siblings by key.
  const rows = [...Array(n).keys()].sort(
    (a, b) => tree.depth[a] - tree.depth[b] || keys[a % keys.length] - keys[b % keys.length] || a - b,
  );
  const at = new Map(rows.map((i, r) => [i, r]));
  const ids = tree.ids === null ? null : namesToArray(tree.ids);
  const names = namesToArray(tree.name);
  return buildTree({
    parentOf: Int32Array.from(rows.map((i) => (i === 0 ? -1 : at.get(tree.parent[i])!))),
    name: rows.map((i) => names[i]),
    ownSize: Float64Array.from(rows.map((i) => tree.ownSize[i])),
    hasSizes: true,
    ids: ids === null ? null : rows.map((i) => ids[i]),
    origin: Int32Array.from(rows.map((_, r) => r + 1)),
    originIsRow: true,
    fields: new Map([...tree.fields].map(([key, values]) => [key, rows.map((i) => values[i])])),
    rootName: names[0],
  });
}

/**
 * The combined tree's child lists as `combine` states them, built node by node: a new node's new
 * children in order, each removed old child right after the nearest earlier old sibling whose
 * counterpart is a child of the node (first when there is none), in old order; a removed node's
 * removed old children in old order. Nodes as "n<new index>" and "o<old index>".
 */
function expectedChildren(oldTree: Tree, newTree: Tree, oldToNew: Int32Array, newToOld: Int32Array) {
  const kids = (tree: Tree, i: number) => [...Array(tree.length).keys()].filter((c) => tree.parent[c] === i);
  const out = new Map<string, string[]>();
  for (let n = 0; n < newTree.length; n++) {
    const o = newToOld[n];
    const order: string[] = [];
    const after = new Map<number, string[]>();
    let anchor = -1;
    if (o >= 0)
      for (const s of kids(oldTree, o)) {
        const m = oldToNew[s];
        if (m >= 0 && newTree.parent[m] === n) anchor = m;
        else if (m < 0) after.set(anchor, [...(after.get(anchor) ?? []), `o${s}`]);
      }
    order.push(...(after.get(-1) ?? []));
    for (const c of kids(newTree, n)) order.push(`n${c}`, ...(after.get(c) ?? []));
    out.set(`n${n}`, order);
  }
  for (let o = 0; o < oldTree.length; o++)
    if (oldToNew[o] < 0)
      out.set(
        `o${o}`,
        kids(oldTree, o)
          .filter((c) => oldToNew[c] < 0)
          .map((c) => `o${c}`),
      );
  return out;
}

describe("combineListing(old, oldCount, new, newCount, matching)", () => {
  it("places each removed node after its nearest earlier old sibling still under the same parent, whatever the new sibling order", () => {
    fc.assert(
      fc.property(
        arbEdited(40, 10),
        fc.boolean(),
        fc.array(fc.nat(), { minLength: 1, maxLength: 40 }),
        (edited, byId, keys) => {
          const [oldTree, plainNew] = byId ? [edited.oldTree, edited.newTree] : withoutIds(edited);
          const newTree = reordered(plainNew, keys);
          const oldCount = subtreeCounts(oldTree);
          const newCount = subtreeCounts(newTree);
          const matching = matchTrees(oldTree, oldCount, newTree, newCount);
          const { combined, changed } = combineListing(oldTree, oldCount, newTree, newCount, matching);
          const { tree, newIndex, oldIndex, kind } = combined;
          const key = (k: number) => (newIndex[k] >= 0 ? `n${newIndex[k]}` : `o${oldIndex[k]}`);
          const actual = new Map<string, string[]>([...Array(tree.length).keys()].map((k) => [key(k), []]));
          for (let k = 1; k < tree.length; k++) {
            expect(tree.parent[k]).toBeLessThan(k);
            expect(tree.depth[k]).toBe(tree.depth[tree.parent[k]] + 1);
            actual.get(key(tree.parent[k]))!.push(key(k));
          }
          expect(actual).toEqual(expectedChildren(oldTree, newTree, matching.oldToNew, matching.newToOld));
          // Pre-order: each node's parent is the node before it or one of that node's ancestors.
          const path = [0];
          for (let k = 1; k < tree.length; k++) {
            while (path.length > 0 && path[path.length - 1] !== tree.parent[k]) path.pop();
            expect(path.length).toBeGreaterThan(0);
            path.push(k);
          }
          // The changed list is every node with a kind, in order.
          expect([...changed]).toEqual([...kind.keys()].filter((k) => kind[k] !== 0));
        },
      ),
    );
  });
});
