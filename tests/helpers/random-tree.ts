import fc from "fast-check";
import { buildTree } from "../../src/model/build-tree.js";
import type { Tree } from "../../src/model/tree.js";

/** Random trees: each node after the first picks an earlier node as parent; names repeat on purpose. */
export const arbTree = (maxNodes = 60): fc.Arbitrary<Tree> =>
  fc
    .integer({ min: 1, max: maxNodes })
    .chain((n) =>
      fc.tuple(
        fc.array(fc.nat(), { minLength: n - 1, maxLength: n - 1 }),
        fc.array(fc.constantFrom("a", "b", "c", "d~", "e/f", "", "g h"), { minLength: n, maxLength: n }),
        fc.array(fc.integer({ min: 0, max: 1000 }), { minLength: n, maxLength: n }),
      ),
    )
    .map(([parents, names, sizes]) => {
      const n = names.length;
      const parentOf = new Int32Array(n);
      parentOf[0] = -1;
      for (let i = 1; i < n; i++) parentOf[i] = parents[i - 1] % i;
      return buildTree({
        parentOf,
        name: names,
        ownSize: Float64Array.from(sizes),
        hasSizes: true,
        ids: null,
        origin: Int32Array.from(names.map((_, k) => k + 1)),
        originIsRow: false,
        fields: new Map(),
        rootName: "(root)",
      });
    });

/** A tree with up to `k` foci chosen among its nodes. */
export const arbTreeWithFoci = (maxNodes = 60, k = 3) =>
  arbTree(maxNodes).chain((tree) =>
    fc.tuple(
      fc.constant(tree),
      fc.uniqueArray(fc.integer({ min: 0, max: tree.length - 1 }), { maxLength: k }),
    ),
  );
