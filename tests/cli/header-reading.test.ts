import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

/** The header line: the first line of a text summary or diff (the lines used count the key line under it). */
const head = (stdout: string) => stdout.split("\n")[0];

// Inputs shaped as common tools write them (npm ls --all --json nests packages under `dependencies`;
// a lock file keys records by path under `packages`; a settings file has no node objects at all).
const NESTED = JSON.stringify({
  name: "harbor-app",
  dependencies: { "kelp-log": { dependencies: { "brine-util": {} } }, "tide-clock": {} },
});
const PATH_MAP = JSON.stringify({
  packages: { "": {}, "node_modules/kelp-log": {}, "node_modules/tide-clock": {} },
});
const VALUES = JSON.stringify({ editor: { tabs: 2, wrap: true }, theme: "dusk" });

describe("the header says how espalier chose to read a JSON or YAML input", () => {
  it("names the field children were found under when it is not the one asked for", async () => {
    const r = await cli(["-", "--input-format", "json"], { stdin: NESTED });
    expect(r.code).toBe(0);
    expect(head(r.stdout)).toBe(
      "summary: 4 nodes (2 of them empty {}); children under dependencies; no focus; 5 of 40 lines (default budget: not a terminal)",
    );
  });

  it("says nothing about the reading when the options chose it", async () => {
    const asked = await cli(["-", "--input-format", "json", "--children-field", "dependencies"], {
      stdin: NESTED,
    });
    expect(head(asked.stdout)).toBe(
      "summary: 4 nodes (2 of them empty {}); no focus; 5 of 40 lines (default budget: not a terminal)",
    );
    const forced = await cli(["-", "--input-format", "json", "--read-as", "values"], { stdin: VALUES });
    expect(head(forced.stdout)).not.toContain("every value a node");
  });

  it("names the field of a map keyed by path, and a document read value by value", async () => {
    const map = await cli(["-", "--input-format", "json"], { stdin: PATH_MAP });
    expect(head(map.stdout)).toContain("; paths from packages; no focus;");
    // Read as values the size is the document's bytes: the root, editor, tabs, wrap and theme are 5 nodes.
    const values = await cli(["-", "--input-format", "json"], { stdin: VALUES });
    expect(head(values.stdout)).toContain(
      `summary: 5 nodes, size ${Buffer.byteLength(VALUES)} B; every value a node; no focus;`,
    );
  });

  it("does the same on a diff's header and in Markdown (the field as code)", async () => {
    const files = { "old.json": NESTED, "new.json": NESTED.replace('"tide-clock"', '"tide-gauge"') };
    const diff = await cli(["diff", "old.json", "new.json"], { files });
    expect(head(diff.stdout)).toContain("; children under dependencies; no focus;");
    const md = await cli(["-", "--input-format", "json", "--format", "markdown"], { stdin: NESTED });
    expect(head(md.stdout)).toContain("children under ` dependencies `; no focus");
  });

  it("leaves tables, path lists and JSON without a search alone", async () => {
    const r = await cli(["-", "--input-format", "paths"], { stdin: "quill/a\nquill/b\n" });
    expect(head(r.stdout)).toBe("summary: 3 nodes; no focus; 5 of 40 lines (default budget: not a terminal)");
  });
});

