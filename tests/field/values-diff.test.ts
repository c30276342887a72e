import { describe, expect, it } from "vitest";
import { defaultLoadOptions, loadTree } from "../../src/load/index.js";
import { SCALAR_VALUE_FIELD } from "../../src/load/load-options.js";
import { loadTreeFromStream } from "../../src/load/stream/index.js";
import { cli } from "../helpers/cli.js";

// Field test: two versions of a service description (a cloud SDK's 3 MiB API model on this machine,
// reduced to an invented harbor-api document) in which one string changed to another of the same
// length ("ec2" -> "ec3"). A document read as values has nodes named by keys and sized by bytes only,
// so `espalier diff --fail-on-change` said "0 edited, 0 resized" and exited 0: a silent pass. A diff
// now compares the scalars' text of two documents read as values (header: "compared: value").
const oldJson = `{"metadata": {"apiVersion": "2031-04-01", "endpointPrefix": "ec2", "protocol": "query"},
 "operations": {"ListQuays": {"http": {"method": "GET"}}}}
`;
const newJson = oldJson.replace('"ec2"', '"ec3"');

describe("diff of two documents read as values", () => {
  it("a value changed to one of the same length is an edit, seen by --fail-on-change", async () => {
    const files = { "old.json": oldJson, "new.json": newJson };
    const r = await cli(["diff", "old.json", "new.json", "--fail-on-change", "--width", "200"], { files });
    expect(r.code).toBe(1);
    expect(r.stderr).toBe("");
    // Common practice, no source: a changed value is a change. The node's path is its RFC 6901 JSON
    // Pointer without the leading "/" (metadata/endpointPrefix).
    expect(r.stdout.split("\n")[0]).toMatch(/ 1 edited \(compared: value\), 0 resized;/);
    expect(r.stdout).toContain(': [edited value "ec2" -> "ec3"] endpointPrefix  5 B\n');
    const json = await cli(["diff", "old.json", "new.json", "--format", "json"], { files });
    const doc = JSON.parse(json.stdout);
    expect(doc.compared).toEqual(["value"]);
    expect(doc.changes.edited).toBe(1);
  });

  it("YAML read as values too; the same document twice is no change", async () => {
    const a = 'ledger:\n  region: eu-west\n  replicas: 3\n  tags: [a, "b"]\n';
    const b = 'ledger:\n  region: eu-east\n  replicas: 4\n  tags: [a, "c"]\n';
    const files = { "a.yaml": a, "b.yaml": b };
    const r = await cli(["diff", "a.yaml", "b.yaml", "--read-as", "values", "--fail-on-change", "--bare"], {
      files,
    });
    expect(r.code).toBe(1);
    // YAML 1.2 (§7.3.3 plain scalars, §7.3.2 double-quoted): a plain and a quoted string are both
    // strings, compared by value and shown as JSON writes them; a number as written.
    expect(r.stdout).toContain('[edited value "eu-west" -> "eu-east"] region');
    expect(r.stdout).toContain("[edited value 3 -> 4] replicas");
    expect(r.stdout).toContain('[edited value "b" -> "c"] 1');
    const same = await cli(["diff", "a.yaml", "a.yaml", "--read-as", "values", "--fail-on-change"], {
      files,
    });
    expect(same.code).toBe(0);
  });

  it("values, not spellings: JSON escapes, and the same values in JSON and YAML, are no edit", async () => {
    const files = {
      "a.json": '{"ledger": {"region": "eu-west", "replicas": 3, "on": true, "tags": ["a", null]}}',
      // RFC 8259 §7: "\u0061" is the string "a".
      "b.json": '{"ledger": {"region": "eu-west", "replicas": 3, "on": true, "tags": ["\\u0061", null]}}',
      // YAML 1.2 core schema (§10.3.2): true and null are the booleans and null of JSON.
      "c.yaml": "ledger:\n  region: 'eu-west'\n  replicas: 3\n  on: true\n  tags: [a, null]\n",
    };
    for (const other of ["b.json", "c.yaml"]) {
      const r = await cli(["diff", "a.json", other, "--read-as", "values", "--format", "json"], { files });
      expect(JSON.parse(r.stdout).changes.edited).toBe(0);
    }
  });

  it("an array changed to an object (or back) is an edit, even empty and of the same length", async () => {
    // Field test: `env: []` -> `env: {}` in a deployment file gave "0 edited, 0 resized" and exit 0
    // under --fail-on-change (both 2 bytes, no members). RFC 8259 §4-§5 and YAML 1.2 §3.2.1.1: an
    // object (mapping) and an array (sequence) are two kinds of value.
    const files = {
      "a.yaml": "harbor:\n  env: []\n  ports: [80]\n",
      "b.yaml": "harbor:\n  env: {}\n  ports: {0: 80}\n",
      "a.json": '{"env": [], "ports": [80]}',
      "c.json": '{"env": {}, "ports": [80]}',
    };
    const yaml = await cli(
      ["diff", "a.yaml", "b.yaml", "--read-as", "values", "--fail-on-change", "--bare"],
      {
        files,
      },
    );
    expect(yaml.code).toBe(1);
    expect(yaml.stdout).toContain("[edited value [] -> {}] env");
    // Sized by values (no own size for an object or an array), `ports` keeps its size: its one member, 80.
    expect(yaml.stdout).toContain("[edited value [] -> {}] ports  2 nodes, 2 B");
    const json = await cli(["diff", "a.json", "c.json", "--fail-on-change", "--format", "json"], { files });
    expect(json.code).toBe(1);
    expect(JSON.parse(json.stdout).changes.edited).toBe(1);
    // The same kinds in JSON and YAML are no edit: the kind is compared, not how it is written.
    const same = await cli(["diff", "a.json", "a.yaml", "--read-as", "values", "--format", "json"], {
      files: { ...files, "a.yaml": "env: []\nports:\n  - 80\n" },
    });
    expect(JSON.parse(same.stdout).changes.edited).toBe(0);
  });

  it("a summary keeps no values; a load asked to keeps each scalar's source text, the same in chunks", async () => {
    const plain = loadTree(oldJson, { ...defaultLoadOptions, readAs: "values" });
    expect(plain.fields.size).toBe(0);
    const kept = loadTree(oldJson, { ...defaultLoadOptions, readAs: "values", keepScalars: true });
    const values = kept.fields.get(SCALAR_VALUE_FIELD) ?? [];
    // RFC 8259 §7: a string's value, written back as JSON; an object keeps only its kind, "{}".
    expect(values).toEqual(["{}", "{}", '"2031-04-01"', '"ec2"', '"query"', "{}", "{}", "{}", '"GET"']);
    const bytes = Buffer.from(oldJson, "utf8");
    for (const cut of [1, 40, 47, 48, 49, 70]) {
      const chunks = async function* () {
        yield bytes.subarray(0, cut);
        yield bytes.subarray(cut);
      };
      const streamed = await loadTreeFromStream(chunks(), {
        ...defaultLoadOptions,
        readAs: "values",
        keepScalars: true,
      });
      expect(streamed.fields.get(SCALAR_VALUE_FIELD)).toEqual(values);
    }
  });
});

