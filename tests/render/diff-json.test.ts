import { readFileSync } from "node:fs";
import Ajv2020 from "ajv/dist/2020.js";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { diffTrees } from "../../src/diff/diff-trees.js";
import { EspalierError } from "../../src/errors.js";
import { buildTree } from "../../src/model/build-tree.js";
import type { Tree } from "../../src/model/tree.js";
import { renderDiffJson, toDiffSummary } from "../../src/render/diff-json.js";
import { diffJsonSchema } from "../../src/render/diff-json-schema.js";
import { type DiffSummaryNode, diffSchema } from "../../src/render/diff-schema.js";
import { arbEdited, EDIT_FIELD } from "../diff/edit-script.js";
import { makeIdTree } from "../diff/id-tree.js";

const published = JSON.parse(readFileSync(new URL("../../docs/diff.schema.json", import.meta.url), "utf8"));

function summary(oldTree: Tree, newTree: Tree, budget: number) {
  const compareFields = oldTree.fields.has(EDIT_FIELD) ? [EDIT_FIELD] : [];
  const r = diffTrees(oldTree, newTree, { foci: [], budget, importance: "depth", compareFields });
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
    expect(s.changes).toEqual({ added: 1, removed: 0, moved: 1, renamed: 0, edited: 0, resized: 0 });
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
        // Edits appear exactly on shown nodes of kind edited, or of a kind before it (moved, renamed).
        const walk = (n: DiffSummaryNode): void => {
          if (n.change === "edited") expect(n.edits?.length).toBeGreaterThan(0);
          if (n.edits) expect(["moved", "renamed", "edited"]).toContain(n.change);
          n.children.forEach(walk);
        };
        walk(s.root);
      }),
    );
  });
});

/** A chain `depth` nodes deep, ids `c0`…, the bottom node named `bottom`. */
function chain(depth: number, bottom: string): Tree {
  const parentOf = new Int32Array(depth);
  const name: string[] = [];
  for (let i = 0; i < depth; i++) {
    parentOf[i] = i - 1;
    name.push(i === depth - 1 ? bottom : `n${i}`);
  }
  return buildTree({
    parentOf,
    name,
    ownSize: new Float64Array(depth),
    hasSizes: false,
    ids: name.map((_, i) => `c${i}`),
    origin: new Int32Array(depth),
    originIsRow: true,
    fields: new Map(),
    rootName: "",
  });
}

function render(oldTree: Tree, newTree: Tree, budget: number): string {
  const compareFields = oldTree.fields.has(EDIT_FIELD) ? [EDIT_FIELD] : [];
  const r = diffTrees(oldTree, newTree, { foci: [], budget, importance: "depth", compareFields });
  return renderDiffJson(r.view, r.totals, {
    budget,
    lines: r.selection.lines,
    foci: r.fociPaths,
    by: r.combined.by,
    labels: false,
  });
}

describe("renderDiffJson(view, totals, options)", () => {
  it("writes RFC 8259 JSON ending in a newline", () => {
    const r = diffTrees(makeIdTree("R{A}"), makeIdTree("R{B}"), {
      foci: [],
      budget: 10,
      importance: "depth",
    });
    const out = renderDiffJson(r.view, r.totals, { budget: 10, lines: 3, foci: [], by: "id", labels: false });
    expect(out.endsWith("}\n")).toBe(true);
    expect(JSON.parse(out).changes).toEqual({
      added: 1,
      removed: 1,
      moved: 0,
      renamed: 0,
      edited: 0,
      resized: 0,
    });
  });

  it("writes ESC and U+202E in a name as \\u escapes that parse back to the name", () => {
    // JSON text may escape any character inside a string as \uXXXX (RFC 8259, section 7).
    const name = "quill\u202egnp.exe\u001b[31m";
    const out = render(makeIdTree("R{A}"), makeIdTree(`R{A,${name}}`), 10);
    expect(out).toContain("quill\\u202egnp.exe\\u001b[31m");
    expect(out).not.toMatch(/[\u001b\u202e]/);
    const added = JSON.parse(out).root.children.find((n: DiffSummaryNode) => n.change === "added");
    expect(added.name).toBe(name);
  });

  it("renders the diff of a chain 5,000 deep without a stack overflow; a view too deep to write is LIMIT_EXCEEDED", () => {
    const depth = 5000;
    const oldTree = chain(depth, "sounding-line");
    const newTree = chain(depth, "sounding-line-v2");
    const doc = JSON.parse(render(oldTree, newTree, 40));
    expect(doc.lines).toBeLessThanOrEqual(40);
    expect(doc.totals.nodes).toBe(depth);
    expect(doc.changes.renamed).toBe(1);
    // Every level shown: JSON.stringify recurses per level, past the engine's stack (docs/reliability.md).
    let error: unknown;
    try {
      render(oldTree, newTree, depth);
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(EspalierError);
    expect((error as EspalierError).code).toBe("LIMIT_EXCEEDED");
  });
});
