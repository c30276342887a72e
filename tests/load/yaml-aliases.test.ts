import { describe, expect, it } from "vitest";
import { parseDocument, visit } from "yaml";
import { prepareDiff } from "../../src/diff/diff-trees.js";
import { loadTree } from "../../src/load/index.js";
import { measure } from "../../src/model/measure.js";
import { showNote } from "../../src/model/reading-note.js";
import type { Tree } from "../../src/model/tree.js";
import { opts, outline } from "./helpers.js";

// YAML aliases (YAML 1.2.2, yaml.org/spec/1.2.2). §3.2.2.2 "Anchors and Aliases": in the representation
// graph a node may appear in more than one collection; when serialized, its first occurrence is
// identified by an anchor and each subsequent occurrence is an alias node referring back to that anchor.
// §7.1 "Alias Nodes": an alias (`*name`) refers to the most recent preceding node having the same
// anchor. (Wording paraphrased from the spec, checked from memory.)
//
// espalier's decision: read as nodes, a node object or children list reached again through an alias is
// the SAME node: one full entry where the walk first reaches it, and a one-line reference (`&`) at
// every other place, adding nothing to any count or size. Read as values, an alias is a leaf of its own
// text (`*name`, its own bytes): a value tree counts bytes where they are written.

const yaml = (text: string, overrides = {}) => loadTree(text, opts({ format: "yaml", ...overrides }));
const references = (tree: Tree) => {
  const out: [string, string][] = [];
  for (let s = 0; s < tree.length; s++) {
    const to = tree.referenceTo?.[s] ?? -1;
    if (to !== -1) out.push([tree.name.get(s), tree.name.get(to)]);
  }
  return out;
};

/**
 * Distinct node objects by the yaml package's own reading (a reference library from the registry):
 * its toJS() gives one JS object per representation-graph node, shared by every alias of it, so
 * counting distinct objects reached through `children` counts each node once.
 */
function distinctNodes(text: string): { nodes: number; size: number } {
  const value = parseDocument(text).toJS() as Record<string, unknown>;
  const seen = new Set<object>();
  let size = 0;
  const stack: unknown[] = [value];
  while (stack.length > 0) {
    const node = stack.pop() as Record<string, unknown>;
    if (seen.has(node)) continue;
    seen.add(node);
    if (typeof node.size === "number") size += node.size;
    const children = node.children;
    if (Array.isArray(children)) stack.push(...children);
    else if (children && typeof children === "object") stack.push(...Object.values(children));
  }
  return { nodes: seen.size, size };
}

describe("YAML aliases read as nodes: one entry, references elsewhere (YAML 1.2.2 §3.2.2.2, §7.1)", () => {
  const SHARED = [
    "name: quillfeather",
    "children:",
    "  - &gauge {name: gauge, size: 5, children: [{name: dial, size: 2}]}",
    "  - name: ledger",
    "    children: [*gauge, {name: brine, size: 1}]",
    "  - *gauge",
    "",
  ].join("\n");

  it("an alias used twice is the same node: one full entry, two references, counted once", () => {
    const tree = yaml(SHARED);
    expect(outline(tree)).toEqual([
      "quillfeather 0",
      "  gauge 5",
      "    dial 2",
      "  ledger 0",
      "    gauge 0",
      "    brine 1",
      "  gauge 0",
    ]);
    expect(references(tree)).toEqual([
      ["gauge", "gauge"],
      ["gauge", "gauge"],
    ]);
    const m = measure(tree);
    // Independent count: the yaml package's own object graph, each node once.
    expect({ nodes: m.nodes[0], size: m.size[0] }).toEqual(distinctNodes(SHARED));
    expect(m.nodes[0]).toBe(5);
    expect(m.size[0]).toBe(8);
  });

  it("an alias refers to the most recent preceding node with its anchor (§7.1), even when redefined", () => {
    const text = [
      "name: r",
      "children:",
      "  - &x {name: first, size: 1}",
      "  - &x {name: second, size: 2}",
      "  - *x",
      "",
    ].join("\n");
    const tree = yaml(text);
    expect(references(tree)).toEqual([["second", "second"]]);
    expect(measure(tree).size[0]).toBe(3);
    expect(measure(tree).nodes[0]).toEqual(distinctNodes(text).nodes);
  });

  it("one children list used by two nodes: the second holds one reference per child, keys kept", () => {
    const text = [
      "name: r",
      "children:",
      "  - name: a",
      "    children: &kids {x: 1, y: {size: 3}}",
      "  - name: b",
      "    children: *kids",
      "",
    ].join("\n");
    const tree = yaml(text);
    expect(outline(tree)).toEqual(["r 0", "  a 0", "    x 1", "    y 3", "  b 0", "    x 0", "    y 0"]);
    expect(references(tree)).toEqual([
      ["x", "x"],
      ["y", "y"],
    ]);
    const m = measure(tree);
    expect({ nodes: m.nodes[0], size: m.size[0] }).toEqual({ nodes: 5, size: 4 });
    // b holds no node of its own below it: its subtree is itself.
    expect(m.nodes[4]).toBe(1);
  });

  it("keyed children that alias one node keep their own keys and point at the entry", () => {
    const text = "name: r\nchildren:\n  make: &env {children: {a: 1, b: 2}}\n  pl: *env\n  test: *env\n";
    const tree = yaml(text);
    expect(outline(tree)).toEqual(["r 0", "  make 0", "    a 1", "    b 2", "  pl 0", "  test 0"]);
    expect(references(tree)).toEqual([
      ["pl", "make"],
      ["test", "make"],
    ]);
    expect(measure(tree).size[0]).toBe(3);
  });

  it("a node that aliases its own ancestor is a reference back up (a cycle), not an error", () => {
    const tree = yaml("&r\nname: r\nsize: 1\nchildren: [*r, {name: a, size: 2}]\n");
    expect(outline(tree)).toEqual(["r 1", "  r 0", "  a 2"]);
    expect(tree.referenceTo?.[1]).toBe(0);
    expect(measure(tree).nodes[0]).toBe(2);
  });

  it("a tree without a reused alias has no references (and an alias used once is the node itself)", () => {
    const text = "templates:\n  probe: &probe {name: probe, size: 2}\nname: lab\nchildren: [*probe]\n";
    const tree = yaml(text);
    expect(tree.referenceTo).toBeUndefined();
    expect(outline(tree)).toEqual(["lab 0", "  probe 2"]);
  });
});

