import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { interest } from "../../src/interest/doi.js";
import { graphInterest } from "../../src/interest/graph-doi.js";
import { type Importance, importance } from "../../src/interest/importance.js";
import { loadTree } from "../../src/load/index.js";
import { csvTableFromBytes } from "../../src/load/table/csv-table.js";
import { graphNeighbours, neighboursFromSlots } from "../../src/model/graph-neighbours.js";
import { measure } from "../../src/model/measure.js";
import { referencesTo } from "../../src/model/reference-index.js";
import type { Tree } from "../../src/model/tree.js";
import { renderJson } from "../../src/render/summary-json.js";
import type { SummaryNode } from "../../src/render/summary-schema.js";
import { renderText } from "../../src/render/summary-text.js";
import { prepare, summarize } from "../../src/summarize.js";
import { opts } from "../load/helpers.js";

/** A random graph as an edge list: shared children, cycles, self-loops, repeated edges, lone nodes. */
const arbGraph = fc
  .integer({ min: 1, max: 24 })
  .chain((n) =>
    fc.tuple(
      fc.constant(n),
      fc.array(fc.tuple(fc.nat({ max: n - 1 }), fc.nat({ max: n - 1 })), { maxLength: 3 * n }),
      fc.array(fc.nat({ max: n - 1 }), { maxLength: 3 }),
    ),
  )
  .map(([n, edges, lone]) => {
    const lines = edges.map(([a, b]) => `n${a} n${b}`);
    for (const l of lone) lines.splice(l % (lines.length + 1), 0, `n${l}`);
    if (lines.length === 0) lines.push("n0");
    const ids = new Set(lines.flatMap((line) => line.split(" ")));
    const distinctEdges = new Set(edges.map(([a, b]) => `${a} ${b}`));
    return { text: `${lines.join("\n")}\n`, ids, edges: distinctEdges.size, n };
  });

/** The same graphs with a size per node (edge-list node records laid over as a CSV). */
const arbSizedGraph = arbGraph.chain((g) =>
  fc
    .array(fc.integer({ min: 0, max: 5000 }), { minLength: g.n, maxLength: g.n })
    .map((sizes) => ({ ...g, sizes })),
);
const kinds = fc.constantFrom<Importance>("depth", "size");

const load = (text: string, sizes?: number[]) =>
  loadTree(
    text,
    opts({
      format: "edges",
      rootName: "g",
      nodeRecords:
        sizes &&
        csvTableFromBytes(
          Buffer.from(`id,size\n${sizes.map((z, k) => `n${k},${z}`).join("\n")}\n`),
          ",",
          opts({ maxNodes: 1e9 }),
        ),
    }),
  );

function summary(
  tree: Tree,
  foci: string[],
  budget: number,
  chains: boolean,
  importance: Importance = "depth",
) {
  const result = summarize(prepare(tree), { foci, budget, importance, chains });
  const text = renderText(result.view, { units: "plain", sizes: tree.hasSizes, chains });
  const json = renderJson(result.view, {
    budget,
    lines: result.selection.lines,
    foci: result.fociPaths,
    labels: false,
  });
  return { result, text, json };
}

/** Visits every node of the summary JSON. */
function each(node: SummaryNode, visit: (n: SummaryNode) => void) {
  visit(node);
  for (const c of node.children) each(c, visit);
}

