import { describe, expect, it } from "vitest";
import { parseDocument } from "yaml";
import { cli } from "../helpers/cli.js";

// Field test: keys and names that YAML's core schema reads as numbers. CI matrices and tool
// configurations on this machine key by version (`3.10:`), and package lists name entries so; the
// core schema reads a plain `3.10` as the float 3.1, `0o17` as 15 and `1e3` as 1000 (YAML 1.2.2,
// 10.3.2), and a `%YAML 1.1` document reads `y` as true and gives its merge key as a symbol. Shown
// by value, `3.10` and `3.1` printed as one name twice, and a 1.1 merge key as `Symbol(<<)`, exit 0.
// Invented tidewater names; the shapes are those of the files, reduced.

interface Shown {
  name: string;
  children: Shown[];
}

const names = (node: Shown): string[] => node.children.map((c) => c.name);

describe("YAML keys and names written as numbers", () => {
  it("names children keyed by number as the keys are written, as many names as keys", async () => {
    const text = "runtimes:\n  3.10: {size: 4}\n  3.9: {size: 3}\n  0o17: {size: 2}\n  1e3: {size: 1}\n";
    // The yaml package (the registry's reference reader) reads the keys as numbers. (Beside a key
    // `3.1`, `3.10` is the same key, which it refuses: DUPLICATE_KEY.)
    const keys = Object.keys(parseDocument(text).toJS().runtimes);
    expect(keys.sort()).toEqual(["1000", "15", "3.1", "3.9"]);
    const result = await cli(["matrix.yaml", "--format", "json"], { files: { "matrix.yaml": text } });
    expect(result.code).toBe(0);
    const json = JSON.parse(result.stdout);
    expect(names(json.root)).toEqual(["3.10", "3.9", "0o17", "1e3"]);
    expect(json.totals).toMatchObject({ nodes: 5, size: 10 });
  });

  it("takes a name field written as a number as written, so two versions stay two names", async () => {
    const text = "name: tidewater\nchildren:\n  - {name: 3.10, size: 4}\n  - {name: 3.1, size: 3}\n";
    const result = await cli(["tools.yaml", "--format", "json"], { files: { "tools.yaml": text } });
    const json = JSON.parse(result.stdout);
    expect(names(json.root)).toEqual(["3.10", "3.1"]);
  });

  it("reads values under keys as written, the merge key of a %YAML 1.1 document as <<", async () => {
    const text = "%YAML 1.1\n---\nbase: &b\n  y: 1\n  n: 2\nquay:\n  <<: *b\n  3.10: 3\n";
    const result = await cli(["v11.yaml", "--format", "json"], { files: { "v11.yaml": text } });
    expect(result.code).toBe(0);
    const json = JSON.parse(result.stdout);
    expect(json.input.shape).toBe("values");
    expect(json.root.children.map(names)).toEqual([
      ["y", "n"],
      ["<<", "3.10"],
    ]);
  });

  it("names a %YAML 1.1 document's children by dates, octal and base-60 numbers as written", async () => {
    // YAML 1.1 reads `2024-01-05` as a timestamp, `0777` as 511 and `1:20` as 80 (yaml.org/type/
    // timestamp.html, int.html); main printed the date key as the engine's long date text.
    const keyed =
      "%YAML 1.1\n---\nreleases:\n  2024-01-05: {size: 3}\n  0777: {size: 1}\n  1:20: {size: 1}\n";
    const named =
      "%YAML 1.1\n---\nname: log\nchildren:\n  - {name: 2024-01-05, size: 1}\n  - {name: 0777, size: 1}\n";
    const files = { "keyed.yaml": keyed, "named.yaml": named };
    const byKey = JSON.parse((await cli(["keyed.yaml", "--format", "json"], { files })).stdout);
    expect(names(byKey.root)).toEqual(["2024-01-05", "0777", "1:20"]);
    const byName = await cli(["named.yaml", "--format", "json"], { files });
    expect(byName.code).toBe(0);
    expect(names(JSON.parse(byName.stdout).root)).toEqual(["2024-01-05", "0777"]);
  });

  it("links rows by ids written with leading zeros, as written, the size still read as a number", async () => {
    // UN M.49 area codes are three digits, `001` the world, `019` the Americas (UN Statistics Division,
    // "Standard country or area codes for statistical use", from memory); written plain in YAML they
    // are the integers 1 and 19, and the rows printed as `1 / 19`.
    const text =
      '- {id: 001, parent: "", name: World}\n- {id: 019, parent: 001}\n- {id: 3.10, parent: 019, size: 0x10}\n';
    const result = await cli(["areas.yaml", "--format", "json"], { files: { "areas.yaml": text } });
    expect(result.code).toBe(0);
    const json = JSON.parse(result.stdout);
    expect(json.input.linkedBy).toEqual(["id", "parent"]);
    expect(json.root.name).toBe("World");
    expect(names(json.root)).toEqual(["019"]);
    expect(names(json.root.children[0])).toEqual(["3.10"]);
    expect(json.totals).toMatchObject({ nodes: 3, size: 16 });
    // A parent written as the number without its zeros names no row: said, not linked by value.
    const other = await cli(["areas.yaml"], {
      files: { "areas.yaml": text.replace("parent: 001", "parent: 1") },
    });
    expect(other.code).toBe(2);
    expect(other.stderr).toContain("[MISSING_PARENT]");
  });

  it("finds a --start-at pointer by the key as written", async () => {
    const text =
      "runtimes:\n  3.10:\n    name: quay\n    children: [{name: tern, size: 2}]\n  3.9: {name: gull}\n";
    const result = await cli(["matrix.yaml", "--start-at", "/runtimes/3.10", "--format", "json"], {
      files: { "matrix.yaml": text },
    });
    expect(result.code).toBe(0);
    const json = JSON.parse(result.stdout);
    expect(json.root.name).toBe("quay");
    expect(names(json.root)).toEqual(["tern"]);
  });
});

