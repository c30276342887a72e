import { describe, expect, it } from "vitest";
import { diffTrees } from "../../src/diff/diff-trees.js";
import type { DiffViewNode } from "../../src/diff/diff-view.js";
import { EspalierError } from "../../src/errors.js";
import { loadTree } from "../../src/load/index.js";
import { defaultLoadOptions, type LoadOptions } from "../../src/load/load-options.js";
import { pseudonym } from "../../src/model/pseudonym.js";
import type { Tree } from "../../src/model/tree.js";
import { renderDiffText } from "../../src/render/diff-text.js";

/** A dependency listing in the shape of `npm ls --all --json` (npm-ls(1)): names keyed under `dependencies`. */
const listing = (coral: string, kelp: string, extra = "") => `{
  "name": "tidewater", "version": "0.0.0",
  "dependencies": {
    "coral-args": { "version": ${coral}, "dependencies": { "kelp-log": { "version": ${kelp} } } },
    "brine": { "version": "1.4.0"${extra} }
  }
}`;

const json = (text: string, keep: string[], file = "deps.json"): Tree =>
  loadTree(text, { ...defaultLoadOptions, file, keepFields: keep } satisfies LoadOptions);

const diff = (oldTree: Tree, newTree: Tree, compareFields: string[], pseudonymKey?: string) =>
  diffTrees(oldTree, newTree, { foci: [], budget: 40, importance: "depth", compareFields, pseudonymKey });

function nodeNamed(view: { each(f: (n: { data: DiffViewNode }) => void): void }, name: string): DiffViewNode {
  let found: DiffViewNode | undefined;
  view.each(({ data }) => {
    if (data.name === name) found = data;
  });
  if (!found) throw new Error(`no shown node ${name}`);
  return found;
}