describe("YAML aliases read as values: a leaf of its own text", () => {
  it("sizes an alias by the bytes of `*name` and the root by the document's bytes", () => {
    const text = "base: &b {x: 1}\none: *b\ntwo: *b\n";
    const tree = yaml(text, { readAs: "values" });
    expect(tree.referenceTo).toBeUndefined();
    expect(outline(tree)).toEqual([
      `(root) ${Buffer.byteLength(text) - 6 - 2 - 2}`,
      "  base 5", // "{x: 1}" is 6 bytes, 1 of them its child's
      "    x 1",
      "  one 2",
      "  two 2",
    ]);
    // The bytes are where they are written: the whole document ("*b" twice, 2 bytes each).
    expect(measure(tree).size[0]).toBe(Buffer.byteLength(text));
  });

  it("says in an ALIASES_AS_TEXT note how many aliases were read as text, and where the first is", async () => {
    // Field test: a resource file of an invented tidewater tool; `- *project` stood on screen as a leaf
    // of 9 bytes (`0  9 B`) though it names a whole mapping, with nothing said.
    const text = [
      "project: &project",
      "  name: project",
      "  help: the tidewater project",
      "instance:",
      "  attributes:",
      "    - *project",
      "    - name: instance",
      "  merged:",
      "    <<: *project",
      "",
    ].join("\n");
    // Alias nodes as the yaml package (a reference library from the registry) finds them: YAML 1.2.2
    // §7.1, an alias node is `*` followed by the anchor's name.
    let expected = 0;
    visit(parseDocument(text), { Alias: () => void expected++ });
    expect(expected).toBe(2);
    const tree = yaml(text, { readAs: "values" });
    expect(tree.reading?.notes?.map((note) => showNote(note))).toEqual([
      {
        code: "ALIASES_AS_TEXT",
        line: 6,
        count: expected,
        message: expect.stringMatching(
          new RegExp(
            `^${expected} YAML aliases are read as leaves of their own text \\(the first: \\*project, node "\\(root\\)/instance/attributes/0"\\)`,
          ),
        ),
      },
    ]);
    const { cli } = await import("../helpers/cli.js");
    const shown = await cli(["-", "--input-format", "yaml", "--read-as", "values"], { stdin: text });
    expect(shown.code).toBe(0);
    expect(shown.stderr).toMatch(
      /^espalier: note: <stdin>:6: 2 YAML aliases are read as leaves .*\*project, .*\[ALIASES_AS_TEXT\]\n$/,
    );
    // No alias, no note.
    expect(yaml("a: 1\nb: [2, 3]\n", { readAs: "values" }).reading?.notes).toBeUndefined();
  });
});