// The merge type (yaml.org/type/merge.html): `<<: *base` gives a mapping the keys of `base` it does not
// have. The tree reading applied it; read as a graph (`--graph`), the document went through the yaml
// package's conversion with YAML 1.2's default of no merge keys, so a merged children list and size were
// lost, exit 0.
describe("YAML merge keys in a graph", () => {
  it("gives an adjacency map's record the children and size it merges in", async () => {
    const text = [
      "defaults: &d",
      "  children: [gull, tern]",
      "  size: 5",
      "harbor:",
      "  <<: *d",
      "  name: Harbor",
      "quay:",
      "  children: [harbor]",
      "",
    ].join("\n");
    const result = await cli(["berths.yaml", "--graph", "--format", "json"], {
      files: { "berths.yaml": text },
    });
    expect(result.code).toBe(0);
    const json = JSON.parse(result.stdout);
    const quay = json.root.children.find((c: Shown) => c.name === "quay");
    const harbor = quay.children[0];
    expect(harbor).toMatchObject({ name: "Harbor", size: 5, nodes: 3 });
    expect(names(harbor)).toEqual(["gull", "tern"]);
    // defaults and harbor, 5 each; gull and tern counted once.
    expect(json.totals).toMatchObject({ nodes: 6, size: 10 });
  });

  it("gives rows read as a graph the fields they merge in, as the tree reading does", async () => {
    const text =
      '- &base {id: a, parent: "", size: 3}\n- {<<: *base, id: b, parent: a}\n- {<<: *base, id: c, parent: a}\n';
    const files = { "rows.yaml": text };
    const tree = JSON.parse((await cli(["rows.yaml", "--format", "json"], { files })).stdout);
    const graph = JSON.parse((await cli(["rows.yaml", "--graph", "--format", "json"], { files })).stdout);
    expect(tree.totals).toMatchObject({ nodes: 3, size: 9 });
    expect(graph.totals).toEqual(tree.totals);
  });

  it("reads an adjacency map's ids written as numbers as written, the sizes as numbers", async () => {
    // UN M.49 codes (from memory, as above): the world 001 holds the Americas 019 and Asia 142; by
    // value the ids were 1, 19 and 142, and printed so.
    const text = "001: {children: [019, 142]}\n019: {children: [021], size: 0x10}\n142: [030]\n";
    const result = await cli(["areas.yaml", "--graph", "--format", "json"], {
      files: { "areas.yaml": text },
    });
    expect(result.code).toBe(0);
    const json = JSON.parse(result.stdout);
    expect(json.root.name).toBe("001");
    expect(names(json.root)).toEqual(["019", "142"]);
    expect(json.root.children.map(names)).toEqual([["021"], ["030"]]);
    expect(json.totals).toMatchObject({ nodes: 5, size: 16 });
  });

  it("refuses a merge key that names no mapping, at the key", async () => {
    const text = "a: {children: [b]}\nb:\n  <<: 5\n";
    const result = await cli(["bad.yaml", "--graph"], { files: { "bad.yaml": text } });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe("");
    expect(result.stderr).toMatch(/bad\.yaml:3:3: .*\[SHAPE\]/);
  });
});

