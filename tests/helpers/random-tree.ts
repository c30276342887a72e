import fc from "fast-check";
import { buildTree } from "../../src/model/build-tree.js";
import type { Tree } from "../../src/model/tree.js";

/** Names the random trees draw from, repeating on purpose; an escape (`~`, `/`) and a space among them. */
const NAMES = ["a", "b", "c", "d~", "e/f", "", "g h"] as const;

/**
 * Random trees: each node after the first picks an earlier node as parent; names repeat on purpose,
 * drawn from `names`.
 */
export const arbTree = (maxNodes = 60, names: readonly string[] = NAMES): fc.Arbitrary<Tree> =>
  fc
    .integer({ min: 1, max: maxNodes })
    .chain((n) =>
      fc.tuple(
        fc.array(fc.nat(), { minLength: n - 1, maxLength: n - 1 }),
        fc.array(fc.constantFrom(...names), { minLength: n, maxLength: n }),
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
export const arbTreeWithFoci = (maxNodes = 60, k = 3, names: readonly string[] = NAMES) =>
  arbTree(maxNodes, names).chain((tree) =>
    fc.tuple(
      fc.constant(tree),
      fc.uniqueArray(fc.integer({ min: 0, max: tree.length - 1 }), { maxLength: k }),
    ),
  );
