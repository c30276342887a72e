import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { changeKinds, kindName } from "../../src/diff/changes.js";
import { diffOrder } from "../../src/diff/diff-order.js";
import {
  DIFF_HEADER_LINES,
  type DiffResult,
  diffTrees,
  prepareDiff,
  summarizeDiff,
} from "../../src/diff/diff-trees.js";
import type { DiffViewNode } from "../../src/diff/diff-view.js";
import { EspalierError } from "../../src/errors.js";
import { importance } from "../../src/interest/importance.js";
import { loadTree } from "../../src/load/index.js";
import { defaultLoadOptions } from "../../src/load/load-options.js";
import { measure } from "../../src/model/measure.js";
import { namesToArray, StringNames } from "../../src/model/names.js";
import type { Tree } from "../../src/model/tree.js";
import { renderDiffText } from "../../src/render/diff-text.js";
import { makeTree } from "../helpers/make-tree.js";
import { arbTree } from "../helpers/random-tree.js";
import { arbEdited, EDIT_FIELD, withoutIds } from "./edit-script.js";
import { makeIdTree } from "./id-tree.js";

/** Compares EDIT_FIELD whenever both versions have it (the edit scripts' trees do). */
const run = (oldTree: Tree, newTree: Tree, budget = 100, foci: string[] = [], chains = false) =>
  diffTrees(oldTree, newTree, {
    foci,
    budget,
    importance: "depth",
    chains,
    compareFields: oldTree.fields.has(EDIT_FIELD) && newTree.fields.has(EDIT_FIELD) ? [EDIT_FIELD] : [],
  });

/** Every change as "<name> <kind>[ from <old parent> to <new parent>]", in the combined tree's order. */
function changeList(result: DiffResult): string[] {
  const { tree, kind, oldIndex, oldTree } = result.combined;
  const out: string[] = [];
  for (let k = 0; k < tree.length; k++) {
    const word = kindName(kind[k]);
    if (word === null) continue;
    const moved =
      word === "moved"
        ? ` from ${oldTree.name.get(oldTree.parent[oldIndex[k]])} to ${tree.name.get(tree.parent[k])}`
        : "";
    out.push(`${tree.name.get(k)} ${word}${moved}`);
  }
  return out;
}

const render = (r: DiffResult, chains = false) =>
  renderDiffText(r.view, r.totals, {
    units: "plain",
    sizes: true,
    by: r.combined.by,
    chains,
    header: { budget: 0, lines: r.selection.lines, foci: r.fociPaths },
  });