// A command definition file of a cloud CLI on this machine: a list of release tracks, the later ones
// `<<: *GA` merging the first's keys (help text, arguments) and overriding a few. Read as values, the
// merge key is a node `<<` holding the alias as text; the note counted aliases but did not say that the
// merged keys were missing from the mapping a YAML 1.1 reader gives them.
describe("YAML merge keys read as values", () => {
  it("says how many merge keys name an alias, whose keys show at their anchor only", async () => {
    const text = [
      "- &GA",
      "  tracks: [GA]",
      "  help: Deletes a berth.",
      "  request: {collection: berths, method: delete}",
      "- <<: *GA",
      "  tracks: [BETA]",
      "- <<: [*GA]",
      "  tracks: [ALPHA]",
      "- tracks: *GA",
      "",
    ].join("\n");
    const result = await cli(["delete.yaml", "--format", "json"], { files: { "delete.yaml": text } });
    expect(result.code).toBe(0);
    const json = JSON.parse(result.stdout);
    // The two later items hold their own keys and the `<<` entry, not the merged help and request.
    expect(json.root.children.slice(1, 3).map(names)).toEqual([
      ["<<", "tracks"],
      ["<<", "tracks"],
    ]);
    const [note] = json.input.notes;
    expect(note).toMatchObject({ code: "ALIASES_AS_TEXT", count: 3, line: 5 });
    expect(note.message).toMatch(/\b2 merge keys \(<<\)/);
    expect(result.stderr).toMatch(/\b2 merge keys \(<<\)/);
  });
});

// `!!omap` and `!!pairs` (YAML 1.1 types, yaml.org/type/omap.html, which the yaml package reads in any
// document): the parser gives the list's `- key: value` items as bare pairs, which were read as leaves of
// 0 bytes, their keys and values missing from every count, exit 0.
describe("YAML ordered maps read as values", () => {
  it("reads each `- key: value` item as the one-key mapping it is written as", async () => {
    const text = "berths: !!omap\n  - quay: 3\n  - tern: {depth: 12}\nspare: !!set\n  ? gull\n";
    const result = await cli(["berths.yaml", "--format", "json"], { files: { "berths.yaml": text } });
    expect(result.code).toBe(0);
    const json = JSON.parse(result.stdout);
    const [berths] = json.root.children;
    expect(berths.children.map(names)).toEqual([["quay"], ["tern"]]);
    // root, berths, 2 items, quay, tern, depth, spare, gull; the same count by PyYAML's events
    // (common practice, no source: one node per mapping value and sequence item, and the root).
    expect(json.totals.nodes).toBe(9);
    // `quay: 3` and `tern: {depth: 12}` as written.
    expect(berths.children.map((c: { size: number }) => c.size)).toEqual([7, 17]);
    expect(json.totals.size).toBe(text.length);
  });
});
