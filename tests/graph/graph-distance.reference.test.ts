import fc from "fast-check";
import { UndirectedGraph } from "graphology";
import { singleSourceLength } from "graphology-shortest-path/unweighted.js";
import { describe, expect, it } from "vitest";
import { graphInterest } from "../../src/interest/graph-doi.js";
import { type Importance, importance } from "../../src/interest/importance.js";
import { loadTree } from "../../src/load/index.js";
import { measure } from "../../src/model/measure.js";
import { referencesTo } from "../../src/model/reference-index.js";
import type { Tree } from "../../src/model/tree.js";
import { opts } from "../load/helpers.js";

// The graph distance of graph interest checked against a general graph library from the registry:
// graphology 0.26 with graphology-shortest-path 2.1 (`singleSourceLength`, unweighted, on an undirected
// graph: the number of edges of a shortest path, every edge taken both ways). The formula checked is
// Furnas's DOI(x | y) = API(x) - D(x, y) (Furnas, CHI '86, "General fisheye views": D any distance), with
// several foci interest(x) = API(x) - min over foci y of [D(x, y) + API(y)] (docs/selection.md).

/** Random edge lists with shared children, cycles, self-loops and repeated edges (ids n0..n(k-1)). */
const arbEdges = fc
  .integer({ min: 2, max: 20 })
  .chain((n) =>
    fc.tuple(
      fc.constant(n),
      fc.array(fc.tuple(fc.nat({ max: n - 1 }), fc.nat({ max: n - 1 })), { minLength: 1, maxLength: 3 * n }),
    ),
  )
  .map(([, edges]) => ({ text: `${edges.map(([a, b]) => `n${a} n${b}`).join("\n")}\n`, edges }));

/**
 * The reference graph: the input's edges, plus one edge from the root espalier adds (when it adds one)
 * to each top-level node (docs/input.md: several top-level nodes are joined under one root).
 */
function referenceGraph(tree: Tree, edges: [number, number][]): UndirectedGraph {
  const g = new UndirectedGraph();
  const ROOT = "(root)";
  for (const [a, b] of edges) {
    g.mergeNode(`n${a}`);
    g.mergeNode(`n${b}`);
    if (a !== b) g.mergeEdge(`n${a}`, `n${b}`);
  }
  if (tree.syntheticRoot) {
    g.mergeNode(ROOT);
    // Top-level nodes: the full entries right under the added root (a reference is never placed there).
    for (let s = 1; s < tree.length; s++)
      if (tree.parent[s] === 0 && tree.referenceTo?.[s] === -1) g.mergeEdge(ROOT, tree.ids!.get(s));
  }
  return g;
}

describe("graph interest against graphology's shortest paths", () => {
  it("scores every slot by API minus the offset graph distance to the nearest focus; forced slots carry the plain distance", () => {
    fc.assert(
      fc.property(
        arbEdges,
        fc.array(fc.nat(), { minLength: 1, maxLength: 3 }),
        fc.constantFrom<Importance>("depth", "size"),
        ({ text, edges }, picks, kind) => {
          const tree = loadTree(text, opts({ format: "edges", rootName: "(root)" }));
          if (tree.referenceTo === undefined) return; // a tree: graph interest is not used
          const to = tree.referenceTo;
          const nodeKey = (s: number) => (tree.syntheticRoot && s === 0 ? "(root)" : tree.ids!.get(s));
          // Full entries by node key.
          const entry = new Map<string, number>();
          for (let s = 0; s < tree.length; s++) if (to[s] === -1) entry.set(nodeKey(s), s);
          const keys = [...entry.keys()].filter((k) => k !== "(root)");
          const foci = Int32Array.from(new Set(picks.map((p) => entry.get(keys[p % keys.length])!))).sort();
          const m = measure(tree);
          const api = importance(tree, m, kind);
          const scores = graphInterest(tree, m, api, foci, referencesTo(tree, foci)!);

          const g = referenceGraph(tree, edges);
          const fromFocus = [...foci].map((y) => ({ y, d: singleSourceLength(g, nodeKey(y)) }));
          const plain = (key: string) => Math.min(...fromFocus.map(({ d }) => d[key]));
          const offset = (key: string) => Math.min(...fromFocus.map(({ y, d }) => d[key] + api[y]));

          // Slots on the way to a focus through one of its references (a reference to a focus and the
          // slots above it): never below 0, so a focus's other parents show (docs/selection.md).
          const onParentPath = new Uint8Array(tree.length);
          for (let s = 0; s < tree.length; s++)
            if (to[s] !== -1 && foci.includes(to[s]))
              for (let a = s; a !== -1; a = tree.parent[a]) onParentPath[a] = 1;

          const got: number[] = [];
          const want: number[] = [];
          for (let s = 0; s < tree.length; s++) {
            const key = nodeKey(to[s] === -1 ? s : to[s]);
            const v = api[s] - offset(key);
            got.push(scores.interestOf(s));
            want.push(onParentPath[s] === 1 && v < 0 ? 0 : v);
            if (scores.isForced(s)) {
              got.push(scores.distanceOf(s));
              want.push(plain(key));
            } else {
              // The tie-break distance is the plain one, raised to one more than its parent's where it
              // would not be (docs/selection.md: a parent comes first among equal interest).
              got.push(scores.distanceOf(s));
              want.push(Math.max(plain(key), scores.distanceOf(tree.parent[s]) + 1));
            }
          }
          // Interest values are sums of the same doubles in both; rounded to 1e-9 for the size kind's logs.
          const r = (x: number) => Math.round(x * 1e9) / 1e9 + 0; // + 0: no -0
          expect(got.map(r)).toEqual(want.map(r));
        },
      ),
      { numRuns: 150 },
    );
  });
});