describe("espalier diff of YAML documents with reused aliases", () => {
  // Two versions of an invented tidewater document: the anchored ledger's child grows, and a third
  // parent starts using the alias. Read as nodes, each version has references (aliases) and no ids.
  const before = [
    "name: tidewater",
    "children:",
    "  - &ledger {name: ledger, size: 10, children: [{name: book, size: 5}]}",
    "  - name: harbor",
    "    children: [*ledger]",
    "  - name: quay",
    "    size: 3",
    "",
  ].join("\n");
  const after = before
    .replace("{name: book, size: 5}", "{name: book, size: 7}")
    .replace("    size: 3\n", "    size: 3\n    children: [*ledger]\n");

  it("compares them as graphs by path: the full entry's change once, a new alias use as linked", () => {
    const diff = prepareDiff(yaml(before), yaml(after));
    // Totals as the yaml package reads each version (distinct nodes, each size once).
    expect(diff.totals.old).toEqual(distinctNodes(before));
    expect(diff.totals.new).toEqual(distinctNodes(after));
    expect(diff.totals.old).toEqual({ nodes: 5, size: 18 });
    expect(diff.totals.changes).toMatchObject({ resized: 1, linked: 1, added: 0, removed: 0, unlinked: 0 });
    expect(diff.totals.delta).toBe(2);
  });

  it("prints the diff by path, with --fail-on-change status 1, and none for equal versions", async () => {
    const { cli } = await import("../helpers/cli.js");
    const files = { "a.yaml": before, "b.yaml": after };
    const result = await cli(["diff", "a.yaml", "b.yaml", "--fail-on-change"], { files });
    expect(result.stderr).toBe("");
    expect(result.code).toBe(1);
    expect(result.stdout.split("\n")[0]).toMatch(
      /^diff by path: .*1 resized, 1 linked, 0 unlinked; 5 -> 5 nodes, size 18 -> 20 \(net \+2\)/,
    );
    expect(result.stdout).toContain("& [linked] ledger  full entry at ledger");
    const same = await cli(["diff", "a.yaml", "a.yaml", "--fail-on-change"], { files });
    expect(same.code, same.stderr).toBe(0);
    // Read as values, an alias is a leaf of its own text, as before.
    const values = await cli(["diff", "a.yaml", "b.yaml", "--read-as", "values", "--fail-on-change"], {
      files,
    });
    expect(values.code, values.stderr).toBe(1);
  });
});

describe("espalier diff of YAML documents: an alias under a renamed key", () => {
  // Invented tidewater document: harbor holds the anchored ledger under its own key, by an alias. The
  // key names the reference's line (`& ledger-link  full entry at ledger`), so another key is a change.
  const before = [
    "name: tidewater",
    "children:",
    "  ledger: &ledger {size: 10, children: {book: 5}}",
    "  harbor:",
    "    size: 2",
    "    children:",
    "      ledger-link: *ledger",
    "",
  ].join("\n");
  const after = before.replace("ledger-link: *ledger", "ledger-ref: *ledger");

  it("counts it as renamed, with nothing else changed and the totals as before", () => {
    const diff = prepareDiff(yaml(before), yaml(after));
    expect(diff.totals.changes).toMatchObject({
      renamed: 1,
      added: 0,
      removed: 0,
      moved: 0,
      resized: 0,
      linked: 0,
      unlinked: 0,
    });
    expect(diff.totals.old).toEqual(diff.totals.new);
    expect(diff.totals.delta).toBe(0);
  });

  it("prints it renamed from the old key, and --fail-on-change fails", async () => {
    const { cli } = await import("../helpers/cli.js");
    const result = await cli(["diff", "a.yaml", "b.yaml", "--fail-on-change"], {
      files: { "a.yaml": before, "b.yaml": after },
    });
    expect(result.stderr).toBe("");
    expect(result.code).toBe(1);
    expect(result.stdout.split("\n")[0]).toMatch(/^diff by path: .*1 renamed,/);
    expect(result.stdout).toMatch(/& \[renamed from ledger-link\] ledger-ref {2}full entry at ledger/);
  });

  it("stays no change when only the anchor's name is another (`&ledger` to `&books`)", async () => {
    const renamedAnchor = before.replace("&ledger", "&books").replace("*ledger", "*books");
    const diff = prepareDiff(yaml(before), yaml(renamedAnchor));
    expect(Object.values(diff.totals.changes).every((c) => c === 0)).toBe(true);
  });
});
