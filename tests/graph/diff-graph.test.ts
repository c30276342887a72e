import { readFileSync } from "node:fs";
import Ajv2020 from "ajv/dist/2020.js";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { KIND } from "../../src/diff/changes.js";
import { diffTrees } from "../../src/diff/diff-trees.js";
import { isGraphDiff } from "../../src/diff/graph-changes.js";
import { loadTree } from "../../src/load/index.js";
import type { Tree } from "../../src/model/tree.js";
import { renderDiffJson } from "../../src/render/diff-json.js";
import { renderDiffText } from "../../src/render/diff-text.js";
import { opts } from "../load/helpers.js";

const edges = (text: string) => loadTree(text, opts({ format: "edges", rootName: "deps" }));

function diff(oldTree: Tree, newTree: Tree, budget = 40) {
  const result = diffTrees(oldTree, newTree, { foci: [], budget, importance: "depth", headerLines: 1 });
  const text = renderDiffText(result.view, result.totals, {
    units: "plain",
    sizes: false,
    by: result.combined.by,
    header: { budget, lines: result.selection.lines, foci: [] },
  });
  const json = renderDiffJson(result.view, result.totals, {
    budget,
    lines: result.selection.lines,
    foci: result.fociPaths,
    by: result.combined.by,
    labels: false,
  });
  return { result, text, json: JSON.parse(json) };
}

// Invented packages of the fictional tidewater monorepo.
describe("diffTrees(old graph, new graph)", () => {
  it("shows a removed node, an added one, a move (one parent lost, another gained) and an edge added", () => {
    // Before: tern-fmt comes in through shoal-codec and ledger. After: shoal-codec is dropped, tern-fmt
    // comes in through kelp-log, and the new reef-io also requires brine.
    const before = edges(
      "ledger kelp-log\nledger tern-fmt\nkelp-log brine\nledger shoal-codec\nshoal-codec tern-fmt\n",
    );
    const after = edges(
      "ledger kelp-log\nledger tern-fmt\nkelp-log brine\nkelp-log tern-fmt\nledger reef-io\nreef-io brine\n",
    );
    const { text } = diff(before, after);
    expect(text).toBe(
      [
        "diff by id: 1 added, 1 removed, 1 moved, 0 renamed, 0 edited, 0 resized, 1 linked, 0 unlinked; 5 -> 5 nodes, 6 with the 1 removed; no focus; 9 of 40 lines",
        ": ledger  6 nodes",
        "  : kelp-log  3 nodes",
        "    . brine",
        "    : [moved from shoal-codec] tern-fmt",
        "  & tern-fmt  full entry at kelp-log/tern-fmt",
        "  : [removed] shoal-codec",
        "  : [added] reef-io",
        "    & [linked] brine  full entry at kelp-log/brine",
        "",
      ].join("\n"),
    );
  });

  it("names a node gaining a second parent `linked`, on the new parent's reference line", () => {
    const { text, result } = diff(
      edges("hq lab\nhq ops\nlab rig\n"),
      edges("hq lab\nhq ops\nlab rig\nops rig\n"),
    );
    expect(result.totals.changes).toMatchObject({ linked: 1, added: 0, moved: 0 });
    expect(text).toContain("  : ops\n    & [linked] rig  full entry at lab/rig");
  });

  it("names it `linked` on the full entry when the new parent is the deepest, and `unlinked` the other way", () => {
    const one = edges("hq lab\nhq rig\nlab rig\n");
    const two = edges("hq lab\nhq rig\nlab rig\nlab deep\ndeep rig\n");
    const gained = diff(one, two);
    expect(gained.result.totals.changes).toMatchObject({ added: 1, linked: 1, moved: 0, unlinked: 0 });
    expect(gained.text).toContain(": [linked] rig");
    // The reverse: deep goes, and rig, which keeps lab, has lost a parent.
    const lost = diff(two, one);
    expect(lost.result.totals.changes).toMatchObject({ removed: 1, unlinked: 1, moved: 0, linked: 0 });
    expect(lost.text).toContain("[unlinked from lab/deep] rig");
  });

  it("writes diff JSON with references and edge kinds that validates against the published schema", () => {
    // Validated with Ajv 8.20.0, a general-purpose JSON Schema (draft 2020-12) validator from the registry.
    const schema = JSON.parse(readFileSync(new URL("../../docs/diff.schema.json", import.meta.url), "utf8"));
    const validate = new Ajv2020.default({ allErrors: true }).compile(schema);
    const { json } = diff(edges("hq lab\nhq ops\nlab rig\n"), edges("hq lab\nhq ops\nlab rig\nops rig\n"));
    expect(validate(json), JSON.stringify(validate.errors)).toBe(true);
    expect(json.changes).toMatchObject({ linked: 1, unlinked: 0 });
  });

  it("keeps the counts of a diff of trees to the six kinds a tree has", () => {
    const { text, json } = diff(edges("a b\na c\n"), edges("a b\nb c\n"));
    expect(text.split("\n")[0]).toBe(
      "diff by id: 0 added, 0 removed, 1 moved, 0 renamed, 0 edited, 0 resized; 3 -> 3 nodes; no focus; 4 of 40 lines",
    );
    expect(Object.keys(json.changes)).toEqual(["added", "removed", "moved", "renamed", "edited", "resized"]);
  });
});