describe("diff of two lists (documents read as values)", () => {
  // Field test: a gateway's routes, an element put first in the list. Elements are named by their index
  // (RFC 6901: the JSON Pointer of an array element is its index), so by index every later element
  // paired with its predecessor: "9 edited, 4 added" for one route added, each field of two routes
  // "edited" to the other's values. (Read as nodes, such a list is children named by `name` already.)
  // Now a list's elements are aligned as a line diff aligns lines (a longest common subsequence of each
  // element's `name`, or of its whole value), and the order stays part of the value: RFC 8259 §5, an
  // array is an ordered sequence of values.
  const routes = (names: string[]) =>
    `routes:\n${names.map((n) => `  - name: ${n}\n    path: /${n}\n    timeout: ${n.length}\n`).join("")}`;
  const files = {
    "a.yaml": routes(["ledger", "harbour", "kelp"]),
    "b.yaml": routes(["audit", "ledger", "harbour", "kelp"]),
    "c.yaml": routes(["harbour", "kelp", "ledger"]),
    "a.json": JSON.stringify({ routes: ["ledger", "harbour", "kelp"].map((n) => ({ name: n, timeout: 1 })) }),
    "d.json": JSON.stringify({
      routes: ["ledger", "kelp"].map((n) => ({ name: n, timeout: n === "kelp" ? 2 : 1 })),
    }),
  };
  const changes = async (a: string, b: string, more: Record<string, string> = {}) => {
    const r = await cli(["diff", a, b, "--read-as", "values", "--format", "json"], {
      files: { ...files, ...more },
    });
    return JSON.parse(r.stdout).changes;
  };

  it("an element put first is one element added, the others unchanged", async () => {
    const r = await cli(
      ["diff", "a.yaml", "b.yaml", "--read-as", "values", "--format", "json", "--fail-on-change"],
      { files },
    );
    expect(r.code).toBe(1);
    const doc = JSON.parse(r.stdout);
    // Expected from the two lists: the element audit and its 3 members are new; no other value changed.
    expect(doc.changes).toEqual({ added: 4, removed: 0, moved: 0, renamed: 0, edited: 0, resized: 0 });
    const added = doc.root.children[0].children.filter((c: { change: string }) => c.change === "added");
    expect(added.map((c: { path: string }) => c.path)).toEqual(["routes/0"]);
  });

  it("an element taken out is removed with its members; one whose value changed is edited", async () => {
    // harbour (its name and timeout) removed; kelp's timeout 1 -> 2 is its own edit.
    expect(await changes("a.json", "d.json")).toMatchObject({ added: 0, removed: 3, edited: 1 });
    const text = await cli(["diff", "a.json", "d.json", "--read-as", "values", "--bare"], { files });
    expect(text.stdout).toContain("[edited value 1 -> 2] timeout");
  });

  it("a new order is a change: the element that left its place is removed there and added at the new one", async () => {
    // As a line diff shows a moved line: ledger after harbour and kelp (4 nodes each way).
    const r = await cli(["diff", "a.yaml", "c.yaml", "--read-as", "values", "--fail-on-change", "--bare"], {
      files,
    });
    expect(r.code).toBe(1);
    expect(await changes("a.yaml", "c.yaml")).toMatchObject({ added: 4, removed: 4, edited: 0 });
    expect(r.stdout).toContain("[removed] 0 name=ledger");
    expect(r.stdout).toContain("[added] 2 name=ledger");
  });

  it("elements without a name are aligned by their values: scalars, objects, a YAML stream's documents", async () => {
    const more = {
      "p.yaml": "ports: [80, 443]\n",
      "q.yaml": "ports: [8080, 80, 443]\n",
      "r.yaml": "ports: [443, 80]\n",
      "u.json": '[{"a": 1}, {"a": 2}]',
      "v.json": '[{"a": 0}, {"a": 1}, {"a": 3}]',
      // YAML 1.2 §9.2: a stream of documents, each a child of the root here, named by its index.
      "s.yaml": "kind: Service\nspec: {port: 80}\n---\nkind: Deployment\nspec: {replicas: 2}\n",
      "t.yaml":
        "kind: ConfigMap\ndata: {MODE: prod}\n---\nkind: Service\nspec: {port: 80}\n---\nkind: Deployment\nspec: {replicas: 3}\n",
    };
    // 8080 put first: one element added (by index: 2 edited and 1 added).
    expect(await changes("p.yaml", "q.yaml", more)).toMatchObject({ added: 1, removed: 0, edited: 0 });
    // Two ports swapped: a new order, 80 removed before 443 and added after it.
    expect(await changes("p.yaml", "r.yaml", more)).toMatchObject({ added: 1, removed: 1, edited: 0 });
    // {"a": 0} put first ({"a": 0} and its member added); {"a": 2} -> {"a": 3} between aligned
    // elements is that element edited.
    expect(await changes("u.json", "v.json", more)).toMatchObject({ added: 2, removed: 0, edited: 1 });
    // A document put first: its 4 nodes added; the Deployment's replicas 2 -> 3 its one edit.
    expect(await changes("s.yaml", "t.yaml", more)).toMatchObject({ added: 4, removed: 0, edited: 1 });
  });

  it("--label '{name} {value}' shows what an element added or removed held, which its index does not", async () => {
    // Field test: a CI workflow's version matrix on this machine (a vendored project's ci.yml) with its
    // first entry dropped printed "[removed -5 B] 0" above ". 0": the removed element and the new first
    // one are both named 0, by index (RFC 6901).
    const more = { "m.yaml": 'versions: ["3.8", "3.9", "3.10"]\n', "n.yaml": 'versions: ["3.9", "3.10"]\n' };
    const r = await cli(["diff", "m.yaml", "n.yaml", "--bare", "--label", "{name} {value}"], {
      files: { ...files, ...more },
    });
    expect(r.stdout).toContain(': [removed -5 B] 0 "3.8"\n');
    expect(r.stdout).toContain('. 0 "3.9"  5 B\n');
  });
});

