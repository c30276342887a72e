import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { buildTree } from "../../src/model/build-tree.js";
import type { LinkedNodes } from "../../src/model/linked-nodes.js";

/** Nodes of a random tree listed in pre-order, and the same nodes breadth-first. */
const arbOrders = fc
  .tuple(fc.integer({ min: 1, max: 40 }), fc.integer(), fc.boolean())
  .map(([n, seed, several]) => {
    let s = seed >>> 0;
    const next = () => {
      s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
      return s / 2 ** 32;
    };
    // A random tree in pre-order: each node's parent is on the path from the latest top down.
    const parentOf: number[] = [];
    const path: number[] = [];
    for (let i = 0; i < n; i++) {
      const keep = i === 0 ? 0 : Math.floor(next() * (path.length + (several ? 1 : 0)));
      path.length = Math.min(path.length, keep);
      parentOf.push(path.length === 0 ? -1 : path[path.length - 1]);
      path.push(i);
    }
    // Breadth-first: siblings keep their order, but the list is not in pre-order (the general path).
    const depth = parentOf.map(() => 0);
    for (let i = 0; i < n; i++) depth[i] = parentOf[i] === -1 ? 0 : depth[parentOf[i]] + 1;
    const order = parentOf.map((_, i) => i).sort((a, b) => depth[a] - depth[b] || a - b);
    return { parentOf, order };
  });

function linked(parentOf: number[], order: number[]): LinkedNodes {
  const at = new Map(order.map((old, k) => [old, k]));
  return {
    parentOf: Int32Array.from(order, (old) => (parentOf[old] === -1 ? -1 : at.get(parentOf[old])!)),
    name: order.map((old) => `n${old}`),
    ownSize: Float64Array.from(order, (old) => old * 3),
    hasSizes: true,
    ids: order.map((old) => `id${old}`),
    origin: Int32Array.from(order, (old) => old + 1),
    originIsRow: true,
    fields: new Map([["team", order.map((old) => `t${old}`)]]),
    rootName: "(root)",
  };
}

describe("buildTree", () => {
  it("buildTree(nodes in pre-order) gives the tree it gives for the same nodes breadth-first", () => {
    fc.assert(
      fc.property(arbOrders, ({ parentOf, order }) => {
        const ordered = buildTree(
          linked(
            parentOf,
            parentOf.map((_, i) => i),
          ),
        );
        const shuffled = buildTree(linked(parentOf, order));
        expect({ ...ordered, parent: [...ordered.parent], depth: [...ordered.depth] }).toEqual({
          ...shuffled,
          parent: [...shuffled.parent],
          depth: [...shuffled.depth],
        });
      }),
    );
  });
});