describe("diffTrees on random graph pairs (property)", () => {
  /** A random graph and a changed copy: some edges dropped, some added, nodes that appear or go. */
  const arbPair = fc
    .integer({ min: 2, max: 14 })
    .chain((n) =>
      fc.tuple(
        fc.array(fc.tuple(fc.nat({ max: n - 1 }), fc.nat({ max: n - 1 })), {
          minLength: 1,
          maxLength: 2 * n,
        }),
        fc.array(fc.boolean(), { minLength: 2 * n, maxLength: 2 * n }),
        fc.array(fc.tuple(fc.nat({ max: n + 2 }), fc.nat({ max: n + 2 })), { maxLength: n }),
      ),
    )
    .map(([old, keep, extra]) => {
      const kept = old.filter((_, k) => keep[k]);
      const fresh = [...kept, ...extra];
      const text = (list: [number, number][]) =>
        `${(list.length > 0 ? list : [[0, 1]]).map(([a, b]) => `n${a} n${b}`).join("\n")}\n`;
      return { oldText: text(old), newText: text(fresh.length > 0 ? fresh : [[0, 1]]) };
    });

  const edgeSet = (text: string) => new Set(text.trim().split("\n"));
  const nodeSet = (text: string) => new Set(text.trim().split(/\s+/));

  it("accounts for every node and every edge of two graphs: nodes old + added − removed = new; edges by kind", () => {
    fc.assert(
      fc.property(arbPair, ({ oldText, newText }) => {
        const [oldTree, newTree] = [edges(oldText), edges(newText)];
        // Two tree-shaped versions are compared as trees (the tree diff, roots always matched).
        fc.pre(isGraphDiff(oldTree, newTree));
        const { result, json } = diff(oldTree, newTree, 400);
        const c = result.totals.changes;
        // Both versions stand under a synthetic root when either needs one, or when their tops differ.
        const synthetic = result.combined.newTree.syntheticRoot ? 1 : 0;
        expect(result.totals.old.nodes).toBe(nodeSet(oldText).size + synthetic);
        expect(result.totals.new.nodes).toBe(nodeSet(newText).size + synthetic);
        expect(result.totals.old.nodes + c.added - c.removed).toBe(result.totals.new.nodes);
        const oldEdges = edgeSet(oldText);
        const newEdges = edgeSet(newText);
        const gained = [...newEdges].filter((e) => !oldEdges.has(e)).length;
        const lost = [...oldEdges].filter((e) => !newEdges.has(e)).length;
        const addedIds = [...nodeSet(newText)].filter((id) => !nodeSet(oldText).has(id));
        const removedIds = [...nodeSet(oldText)].filter((id) => !nodeSet(newText).has(id));
        expect(c.added).toBe(addedIds.length);
        expect(c.removed).toBe(removedIds.length);
        // Each edge gained is a linked line, a moved node's new parent, or the edge of an added node's full
        // entry (every added node has one unless it is a top-level node); likewise for the edges lost.
        const { tree, kind } = result.combined;
        let addedEntries = 0;
        let removedEntries = 0;
        for (let k = 1; k < tree.length; k++) {
          if (tree.referenceTo![k] !== -1 || (tree.parent[k] === 0 && tree.syntheticRoot)) continue;
          if (kind[k] === KIND.added) addedEntries++;
          if (kind[k] === KIND.removed) removedEntries++;
        }
        expect(c.linked + c.moved + addedEntries).toBe(gained);
        expect(c.unlinked + c.moved + removedEntries).toBe(lost);
        // The root's counts are the totals, and JSON carries them.
        expect(json.changes).toEqual(c);
      }),
    );
  });
});
