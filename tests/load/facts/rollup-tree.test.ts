import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { Columns } from "../../../src/load/facts/engine.js";
import { preOrderSql, rollupSql } from "../../../src/load/facts/rollup-sql.js";
import {
  compareCodePoints,
  type RollupTreeOptions,
  rollupTree,
} from "../../../src/load/facts/rollup-tree.js";
import type { Tree } from "../../../src/model/tree.js";
import { keyOptions, levelsOptions, lit, withEngine } from "./helpers.js";

const options: RollupTreeOptions = {
  rootName: "facts",
  keepFields: ["rows"],
  levelNames: [],
  maxNodes: Number.POSITIVE_INFINITY,
  rowsAreInput: true,
};

/** The rollup result of rows given as SQL tuples, run by the engine as rollupSql prints it. */
async function rollupOf(
  tuples: string[],
  columns: string,
  facts: Parameters<typeof rollupSql>[0],
  depth: number,
  order = "",
): Promise<Columns> {
  return withEngine(async (engine) => {
    await engine.run(`CREATE TABLE facts AS SELECT * FROM (VALUES ${tuples.join(", ")}) AS v(${columns})`);
    return engine.run(`SELECT * FROM (${rollupSql(facts, depth, true)}) AS r ${order}`);
  });
}

function permuted(result: Columns, order: readonly number[]): Columns {
  return {
    ...result,
    values: result.values.map((column) => order.map((r) => column[r])),
    rowCount: order.length,
  };
}

/** A tree as comparable plain values: each node's path, own size and rows, in the tree's order. */
function shapeOf(tree: Tree): string[] {
  const paths: string[] = [];
  for (let i = 0; i < tree.length; i++) {
    paths.push(i === 0 ? "" : `${paths[tree.parent[i]]}/${tree.name.get(i)}`);
  }
  const rows = tree.fields.get("rows") ?? [];
  return paths.map((p, i) => `${JSON.stringify(p)} ${tree.depth[i]} ${tree.ownSize[i]} ${rows[i]}`);
}

const name = fc.oneof(
  fc.constantFrom("a", "b", "", "ab", "é", "\u{1F30A}", "\uFFFD", "Z", "a b"),
  fc.string({ maxLength: 3 }),
);

describe("rollupTree(result)", () => {
  it("builds the same tree from the rows in pre-order as in any other order (property)", async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.array(fc.tuple(fc.array(name, { minLength: 1, maxLength: 4 }), fc.nat(1000)), {
          minLength: 1,
          maxLength: 30,
        }),
        fc.integer(),
        async (keys, seed) => {
          const tuples = keys.map(([parts, size]) => `(${lit(parts.join("/"))}, ${size})`);
          const depth = Math.max(...keys.map(([parts]) => parts.length));
          const facts = keyOptions("key", "size");
          const inOrder = await rollupOf(tuples, "key, size", facts, depth, preOrderSql(depth));
          // A shuffle of the rows (seeded), as a result table written by another engine may come.
          const order = Array.from({ length: inOrder.rowCount }, (_, r) => r);
          let state = seed | 0;
          for (let i = order.length - 1; i > 0; i--) {
            state = (Math.imul(state, 1103515245) + 12345) | 0;
            const j = (state >>> 8) % (i + 1);
            [order[i], order[j]] = [order[j], order[i]];
          }
          const sorted = rollupTree(inOrder, options);
          const shuffled = rollupTree(permuted(inOrder, order), options);
          expect(shapeOf(shuffled)).toEqual(shapeOf(sorted));
          // Each node's rows: its own keys' rows plus its children's (an independent count of the keys).
          const rows = sorted.fields.get("rows") ?? [];
          expect(Number(rows[0])).toBe(keys.length);
        },
      ),
      { numRuns: 30 },
    );
  });

  it("names a duplicate row and a row without its parent, in either order", async () => {
    const facts = levelsOptions(["account", "service"], "cost");
    const result = await rollupOf(
      ["('qf-build', 'cache', 3)", "('qf-build', 'runners', 4)", "('qf-edge', 'cache', 5)"],
      "account, service, cost",
      facts,
      2,
      preOrderSql(2),
    );
    const opts = { ...options, levelNames: ["account", "service"] };
    const n = result.rowCount;
    const twice = permuted(result, [...Array.from({ length: n }, (_, r) => r), 2]);
    expect(() => rollupTree(twice, opts)).toThrow(/has two rows \(3 and 7\)/);
    const reversed = permuted(result, [2, ...Array.from({ length: n }, (_, r) => n - 1 - r)]);
    expect(() => rollupTree(reversed, opts)).toThrow(expect.objectContaining({ code: "DUPLICATE_PATH" }));
    // Without the row of qf-edge (pre-order: total, qf-build, its 2 services, qf-edge, its service).
    const orphan = permuted(result, [0, 1, 2, 3, 5]);
    expect(() => rollupTree(orphan, opts)).toThrow(/has no row for its parent/);
    expect(() => rollupTree(permuted(result, [5, 3, 2, 1, 0]), opts)).toThrow(/has no row for its parent/);
  });
  it("gets the rows from the engine already in pre-order, names in code-point order (property)", async () => {
    // RFC 3629, section 1: sorting UTF-8 strings by their bytes orders them as their code points; the
    // engine compares text by its bytes, so ORDER BY with preOrderSql is the order rollupTree builds in.
    await fc.assert(
      fc.asyncProperty(
        fc.array(fc.tuple(name, name, fc.nat(100)), { minLength: 1, maxLength: 25 }),
        async (rows) => {
          const facts = levelsOptions(["a", "b"], "s");
          const tuples = rows.map(([a, b, size]) => `(${lit(a)}, ${lit(b)}, ${size})`);
          const result = await rollupOf(tuples, "a, b, s", facts, 2, preOrderSql(2));
          const [depth, a, b] = [0, 1, 2].map((c) => result.values[c]);
          const key = (r: number) => [a[r], b[r]].slice(0, Number(depth[r])) as string[];
          for (let r = 1; r < result.rowCount; r++) {
            const [x, y] = [key(r - 1), key(r)];
            let c = 0;
            for (let k = 0; k < Math.min(x.length, y.length) && c === 0; k++)
              c = compareCodePoints(x[k], y[k]);
            expect(c < 0 || (c === 0 && x.length < y.length)).toBe(true);
          }
        },
      ),
      { numRuns: 20 },
    );
  });
});