describe("diffTrees(old, new, { compareFields })", () => {
  it("reports a version that moved 3.0.1 -> 3.0.0 as one edited node, with both values", () => {
    // Version strings as semver.org writes them (3.0.1 and 3.0.0 are two different versions); espalier
    // compares them as text, never by precedence.
    const before = json(listing('"3.0.1"', '"0.2.0"'), ["version"]);
    const after = json(listing('"3.0.0"', '"0.2.0"'), ["version"]);
    const result = diff(before, after, ["version"]);
    expect(result.totals.changes.edited).toBe(1);
    expect(result.totals.changes).toMatchObject({ added: 0, removed: 0, moved: 0, renamed: 0, resized: 0 });
    const coral = nodeNamed(result.view, "coral-args");
    expect(coral.change).toBe("edited");
    expect(coral.edits).toEqual([{ field: "version", old: "3.0.1", new: "3.0.0" }]);
    expect(nodeNamed(result.view, "brine").edits).toEqual([]);
  });

  it("sees no change without compareFields: the same pair is unchanged", () => {
    const before = json(listing('"3.0.1"', '"0.2.0"'), ["version"]);
    const after = json(listing('"3.0.0"', '"0.2.0"'), ["version"]);
    expect(diff(before, after, []).totals.changes.edited).toBe(0);
  });

  it("compares JSON strings after their escapes: \\u002e and . are the same value", () => {
    // RFC 8259 §8.3: strings are equal when their code units are equal after escapes are read
    // ("a\\\\b" and "a\\u005Cb" are the same string).
    const before = json(listing('"3.0.1"', '"0.2.0"'), ["version"]);
    const after = json(listing('"3\\u002e0\\u002e1"', '"0.2.0"'), ["version"]);
    expect(diff(before, after, ["version"]).totals.changes.edited).toBe(0);
  });

  it("counts an edited node once, in its fold, and its parent's counts add up", () => {
    const before = json(listing('"3.0.1"', '"0.2.0"'), ["version"]);
    const after = json(listing('"3.0.1"', '"0.3.0"'), ["version"]);
    const result = diffTrees(before, after, {
      foci: [],
      budget: 3,
      importance: "depth",
      compareFields: ["version"],
    });
    expect(result.totals.changes.edited).toBe(1);
    // Budget 3 = the totals line + the root + coral-args: kelp-log is folded under coral-args.
    const coral = nodeNamed(result.view, "coral-args");
    expect(coral.hidden?.changes.edited).toBe(1);
    expect(coral.changes.edited).toBe(1);
    expect(result.view.data.changes.edited).toBe(1);
  });

  it("a node without the field reads as empty: gaining it is an edit", () => {
    const gained = (coralLicense: string) =>
      `{"name": "tidewater", "dependencies": {
        "coral-args": { "version": "3.0.1"${coralLicense} },
        "brine": { "version": "1.4.0", "license": "ISC" } } }`;
    const keep = ["version", "license"];
    const result = diff(json(gained(""), keep), json(gained(', "license": "MIT"'), keep), ["license"]);
    expect(nodeNamed(result.view, "coral-args").edits).toEqual([{ field: "license", old: "", new: "MIT" }]);
    expect(result.totals.changes.edited).toBe(1);
  });

  it("shows the edits of a node whose kind is moved, and counts it as moved", () => {
    // Rows linked by id (RFC 4180 CSV): P2 moves from A to B and its title changes.
    const csv = (title: string, parent: string) =>
      `id,parent,name,title\nR,,Root,Chief\nA,R,Ada,Lead\nB,R,Bram,Lead\nP2,${parent},Pia,${title}\n`;
    const load = (text: string) =>
      loadTree(text, { ...defaultLoadOptions, file: "org.csv", keepFields: ["title"] });
    const result = diff(load(csv("Analyst", "A")), load(csv("Senior Analyst", "B")), ["title"]);
    const pia = nodeNamed(result.view, "Pia");
    expect(pia.change).toBe("moved");
    expect(pia.edits).toEqual([{ field: "title", old: "Analyst", new: "Senior Analyst" }]);
    expect(result.totals.changes).toMatchObject({ moved: 1, edited: 0 });
    const text = renderDiffText(result.view, result.totals, { units: "plain", sizes: false, by: "id" });
    expect(text).toContain("[moved from Ada, title Analyst -> Senior Analyst] Pia");
  });

  it("prints an edit old -> new in the change tag, an empty value as (none)", () => {
    const before = json(listing('"3.0.1"', '""'), ["version"]);
    const after = json(listing('"3.0.0"', '"0.3.0"'), ["version"]);
    const result = diff(before, after, ["version"]);
    const text = renderDiffText(result.view, result.totals, {
      units: "plain",
      sizes: false,
      by: "path",
      header: { budget: 40, lines: result.selection.lines, foci: [] },
    });
    expect(text).toContain("[edited version 3.0.1 -> 3.0.0] coral-args");
    expect(text).toContain("[edited version (none) -> 0.3.0] kelp-log");
    expect(text.split("\n")[0]).toContain("2 edited");
  });

  it("with a pseudonym key, prints keyed pseudonyms of the values, never the values", () => {
    const before = json(listing('"3.0.1"', '"0.2.0"'), ["version"]);
    const after = json(listing('"3.0.0"', '"0.2.0"'), ["version"]);
    const key = "test-secret";
    const result = diff(before, after, ["version"], key);
    const text = renderDiffText(result.view, result.totals, { units: "plain", sizes: false, by: "path" });
    expect(text).not.toContain("3.0.1");
    expect(text).not.toContain("3.0.0");
    expect(text).toContain(`version ${pseudonym(key, "3.0.1")} -> ${pseudonym(key, "3.0.0")}`);
  });

  it("is FIELD_MISSING when a version keeps no such field (a path list keeps none)", () => {
    const paths = (text: string) => loadTree(text, { ...defaultLoadOptions, file: "files.paths" });
    const err = (() => {
      try {
        diff(paths("tidewater/a\ntidewater/b\n"), paths("tidewater/a\n"), ["version"]);
      } catch (e) {
        return e;
      }
    })();
    expect(err).toBeInstanceOf(EspalierError);
    expect((err as EspalierError).code).toBe("FIELD_MISSING");
    expect((err as EspalierError).details).toMatchObject({ option: "--compare-field", field: "version" });
  });
});