describe("graphs: property tests on random graphs (cycles, shared nodes, self-loops)", () => {
  it("counts each node once: one full entry per id, every other distinct edge one reference", () => {
    fc.assert(
      fc.property(arbGraph, ({ text, ids, edges }) => {
        const tree = load(text);
        const m = measure(tree);
        const synthetic = tree.syntheticRoot ? 1 : 0;
        expect(m.nodes[0]).toBe(ids.size + synthetic);
        const entries = new Set<string>();
        let references = 0;
        for (let i = synthetic; i < tree.length; i++) {
          if ((tree.referenceTo?.[i] ?? -1) === -1) {
            expect(entries.has(tree.name.get(i))).toBe(false);
            entries.add(tree.name.get(i));
          } else references++;
        }
        expect(entries).toEqual(ids);
        // Each distinct edge is either the edge of some node's full entry or one reference.
        const entryEdges = tree.length - synthetic - references - (tree.syntheticRoot ? countTop(tree) : 1);
        expect(entryEdges + references).toBe(edges);
      }),
    );
  });

  it("keeps the arithmetic at every line: nodes = 1 + shown children + folded, references 0; the budget holds", () => {
    fc.assert(
      fc.property(
        arbGraph,
        fc.integer({ min: 1, max: 30 }),
        fc.array(fc.nat(), { maxLength: 3 }),
        fc.boolean(),
        ({ text, ids }, budget, picks, chains) => {
          const tree = load(text);
          const idList = [...ids];
          const foci = picks.map((k) => idList[k % idList.length]);
          let out: ReturnType<typeof summary>;
          try {
            out = summary(tree, foci, budget, chains);
          } catch (error) {
            expect((error as { code?: string }).code).toBe("BUDGET_TOO_SMALL");
            return;
          }
          const { text: shown, json } = out;
          expect(shown.trimEnd().split("\n").length).toBeLessThanOrEqual(budget);
          const root = JSON.parse(json).root as SummaryNode;
          let entriesShown = 0;
          let folded = 0;
          each(root, (node) => {
            if (node.reference) {
              expect(node.nodes).toBe(0);
              expect(node.size).toBe(0);
              expect(node.children).toEqual([]);
              return;
            }
            entriesShown++;
            folded += node.hidden?.nodes ?? 0;
            const sum = node.children.reduce((s, c) => s + c.nodes, 0);
            expect(node.nodes).toBe(1 + sum + (node.hidden?.nodes ?? 0));
          });
          // Every distinct node is shown once or folded once.
          expect(entriesShown + folded).toBe(ids.size + (tree.syntheticRoot ? 1 : 0));
          expect(root.nodes).toBe(ids.size + (tree.syntheticRoot ? 1 : 0));
        },
      ),
    );
  });

  it("shows every parent of a focus within the budget, nearest a root first, and counts those that did not fit", () => {
    fc.assert(
      fc.property(
        arbSizedGraph,
        fc.integer({ min: 1, max: 30 }),
        fc.nat(),
        kinds,
        ({ text, ids, sizes }, budget, pick, kind) => {
          const tree = load(text, sizes);
          const focus = [...ids][pick % ids.size];
          let out: ReturnType<typeof summary>;
          try {
            out = summary(tree, [focus], budget, false, kind);
          } catch {
            return;
          }
          const prepared = prepare(tree);
          const y = out.result.foci[0];
          // The references to the focus, found here by a plain scan of every slot.
          const toFocus = [...tree.parent.keys()].filter((s) => (tree.referenceTo?.[s] ?? -1) === y);
          const shown = out.result.selection.shown;
          const hiddenParents = toFocus.filter((s) => shown[s] === 0).length;
          const root = JSON.parse(out.json).root as SummaryNode;
          let focusNode: SummaryNode | undefined;
          each(root, (node) => {
            if (node.focus) focusNode = node;
          });
          const homeParent = tree.parent[y] >= 0 && !(tree.syntheticRoot && tree.parent[y] === 0) ? 1 : 0;
          const count = homeParent + toFocus.length;
          if (count >= 2) expect(focusNode?.parents).toEqual({ count, hidden: hiddenParents });
          else expect(focusNode?.parents).toBeUndefined();
          // Each reference to the focus and the path above it scores at least 0, like the focus's own path.
          for (const r of toFocus)
            for (let a = r; a !== -1; a = tree.parent[a])
              expect(out.result.scores.interestOf(a)).toBeGreaterThanOrEqual(0);
          // Nearest first: a shown reference to the focus is never nearer a root than a hidden one.
          const depth = (s: number) => prepared.tree.depth[s];
          for (const a of toFocus)
            for (const b of toFocus)
              if (shown[a] === 0 && shown[b] === 1) expect(depth(b) <= depth(a)).toBe(true);
        },
      ),
    );
  });
});

