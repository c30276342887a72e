import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field tests: shapes met on real inputs (a package manager's long listing, configuration files),
// reduced to small documents of the invented tidewater scenario. Each expected count is checked by
// hand against the document beside it.

/** The summary JSON of `text` read from standard input. */
async function summary(text: string, args: string[] = []) {
  const result = await cli(["-", "--format", "json", "--budget", "200", ...args], { stdin: text });
  expect(result.stderr).toBe("");
  expect(result.code).toBe(0);
  return JSON.parse(result.stdout);
}

/** Every node's path in the summary JSON (all shown with a budget this big), in pre-order. */
function paths(node: { path: string; children: unknown[] }): string[] {
  return [node.path, ...(node.children as (typeof node)[]).flatMap(paths)];
}

describe("a dependency listing with every package's manifest (npm ls --all --json --long shape)", () => {
  // Each package record holds a dozen manifest fields before its `dependencies`, as the long listing
  // prints them: the children field must still be found, not the whole record read as values.
  const manifest = (name: string) => ({
    version: "1.0.0",
    name,
    description: `the ${name} package`,
    license: "MIT",
    homepage: `https://tidewater.invalid/${name}`,
    repository: { type: "git", url: `git+https://tidewater.invalid/${name}.git` },
    bugs: { url: `https://tidewater.invalid/${name}/issues` },
    keywords: ["tide", "harbor"],
    engines: { node: ">=20" },
    files: ["dist"],
    _id: `${name}@1.0.0`,
    path: `/srv/tidewater/node_modules/${name}`,
    _dependencies: {},
  });
  const listing = {
    ...manifest("tidewater"),
    devDependencies: { "harbor-log": "^1.0.0" },
    dependencies: {
      "harbor-log": {
        ...manifest("harbor-log"),
        dependencies: { "tide-clock": { ...manifest("tide-clock"), dependencies: { "moon-phase": {} } } },
      },
      "@tidewater/ink": manifest("@tidewater/ink"),
      "quay-fmt": {},
    },
  };

  it("reads the packages under `dependencies` (6 nodes: the root, 3 dependencies, 2 nested below harbor-log)", async () => {
    const json = await summary(JSON.stringify(listing, null, 2));
    expect(json.input).toMatchObject({
      shape: "nodes",
      childrenField: "dependencies",
      childrenFieldFound: true,
    });
    expect(json.totals.nodes).toBe(6);
    expect(paths(json.root)).toEqual([
      "",
      "harbor-log",
      "harbor-log/tide-clock",
      "harbor-log/tide-clock/moon-phase",
      "@tidewater~1ink",
      "quay-fmt",
    ]);
  });
});

describe("a flat configuration object (no name, no size, nothing nested)", () => {
  it("reads every key as a node rather than one nameless node that drops them", async () => {
    const json = await summary('{"timeout": 30, "retries": 5, "region": "harrow-north"}');
    expect(json.input.shape).toBe("values");
    // The root and its three members.
    expect(json.totals.nodes).toBe(4);
    expect(paths(json.root)).toEqual(["", "timeout", "retries", "region"]);
  });

  it("reads YAML the same way (a one-key file is two nodes)", async () => {
    const json = await summary("retries: 5\n");
    expect(json.input.shape).toBe("values");
    expect(paths(json.root)).toEqual(["", "retries"]);
  });

  it("reads a top-level array of flat records without names as values, not nameless nodes", async () => {
    const json = await summary('[{"port": 8080}, {"port": 8081}]');
    expect(json.input.shape).toBe("values");
    expect(paths(json.root)).toEqual(["", "0", "0/port", "1", "1/port"]);
  });

  it("still reads a leaf that has the name or size field as one node", async () => {
    expect(paths((await summary('{"name": "tidewater", "version": "4.2.0"}')).root)).toEqual([""]);
    const sized = await summary('[{"name": "ledger", "size": 3}, {"name": "quay", "size": 4}]');
    expect(sized.input.shape).toBe("nodes");
    expect(sized.totals).toEqual({ nodes: 3, size: 7 });
  });
});

describe("rows asked for in a document that holds them under a member", () => {
  // An API's answer or a dataset file (iso-codes' iso_3166-2.json: {"3166-2": [{...}, ...]}) wraps its
  // array of rows in an object; --input-format rows reads a top-level array only.
  const wrapped = JSON.stringify({ data: [{ id: "quay" }, { id: "ledger", parent: "quay" }] });

  it("is SHAPE at 1:1 saying the document is an object and what to do", async () => {
    const result = await cli(["-", "--input-format", "rows"], { stdin: wrapped });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(
      /^espalier: <stdin>:1:1: rows must be a top-level array of objects; this document is an object: rows held under one of its members are read with --start-at .*\[SHAPE\]\n$/,
    );
    // The array taken out reads as rows: 2 nodes; so does the array read in place with --start-at.
    const rows = JSON.stringify(JSON.parse(wrapped).data);
    expect((await summary(rows, ["--input-format", "rows"])).totals.nodes).toBe(2);
    const inPlace = await summary(wrapped, ["--input-format", "rows", "--start-at", "/data"]);
    expect(inPlace.totals.nodes).toBe(2);
    expect(inPlace.input.startAt).toBe("/data");
  });
});

describe("a dependency listing with a key given twice (a merge left both sides of a conflict)", () => {
  // npm ls --all --json shape, reduced to invented tidewater packages: "tide-core" appears twice under
  // one "dependencies" object, its earlier value holding two packages of its own. RFC 8259 section 4:
  // "The names within an object SHOULD be unique"; "many implementations report the last name/value
  // pair only", as ECMA-262's JSON.parse does. Reading the last is right, but it was silent: the two
  // packages of the earlier value were simply not counted.
  const text = `{
  "name": "tidewater",
  "dependencies": {
    "tide-core": { "version": "1.0.0", "dependencies": { "salt": { "version": "2.0.0" }, "brine": { "version": "1.1.0" } } },
    "harbor-ui": { "version": "3.0.0" },
    "tide-core": { "version": "1.2.0" }
  }
}
`;

  /** Nodes as JSON.parse reads the listing: the root and every package under "dependencies". */
  const parsedNodes = (node: { dependencies?: Record<string, object> }): number =>
    1 + Object.values(node.dependencies ?? {}).reduce<number>((sum, child) => sum + parsedNodes(child), 0);

  it("counts what JSON.parse reads and says on standard error and in JSON which key repeated, and what was left", async () => {
    const result = await cli(["-", "--format", "json", "--budget", "200"], { stdin: text });
    expect(result.code).toBe(0);
    const summary = JSON.parse(result.stdout);
    // JSON.parse keeps the last "tide-core": tidewater, tide-core, harbor-ui.
    expect(summary.totals.nodes).toBe(parsedNodes(JSON.parse(text)));
    expect(summary.totals.nodes).toBe(3);
    expect(summary.input.notes).toEqual([
      expect.objectContaining({
        code: "REPEATED_KEY",
        line: 6,
        message: expect.stringMatching(/"tide-core".*\(3 nodes\)/),
      }),
    ]);
    expect(result.stderr).toMatch(
      /^espalier: note: <stdin>:6: line 6 repeats the key "tide-core" .*\[REPEATED_KEY\]\n$/,
    );
  });

  it("says nothing of a listing whose keys are each given once, and names no package under --pseudonymize", async () => {
    const once = text
      .replace(/\n {4}"tide-core": \{ "version": "1\.2\.0" \}/, "")
      .replace('"3.0.0" },', '"3.0.0" }');
    const plain = await cli(["-", "--format", "json"], { stdin: once });
    expect(plain.stderr).toBe("");
    expect(JSON.parse(plain.stdout).totals.nodes).toBe(parsedNodes(JSON.parse(once)));
    const hidden = await cli(["-", "--pseudonymize"], { stdin: text, env: { ESPALIER_PSEUDONYM_KEY: "k" } });
    expect(hidden.code).toBe(0);
    expect(hidden.stderr).toMatch(/\[REPEATED_KEY\]/);
    expect(hidden.stderr).not.toMatch(/tide-core/);
  });
});

describe("a package's file list (npm pack --dry-run --json shape)", () => {
  // Shaped as npm 11 prints it for this project: an array of one record per package, its "id" making
  // the array rows, and the files under "files", each with a "path" and a "size". The rows were
  // FIELD_MISSING with no word of where the files were; the check is the record's own unpackedSize.
  const pack = JSON.stringify([
    {
      id: "tidewater@4.2.0",
      name: "tidewater",
      size: 900,
      unpackedSize: 3340,
      files: [
        { path: "LICENSE", size: 1077, mode: 420 },
        { path: "dist/index.js", size: 2048, mode: 420 },
        { path: "dist/harbor/quay.js", size: 215, mode: 420 },
      ],
      entryCount: 3,
    },
  ]);

  it("is FIELD_MISSING naming --start-at /0/files, which reads the files at unpackedSize", async () => {
    const told = await cli(["-"], { stdin: pack });
    expect(told.code).toBe(2);
    expect(told.stderr).toMatch(/--start-at \/0\/files reads them \[FIELD_MISSING\]\n$/);
    const json = await summary(pack, ["--start-at", "/0/files"]);
    expect(json.totals).toEqual({ nodes: 6, size: 3340 });
    expect(paths(json.root)).toEqual([
      "",
      "LICENSE",
      "dist",
      "dist/index.js",
      "dist/harbor",
      "dist/harbor/quay.js",
    ]);
  });
});
