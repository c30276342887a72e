import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { buildTree } from "../../src/model/build-tree.js";
import type { LinkedNodes } from "../../src/model/linked-nodes.js";
import { NamePool, type Names } from "../../src/model/names.js";
import type { Tree } from "../../src/model/tree.js";

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

/**
 * The same nodes as {@link linked}, as a table's loader gives them: rows numbered 1, 2, 3, ... in the
 * order listed (origin), ids in a name pool, and with `spread`, every array a view into a larger buffer
 * (at an offset, garbage around it), as a loader's arrays cut from a grown one are.
 */
function tableRows(
  parentOf: number[],
  order: number[],
  spread: boolean,
  around: (Int32Array | Float64Array)[] = [],
): LinkedNodes {
  const base = linked(parentOf, order);
  const n = order.length;
  const view = <T extends Int32Array | Float64Array>(make: (length: number) => T, values: T): T => {
    if (!spread) return values;
    const big = make(n + 7).fill(AROUND);
    big.set(values, 3);
    around.push(big.subarray(0, 3), big.subarray(3 + n));
    return big.subarray(3, 3 + n) as T;
  };
  return {
    ...base,
    parentOf: view((k) => new Int32Array(k), base.parentOf),
    ownSize: view((k) => new Float64Array(k), base.ownSize),
    origin: view(
      (k) => new Int32Array(k),
      Int32Array.from(order, (_, k) => k + 1),
    ),
    ids: NamePool.from(base.ids as string[]),
  };
}

/** What lies around the arrays of {@link tableRows} (memory that is not the nodes'). */
const AROUND = -123456;

/** What a tree says of each node, by slot, as plain values. */
function plainTree(tree: Tree) {
  const at = (names: Names | null) => (names === null ? null : [...tree.parent].map((_, k) => names.get(k)));
  return {
    length: tree.length,
    parent: [...tree.parent],
    depth: [...tree.depth],
    ownSize: [...tree.ownSize],
    origin: [...tree.origin],
    name: at(tree.name),
    ids: at(tree.ids),
    fields: [...tree.fields].map(([key, values]) => [key, [...values]]),
    syntheticRoot: tree.syntheticRoot,
  };
}

describe("buildTree", () => {
  // Common practice, no source: the pre-order of a forest is unique once children keep their input
  // order, so listing the nodes in another order (here breadth-first) must give the same tree.
  it("rows numbered in input order, out of pre-order, give the tree their pre-order listing gives", () => {
    fc.assert(
      fc.property(arbOrders, fc.boolean(), ({ parentOf, order }, spread) => {
        const identity = parentOf.map((_, i) => i);
        // The pre-order listing with each node's row number in the breadth-first listing.
        const rowOf = new Map(order.map((old, k) => [old, k + 1]));
        const ordered = buildTree({
          ...linked(parentOf, identity),
          origin: Int32Array.from(identity, (old) => rowOf.get(old)!),
          ids: NamePool.from(parentOf.map((_, old) => `id${old}`)),
        });
        const around: (Int32Array | Float64Array)[] = [];
        const shuffled = buildTree(tableRows(parentOf, order, spread, around));
        expect(plainTree(shuffled)).toEqual(plainTree(ordered));
        // The memory around the nodes' arrays is left as it was.
        for (const part of around) expect([...part].every((v) => v === AROUND)).toBe(true);
      }),
    );
  });

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