describe("graphs: on an input that is a tree", () => {
  /** A random tree as CSV rows (id, parent, name, size) in a shuffled order. */
  const arbTreeRows = fc
    .integer({ min: 1, max: 30 })
    .chain((n) =>
      fc.tuple(
        fc.array(fc.nat(), { minLength: n - 1, maxLength: n - 1 }),
        fc.array(fc.constantFrom("a", "b", "c~", "d/e", ""), { minLength: n, maxLength: n }),
        fc.array(fc.integer({ min: 0, max: 999 }), { minLength: n, maxLength: n }),
        fc.boolean(),
      ),
    )
    .map(([parents, names, sizes, twoRoots]) => {
      const n = names.length;
      const parentOf = [-1, ...parents.map((p, i) => (twoRoots && i === 0 ? -1 : p % (i + 1)))];
      const rows = parentOf.map((p, i) => `k${i},${p < 0 ? "" : `k${p}`},${names[i]},${sizes[i]}`);
      const edges = parentOf.map((p, i) => (p < 0 ? `k${i}` : `k${p} k${i}`));
      return { csv: `id,parent,name,size\n${rows.join("\n")}\n`, edges: `${edges.join("\n")}\n`, n };
    });

  it("gives exactly the tree reader's summary, from a --graph table and from an edge list", () => {
    fc.assert(
      fc.property(
        arbTreeRows,
        fc.integer({ min: 1, max: 30 }),
        fc.array(fc.nat(), { maxLength: 3 }),
        fc.boolean(),
        ({ csv, edges, n }, budget, picks, chains) => {
          const foci = picks.map((k) => `k${k % n}`);
          const asTree = loadTree(csv, opts({ format: "csv", rootName: "g" }));
          const asGraph = loadTree(csv, opts({ format: "csv", graph: true, rootName: "g" }));
          expect(asGraph.referenceTo).toBeUndefined();
          const run = (tree: Tree) => {
            try {
              const { text, json } = summary(tree, foci, budget, chains);
              return { text, json };
            } catch (error) {
              return { error: (error as { code?: string }).code };
            }
          };
          const expected = run(asTree);
          expect(run(asGraph)).toEqual(expected);
          // The edge list has no names or sizes: compare with the tree reader on the ids alone.
          const idsOnly = csv
            .replace(/^(k\d+,k?\d*),[^,\n]*,\d+$/gm, "$1,,0")
            .replace("name,size", "name,unused");
          const treeOfIds = loadTree(idsOnly, opts({ format: "csv", rootName: "g" }));
          const edgeTree = loadTree(edges, opts({ format: "edges", rootName: "g" }));
          expect(run({ ...edgeTree, originIsRow: true })).toEqual(run({ ...treeOfIds, hasSizes: false }));
        },
      ),
    );
  });

  it("graph interest equals tree interest (depth importance): graph distance is tree distance on a tree", () => {
    fc.assert(
      fc.property(arbTreeRows, fc.array(fc.nat(), { maxLength: 3 }), ({ csv, n }, picks) => {
        const tree = loadTree(csv, opts({ format: "csv", rootName: "g" }));
        const asGraph: Tree = { ...tree, referenceTo: new Int32Array(tree.length).fill(-1) };
        const m = measure(tree);
        const api = importance(tree, m, "depth");
        const foci = Int32Array.from(
          new Set(picks.map((k) => (k % n) + (tree.syntheticRoot ? 1 : 0))),
        ).sort();
        const plain = interest(tree, api, foci);
        const graph = graphInterest(asGraph, m, api, foci, referencesTo(asGraph, foci)!);
        const all = [...tree.parent.keys()];
        expect(all.map((i) => graph.interestOf(i))).toEqual([...plain.value]);
        expect(all.map((i) => graph.distanceOf(i))).toEqual([...plain.distance]);
        expect(all.map((i) => graph.isForced(i))).toEqual([...plain.forced].map((f) => f === 1));
        expect([...graph.forcedNodes]).toEqual([...plain.forcedNodes]);
      }),
    );
  });
});

describe("graphs: the references to some full entries", () => {
  it("are the slots whose referenceTo is each entry, in pre-order, for a few entries or many", () => {
    fc.assert(
      fc.property(arbGraph, fc.array(fc.nat(), { maxLength: 3 }), ({ text }, picks) => {
        const tree = load(text);
        if (tree.referenceTo === undefined) return;
        const to = tree.referenceTo;
        const slots = [...tree.parent.keys()];
        const entries = slots.filter((s) => to[s] === -1);
        // A few targets (compared one by one) and every entry (up to 25: past 16 they are marked).
        const few = picks.map((k) => entries[k % entries.length]);
        for (const targets of [few, entries]) {
          const refs = referencesTo(tree, targets)!;
          for (const t of entries) {
            const expected = targets.includes(t) ? slots.filter((s) => to[s] === t) : [];
            expect([...refs.of(t)]).toEqual(expected);
          }
        }
      }),
    );
  });
});

describe("graphs: the neighbour table of graph interest", () => {
  it("scores alike with the table the loader made from the edges and the one made from the slots", () => {
    fc.assert(
      fc.property(
        arbSizedGraph,
        fc.array(fc.nat(), { minLength: 1, maxLength: 3 }),
        kinds,
        (g, picks, kind) => {
          const tree = load(g.text, g.sizes);
          if (tree.referenceTo === undefined) return; // no reference: scored as a tree
          const built = graphNeighbours(tree);
          const fromSlots = neighboursFromSlots(tree);
          // Two tables of the same graph, each numbering nodes its own way.
          expect(built).not.toBe(fromSlots);
          expect(built.down.length + built.up.length).toBeGreaterThanOrEqual(
            fromSlots.down.length + fromSlots.up.length,
          );
          const m = measure(tree);
          const api = importance(tree, m, kind);
          const entries = [...tree.parent.keys()].filter((s) => tree.referenceTo![s] === -1);
          const foci = Int32Array.from(new Set(picks.map((k) => entries[k % entries.length]))).sort();
          const refs = referencesTo(tree, foci)!;
          const a = graphInterest(tree, m, api, foci, refs, built);
          const b = graphInterest(tree, m, api, foci, refs, fromSlots);
          const all = [...tree.parent.keys()];
          expect(all.map((i) => a.interestOf(i))).toEqual(all.map((i) => b.interestOf(i)));
          expect(all.map((i) => a.distanceOf(i))).toEqual(all.map((i) => b.distanceOf(i)));
        },
      ),
    );
  });
});

function countTop(tree: Tree): number {
  let tops = 0;
  for (let i = 1; i < tree.length; i++) if (tree.parent[i] === 0) tops++;
  return tops;
}