describe("diffTrees(old, new, options)", () => {
  it("finds exactly one move and one insertion in the change-detection example", () => {
    // Example in the style of Chawathe, Rajaraman, Garcia-Molina and Widom, "Change detection in
    // hierarchically structured information", SIGMOD 1996: the trees are the issue's; the expected
    // edit script (move x from A to B, insert C) is derived by hand.
    const result = run(makeIdTree("R{A{x,y},B{z}}"), makeIdTree("R{A{y},B{z,x},C}"));
    expect(changeList(result)).toEqual(["x moved from A to B", "C added"]);
    // Trees have no edge kinds: linked and unlinked (graphs, tests/graph/diff-graph.test.ts) stay 0.
    expect(result.totals.changes).toEqual({
      added: 1,
      removed: 0,
      moved: 1,
      renamed: 0,
      edited: 0,
      resized: 0,
      linked: 0,
      unlinked: 0,
    });
  });

  it("reports a move as one removal and one addition when matching by path", () => {
    const result = run(makeTree("R{A{x,y},B{z}}"), makeTree("R{A{y},B{z,x},C}"));
    expect(result.combined.by).toBe("path");
    expect(changeList(result)).toEqual(["x removed", "x added", "C added"]);
  });

  it("reports nothing for diff(T, T)", () => {
    fc.assert(
      fc.property(arbTree(40), fc.boolean(), (tree, ids) => {
        const t = ids
          ? { ...tree, ids: new StringNames(Array.from({ length: tree.length }, (_, i) => `n${i}`)) }
          : tree;
        const result = run(t, t, 10);
        expect(result.totals.changes).toEqual({
          added: 0,
          removed: 0,
          moved: 0,
          renamed: 0,
          edited: 0,
          resized: 0,
          linked: 0,
          unlinked: 0,
        });
        expect(result.totals.delta).toBe(0);
        expect(result.combined.tree.length).toBe(t.length);
      }),
    );
  });

  it("counts a moved subtree once, at its root", () => {
    const result = run(makeIdTree("R{A{m{m1,m2{m3}}},B}"), makeIdTree("R{A,B{m{m1,m2{m3}}}}"));
    expect(changeList(result)).toEqual(["m moved from A to B"]);
  });

  it("puts removed nodes at their old place among the new siblings", () => {
    const names = (r: DiffResult) => namesToArray(r.combined.tree.name);
    expect(names(run(makeTree("R{A{x,y,z}}"), makeTree("R{A{x,z}}")))).toEqual(["R", "A", "x", "y", "z"]);
    expect(names(run(makeTree("R{A{y,x,w}}"), makeTree("R{A{x,v}}")))).toEqual([
      "R",
      "A",
      "y",
      "x",
      "w",
      "v",
    ]);
    // By id, a removed node goes after its nearest earlier old sibling that stayed, skipping moved ones.
    const byId = run(makeIdTree("R{A{p,q,r},B}"), makeIdTree("R{A{p},B{q}}"));
    expect(names(byId)).toEqual(["R", "A", "p", "r", "B", "q"]);
    expect(changeList(byId)).toEqual(["r removed", "q moved from A to B"]);
  });

  it("gives each node one kind: moved before renamed before resized, own size change kept", () => {
    const oldTree = makeIdTree("R{A{m:1,n:1,s:1},B}");
    const newTree = {
      ...makeIdTree("R{A{n:2,s:3},B{m:5}}"),
      ids: new StringNames(["R", "A", "n", "s", "B", "m"]),
    };
    const renamed: Tree = { ...newTree, name: new StringNames(["R", "A", "n2", "s", "B", "m2"]) };
    const result = run(oldTree, renamed);
    expect(changeList(result)).toEqual(["n2 renamed", "s resized", "m2 moved from A to B"]);
    const { tree, delta } = result.combined;
    expect([...delta]).toEqual(
      namesToArray(tree.name).map((nm) => ({ n2: 1, s: 2, m2: 4 })[nm as "n2"] ?? 0),
    );
  });

  it("puts both versions under one root when only one of them has several top-level nodes", () => {
    const one = makeTree("A{x}");
    const several = makeTree("A{x},B");
    expect(several.syntheticRoot).toBe(true);
    const result = run(one, several);
    expect(changeList(result)).toEqual(["B added"]);
  });

  it("keeps how a version was read when it is put under a root: its size unit, empty entries", () => {
    // A listing whose one top-level file went (find -printf '%s\t%P\n' minus the root line) and an
    // `npm ls --json`-shaped document that lost its second root: NEW is put under a root. Before, the
    // diff printed NEW's byte sizes as plain numbers and counted its empty entry `{}` as 0.
    const paths = (text: string) => loadTree(text, { ...defaultLoadOptions, format: "paths" });
    const listing = run(paths("5000\tsrc/a\n3000\tREADME\n"), paths("5000\tsrc/a\n7000\tsrc/b\n"));
    expect(listing.combined.tree.reading?.sizeUnit).toBe("bytes");
    expect(changeList(listing)).toEqual(["b added", "README removed"]);
    const npm = (text: string) => loadTree(text, { ...defaultLoadOptions, format: "json" });
    const lost = run(
      npm('[{"name": "app", "dependencies": {"x": {}, "y": {"version": "1"}}}, {"name": "tool"}]'),
      npm('{"name": "app", "dependencies": {"x": {}, "y": {"version": "1"}}}'),
    );
    expect(lost.totals.old.empty).toBe(1);
    expect(lost.totals.new.empty).toBe(1);
    expect(lost.combined.tree.reading?.childrenField).toBe("dependencies");
    expect(changeList(lost)).toEqual(["tool removed"]);
  });

  it("recovers a random edit script exactly when nodes have ids", () => {
    fc.assert(
      fc.property(arbEdited(), ({ oldTree, newTree, expected }) => {
        const result = run(oldTree, newTree, 5);
        const { tree, kind, oldIndex } = result.combined;
        const ids = namesToArray(tree.ids!);
        const found = new Map<string, string>();
        for (let k = 0; k < tree.length; k++) {
          const word = kindName(kind[k]);
          if (word === null) continue;
          let text: string = word;
          if (word === "moved") {
            const from = result.combined.oldTree.ids!.get(result.combined.oldTree.parent[oldIndex[k]]);
            text += ` ${from} ${ids[tree.parent[k]]}`;
          }
          found.set(ids[k], text);
        }
        const want = new Map(
          [...expected].map(([id, e]) => [id, e.kind === "moved" ? `moved ${e.from} ${e.to}` : e.kind]),
        );
        expect(found).toEqual(want);
      }),
    );
  });

  it("conserves nodes and sizes: old + added - removed = new, old size + net change = new size", () => {
    fc.assert(
      fc.property(arbEdited(), fc.boolean(), (edited, byId) => {
        const [oldTree, newTree] = byId ? [edited.oldTree, edited.newTree] : withoutIds(edited);
        const { totals, combined } = run(oldTree, newTree, 5);
        const sum = (t: Tree) => t.ownSize.reduce((a, b) => a + b, 0);
        expect(totals.old.nodes + totals.changes.added - totals.changes.removed).toBe(totals.new.nodes);
        expect(totals.new.nodes).toBe(newTree.length);
        expect(sum(oldTree) + totals.delta).toBe(sum(newTree));
        expect(combined.tree.length).toBe(newTree.length + totals.changes.removed);
      }),
    );
  });

  it("prepareDiff(old, new) measures the combined tree as measure() and importance() do, in lent memory", () => {
    // The counts and matching of both versions are lent to the combined tree's measures and
    // importance once read no more (prepareDiff): the numbers must be those of fresh arrays, and the
    // combined tree's own arrays (with nothing removed, its old-node map is the matching's) untouched.
    fc.assert(
      fc.property(arbEdited(), fc.boolean(), fc.boolean(), (edited, byId, same) => {
        const [oldTree, newTree] = byId ? [edited.oldTree, edited.newTree] : withoutIds(edited);
        const prepared = prepareDiff(same ? newTree : oldTree, newTree);
        const { tree, newIndex, oldIndex } = prepared.combined;
        const fresh = measure(tree);
        const got = prepared.measures;
        for (const key of ["count", "nodes", "size", "children"] as const)
          expect([...got[key]], key).toEqual([...fresh[key]]);
        for (const kind of ["depth", "size"] as const)
          expect([...prepared.importance(kind)], kind).toEqual([...importance(tree, fresh, kind)]);
        // Every node of the new version once, in order; each old index in range or -1.
        expect([...newIndex].filter((n) => n >= 0)).toEqual([...Array(newTree.length).keys()]);
        for (let k = 0; k < tree.length; k++) {
          expect(oldIndex[k]).toBeGreaterThanOrEqual(-1);
          expect(oldIndex[k]).toBeLessThan((same ? newTree : oldTree).length);
          if (same) expect(oldIndex[k]).toBe(newIndex[k]);
        }
      }),
    );
  });

  it("builds the combined tree as the new tree in pre-order plus each removed node under its old parent", () => {
    fc.assert(
      fc.property(arbEdited(), fc.boolean(), (edited, byId) => {
        const [oldTree, newTree] = byId ? [edited.oldTree, edited.newTree] : withoutIds(edited);
        const { combined } = run(oldTree, newTree, 5);
        const { tree, newIndex, oldIndex } = combined;
        const count = measure(tree).count;
        const present = [...newIndex].filter((n) => n >= 0);
        expect(present).toEqual([...Array(newTree.length).keys()]);
        const whereNew = new Map(present.map((n) => [n, newIndex.indexOf(n)]));
        const whereOld = new Map([...oldIndex].map((o, k) => [o, k]));
        for (let k = 1; k < tree.length; k++) {
          const p = tree.parent[k];
          expect(p).toBeLessThan(k);
          expect(k + count[k]).toBeLessThanOrEqual(p + count[p]); // a subtree is a contiguous range
          expect(tree.depth[k]).toBe(tree.depth[p] + 1);
          // Where each node came from and its own size, from the version it lives in (origin is
          // made when first read).
          const n = newIndex[k];
          expect(tree.origin[k]).toBe(n >= 0 ? newTree.origin[n] : oldTree.origin[oldIndex[k]]);
          expect(tree.ownSize[k]).toBe(n >= 0 ? newTree.ownSize[n] : 0);
          if (newIndex[k] >= 0) expect(p).toBe(whereNew.get(newTree.parent[newIndex[k]]));
          else {
            const op = oldTree.parent[oldIndex[k]];
            expect(oldIndex[p] === op || whereOld.get(op) === p).toBe(true);
            expect(p).toBe(whereOld.get(op));
          }
        }
      }),
    );
  });

  it("keeps the selection contract, with and without chains: fits, nested, a prefix of the order, root and foci forced", () => {
    fc.assert(
      fc.property(
        arbEdited(),
        fc.integer({ min: 2, max: 40 }),
        fc.integer({ min: 0, max: 20 }),
        fc.boolean(),
        (edited, b, extra, chains) => {
          const small = run(edited.oldTree, edited.newTree, b, [], chains);
          const large = run(edited.oldTree, edited.newTree, b + extra, [], chains);
          const lines = render(small, chains).split("\n").length - 1;
          expect(lines).toBe(small.selection.lines);
          expect(lines).toBeLessThanOrEqual(b);
          const n = small.combined.tree.length;
          if (small.selection.admitted.length < n) expect(lines).toBe(b);
          for (let i = 0; i < n; i++) if (small.selection.shown[i]) expect(large.selection.shown[i]).toBe(1);
          for (let i = 1; i < n; i++)
            if (small.selection.shown[i])
              expect(small.selection.shown[small.combined.tree.parent[i]]).toBe(1);
        },
      ),
    );
  });

  it("shows a prefix of one budget-independent order in which every parent precedes its children", () => {
    fc.assert(
      fc.property(arbEdited(), fc.boolean(), fc.integer({ min: 2, max: 30 }), (edited, byId, b) => {
        const [oldTree, newTree] = byId ? [edited.oldTree, edited.newTree] : withoutIds(edited);
        const result = run(oldTree, newTree, b);
        const { tree } = result.combined;
        const order = diffOrder(tree, result.measures, result.scores, result.changeMeasures);
        const all = [...Array(tree.length).keys()].sort(order);
        const rank = new Int32Array(tree.length);
        all.forEach((node, r) => {
          rank[node] = r;
        });
        for (let i = 1; i < tree.length; i++) expect(rank[tree.parent[i]]).toBeLessThan(rank[i]);
        const k = result.selection.admitted.length;
        expect(all.slice(0, k).every((i) => result.selection.shown[i] === 1)).toBe(true);
        expect(all.slice(k).every((i) => result.selection.shown[i] === 0)).toBe(true);
      }),
    );
  });

  it("counts every change in exactly one place: adds up at every shown node, totals at the root", () => {
    fc.assert(
      fc.property(arbEdited(), fc.boolean(), fc.integer({ min: 2, max: 30 }), (edited, byId, b) => {
        const [oldTree, newTree] = byId ? [edited.oldTree, edited.newTree] : withoutIds(edited);
        const result = run(oldTree, newTree, b);
        const { kind, delta } = result.combined;
        const kinds = changeKinds;
        const seen = {
          added: 0,
          removed: 0,
          moved: 0,
          renamed: 0,
          edited: 0,
          resized: 0,
          linked: 0,
          unlinked: 0,
        };
        let seenDelta = 0;
        result.view.each(({ data }) => {
          const v: DiffViewNode = data;
          if (v.change) seen[v.change]++;
          seenDelta += v.delta;
          for (const k of kinds) {
            const own = v.change === k ? 1 : 0;
            const fromChildren = v.children.reduce((a, c) => a + c.changes[k], 0);
            expect(v.changes[k]).toBe(own + fromChildren + (v.hidden?.changes[k] ?? 0));
            seen[k] += v.hidden?.changes[k] ?? 0;
          }
          expect(v.net).toBe(v.delta + v.children.reduce((a, c) => a + c.net, 0) + (v.hidden?.delta ?? 0));
          seenDelta += v.hidden?.delta ?? 0;
          expect(v.nodes).toBe(1 + v.children.reduce((a, c) => a + c.nodes, 0) + (v.hidden?.nodes ?? 0));
          expect(kindName(kind[v.index])).toBe(v.change);
          expect(delta[v.index]).toBe(v.delta);
        });
        expect(seen).toEqual(result.totals.changes);
        expect(result.view.data.changes).toEqual(result.totals.changes);
        expect(seenDelta).toBe(result.totals.delta);
      }),
    );
  });

  it("forces only the root and the user's foci, so more changes than the budget still fit", () => {
    const oldTree = makeIdTree("R{A{a1,a2,a3},B{b1,b2},C{c1}}");
    const newTree = makeIdTree("R{A{a1},B{b1},C{c1,c2}}");
    const result = run(oldTree, newTree, 4, ["c1"]);
    const shown = namesToArray(result.combined.tree.name).filter((_, i) => result.selection.shown[i]);
    expect(shown).toEqual(["R", "C", "c1"]);
    expect(result.selection.lines).toBe(DIFF_HEADER_LINES + 3);
    expect(result.view.data.hidden?.changes).toEqual({
      added: 0,
      removed: 3,
      moved: 0,
      renamed: 0,
      edited: 0,
      resized: 0,
      linked: 0,
      unlinked: 0,
    });
    const err = (() => {
      try {
        run(oldTree, newTree, 3, ["c1"]);
      } catch (e) {
        return e as EspalierError;
      }
    })();
    expect(err).toBeInstanceOf(EspalierError);
    expect(err?.code).toBe("BUDGET_TOO_SMALL");
  });

  it("summarizeDiff(prepareDiff(old, new), options) renders as diffTrees does, for many foci on one preparation", () => {
    fc.assert(
      fc.property(arbEdited(), fc.integer({ min: 6, max: 30 }), fc.nat(), (edited, b, pick) => {
        const prepared = prepareDiff(edited.oldTree, edited.newTree);
        const { tree } = prepared.combined;
        const focus = prepared.index.path(pick % tree.length);
        for (const foci of [[], [focus], []]) {
          const options = { foci, budget: b, importance: "depth" as const };
          let fresh: string;
          try {
            fresh = render(diffTrees(edited.oldTree, edited.newTree, options));
          } catch (err) {
            expect(() => summarizeDiff(prepared, options)).toThrow((err as Error).message);
            continue;
          }
          expect(render(summarizeDiff(prepared, options))).toBe(fresh);
        }
      }),
    );
  });
});