describe("the header says an array of records was read as rows, and by which fields", () => {
  // A JSON Patch (RFC 6902 §3, §4: an array of operations, each with "op" and "path"): its "path"
  // member makes it rows linked by path, one reading of an array among others (nested roots).
  const PATCH = JSON.stringify([
    { op: "add", path: "/berths/0", value: { id: "B-7" } },
    { op: "replace", path: "/berths/1/owner", value: "quay team" },
    { op: "remove", path: "/tariff" },
  ]);

  it("rows linked by path: '/' (the absolute paths' root), berths, 0, 1, owner, tariff are 6 nodes", async () => {
    const r = await cli(["-"], { stdin: PATCH });
    expect(r.code).toBe(0);
    expect(head(r.stdout)).toBe(
      "summary: 6 nodes; rows linked by path; no focus; 7 of 40 lines (default budget: not a terminal)",
    );
    const json = await cli(["-", "--format", "json"], { stdin: PATCH });
    expect(JSON.parse(json.stdout).input).toMatchObject({ shape: "rows", linkedBy: ["path"] });
  });

  it("a JSON Patch with two operations on one path is DUPLICATE_PATH naming --read-as values, which reads it", async () => {
    // RFC 6902 §4.6 and §4.3: a "test" then a "replace" of the same path, as patches often pair them.
    const pair = JSON.stringify([
      { op: "test", path: "/tariff", value: 4 },
      { op: "replace", path: "/tariff", value: 5 },
    ]);
    const r = await cli(["-"], { stdin: pair });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^espalier: <stdin>:1:\d+: .*--read-as values \[DUPLICATE_PATH\]\n$/);
    const values = await cli(["-", "--read-as", "values", "--format", "json"], { stdin: pair });
    expect(values.code).toBe(0);
    // The array, its 2 operations, and their op, path and value: 1 + 2 + 6 nodes, the text's bytes.
    expect(JSON.parse(values.stdout).totals).toEqual({ nodes: 9, size: Buffer.byteLength(pair) });
  });

  it("rows linked by id and parent, YAML too; nothing said under --input-format rows, nor for CSV", async () => {
    const yaml = "- id: q1\n  parent:\n  name: quay\n- id: q2\n  parent: q1\n  name: crane\n";
    const r = await cli(["-", "--input-format", "yaml"], { stdin: yaml });
    expect(r.code).toBe(0);
    expect(head(r.stdout)).toBe(
      "summary: 2 nodes; rows linked by id and parent; no focus; 3 of 40 lines (default budget: not a terminal)",
    );
    const asked = await cli(["-", "--input-format", "rows"], { stdin: PATCH });
    expect(head(asked.stdout)).toBe(
      "summary: 6 nodes; no focus; 7 of 40 lines (default budget: not a terminal)",
    );
    const csv = await cli(["-", "--input-format", "csv"], {
      stdin: "id,parent,name\nq1,,quay\nq2,q1,crane\n",
    });
    expect(head(csv.stdout)).toBe(
      "summary: 2 nodes; no focus; 3 of 40 lines (default budget: not a terminal)",
    );
    expect(
      JSON.parse(
        (
          await cli(["-", "--input-format", "csv", "--format", "json"], {
            stdin: "id,parent\nq1,\n",
          })
        ).stdout,
      ).input.linkedBy,
    ).toEqual(["id", "parent"]);
  });
});

describe("the header says when a path list's folder sizes were read as totals", () => {
  // Shaped as GNU du -ab prints (each folder after its contents, with its total); sizes invented.
  const DU = "100\tharbor/tide.log\n2000\tharbor/charts/reef.svg\n6096\tharbor/charts\n10292\tharbor\n";

  it("reads du's folder totals once and says so; --folder-sizes own reads each line as its own size", async () => {
    const auto = await cli(["-", "--input-format", "paths"], { stdin: DU });
    expect(auto.code).toBe(0);
    expect(head(auto.stdout)).toBe(
      "summary: 4 nodes, size 10.1 KiB; folder sizes read as totals with contents; no focus; 5 of 40 lines (default budget: not a terminal)",
    );
    const own = await cli(["-", "--input-format", "paths", "--folder-sizes", "own"], { stdin: DU });
    expect(head(own.stdout)).toBe(
      "summary: 4 nodes, size 18.1 KiB; no focus; 5 of 40 lines (default budget: not a terminal)",
    );
    const asked = await cli(["-", "--input-format", "paths", "--folder-sizes", "total"], { stdin: DU });
    expect(head(asked.stdout)).toBe(
      "summary: 4 nodes, size 10.1 KiB; no focus; 5 of 40 lines (default budget: not a terminal)",
    );
  });
});