describe("diff of one document written two ways (read as values)", () => {
  // Field test: an invented gateway's configuration as indented JSON, compact JSON (JSON.stringify
  // without spaces) and YAML of the same data. Sized by their bytes, every object and array whose
  // layout changed was "resized" ("6 resized" compact against indented, "16 resized" YAML against
  // JSON) and --fail-on-change exited 1 with no value changed. RFC 8259 §2: white space around
  // structural characters is insignificant; YAML 1.2 §3.2.3: presentation details (indentation, styles,
  // comments) are not part of the content.
  const config = {
    service: "tern-gateway",
    replicas: 3,
    debug: false,
    owner: null,
    routes: [
      { name: "ledger", path: "/ledger", timeout: 30 },
      { name: "harbour", path: "/harbour", timeout: 15 },
    ],
    tags: ["edge", "public"],
  };
  const yaml = `# tern-gateway, reviewed weekly
service: tern-gateway
replicas: 3
debug: false
owner: null
routes:
  - name: ledger
    path: /ledger
    timeout: 30
  - {name: harbour, path: '/harbour', timeout: 15}
tags: [edge, "public"]
`;
  const files = {
    "indented.json": JSON.stringify(config, null, 2),
    "compact.json": JSON.stringify(config),
    "config.yaml": yaml,
    "grown.json": JSON.stringify({ ...config, tags: ["edge", "public", "v2"] }),
  };

  for (const [a, b] of [
    ["indented.json", "compact.json"],
    ["compact.json", "config.yaml"],
    ["config.yaml", "indented.json"],
  ]) {
    it(`${a} against ${b}: no change, exit 0 under --fail-on-change`, async () => {
      const r = await cli(["diff", a, b, "--fail-on-change", "--format", "json"], { files });
      expect(r.code).toBe(0);
      const doc = JSON.parse(r.stdout);
      expect(doc.changes).toEqual({ added: 0, removed: 0, moved: 0, renamed: 0, edited: 0, resized: 0 });
      expect(doc.totals.old.size).toBe(doc.totals.new.size);
    });
  }

  it("sizes are the values' text as JSON writes it; the header and key call them value size", async () => {
    const r = await cli(["diff", "config.yaml", "grown.json", "--format", "json"], { files });
    const doc = JSON.parse(r.stdout);
    // Each scalar's JSON text (RFC 8259 §7: a string with its quotes), objects and arrays none:
    // "tern-gateway" 14, 3 1, false 5, null 4, "ledger" 8, "/ledger" 9, 30 2, "harbour" 9,
    // "/harbour" 10, 15 2, "edge" 6, "public" 8 = 78 bytes; NEW adds "v2", 4.
    expect(doc.totals.old.size).toBe(78);
    expect(doc.totals.new.size).toBe(82);
    expect(doc.totals.delta).toBe(4);
    expect(doc.changes).toMatchObject({ added: 1, resized: 0 });
    const text = await cli(["diff", "config.yaml", "grown.json"], { files });
    const [header, key] = text.stdout.split("\n");
    expect(header).toContain(", value size 78 B -> 82 B (net +4 B);");
    expect(key).toContain("a value size: NEW's");
  });

  it("every output says the sizes are value sizes: --legend, Markdown's legend and JSON's sizes field", async () => {
    // The header's own words are the reference: `value size 78 B -> 82 B` (the test above).
    const json = JSON.parse(
      (await cli(["diff", "config.yaml", "grown.json", "--format", "json"], { files })).stdout,
    );
    expect(json.sizes).toBe("values");
    const legend = await cli(["diff", "config.yaml", "grown.json", "--legend", "--width", "50"], { files });
    const lines = legend.stdout.trimEnd().split("\n");
    // A legend line wraps at spaces, its further lines indented two columns: read as one.
    const unwrapped = legend.stdout.replaceAll("\n  ", " ");
    expect(unwrapped).toContain("a value size: NEW's own");
    expect(unwrapped).not.toMatch(/\ba size:/);
    // The budget counted the legend's lines as printed (wrapped at 50 columns), as JSON's lines says.
    const counted = await cli(
      ["diff", "config.yaml", "grown.json", "--legend", "--width", "50", "--format", "json"],
      { files },
    );
    expect(JSON.parse(counted.stdout).lines).toBe(lines.length);
    const markdown = await cli(["diff", "config.yaml", "grown.json", "--legend", "--format", "markdown"], {
      files,
    });
    expect(markdown.stdout).toContain("a value size: NEW's own");
    // Sizes that are the inputs' own (two path lists) carry no such field, and the legend says a size.
    const paths = { "a.paths": "10\tquay/a\n5\tquay/b\n", "b.paths": "12\tquay/a\n5\tquay/b\n" };
    const own = await cli(["diff", "a.paths", "b.paths", "--format", "json"], { files: paths });
    expect(JSON.parse(own.stdout)).not.toHaveProperty("sizes");
    const ownLegend = await cli(["diff", "a.paths", "b.paths", "--legend"], { files: paths });
    expect(ownLegend.stdout).toContain("a size: NEW's own");
  });

  it("a summary of one document still sizes it by its bytes", async () => {
    const r = await cli(["compact.json", "--format", "json"], { files });
    expect(JSON.parse(r.stdout).totals.size).toBe(Buffer.byteLength(files["compact.json"]));
  });
});
