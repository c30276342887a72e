import { readFileSync } from "node:fs";
import Ajv2020 from "ajv/dist/2020.js";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { diffTrees } from "../../src/diff/diff-trees.js";
import type { Tree } from "../../src/model/tree.js";
import { renderDiffJson, toDiffSummary } from "../../src/render/diff-json.js";
import { diffJsonSchema } from "../../src/render/diff-json-schema.js";
import { type DiffSummaryNode, diffSchema } from "../../src/render/diff-schema.js";
import { arbEdited } from "../diff/edit-script.js";
import { makeIdTree } from "../diff/id-tree.js";

const published = JSON.parse(readFileSync(new URL("../../docs/diff.schema.json", import.meta.url), "utf8"));

function summary(oldTree: Tree, newTree: Tree, budget: number) {
  const r = diffTrees(oldTree, newTree, { foci: [], budget, importance: "depth" });
  return toDiffSummary(r.view, r.totals, {
    budget,
    lines: r.selection.lines,
    foci: r.fociPaths,
    by: r.combined.by,
    labels: false,
  });
}

describe("toDiffSummary(view, totals, options)", () => {
  it("has top-level change counts, a change on every shown node and counts in every remainder", () => {
    const s = summary(makeIdTree("R{A{x,y},B{z}}"), makeIdTree("R{A{y},B{z,x},C}"), 40);
    expect(s.format).toBe("espalier-diff/1");
    expect(s.match).toBe("id");
    expect(s.changes).toEqual({ added: 1, removed: 0, moved: 1, renamed: 0, resized: 0 });
    const flat: DiffSummaryNode[] = [];
    const walk = (n: DiffSummaryNode) => {
      flat.push(n);
      n.children.forEach(walk);
    };
    walk(s.root);
    expect(flat.map((n) => [n.path, n.change])).toEqual([
      ["", null],
      ["A", null],
      ["A/y", null],
      ["B", null],
      ["B/z", null],
      ["B/x", "moved"],
      ["C", "added"],
    ]);
    expect(flat.find((n) => n.path === "B/x")?.movedFrom).toBe("A");
  });

  it("publishes in docs/ exactly the JSON Schema generated from the zod schema", () => {
    expect(published).toEqual(JSON.parse(JSON.stringify(diffJsonSchema())));
  });

  it("matches its zod schema and the published JSON Schema, for random diffs and budgets", () => {
    // Validated with Ajv, a general-purpose JSON Schema (draft 2020-12) validator from the registry.
    const validate = new Ajv2020.default({ allErrors: true }).compile(published);
    fc.assert(
      fc.property(arbEdited(), fc.integer({ min: 2, max: 30 }), ({ oldTree, newTree }, budget) => {
        const s = summary(oldTree, newTree, budget);
        expect(diffSchema.safeParse(s).success).toBe(true);
        expect(validate(JSON.parse(JSON.stringify(s))), JSON.stringify(validate.errors)).toBe(true);
        const hiddenAll = (n: DiffSummaryNode): boolean =>
          (n.hidden === null || n.hidden.changes !== undefined) && n.children.every(hiddenAll);
        expect(hiddenAll(s.root)).toBe(true);
      }),
    );
  });
});

describe("renderDiffJson(view, totals, options)", () => {
  it("writes RFC 8259 JSON ending in a newline", () => {
    const r = diffTrees(makeIdTree("R{A}"), makeIdTree("R{B}"), {
      foci: [],
      budget: 10,
      importance: "depth",
    });
    const out = renderDiffJson(r.view, r.totals, { budget: 10, lines: 3, foci: [], by: "id", labels: false });
    expect(out.endsWith("}\n")).toBe(true);
    expect(JSON.parse(out).changes).toEqual({ added: 1, removed: 1, moved: 0, renamed: 0, resized: 0 });
  });
});
