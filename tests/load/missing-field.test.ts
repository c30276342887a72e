import { describe, expect, it } from "vitest";
import { EspalierError } from "../../src/errors.js";
import { loadTree } from "../../src/load/index.js";
import { loadTreeFromStream } from "../../src/load/stream/index.js";
import { csvTableFromBytes } from "../../src/load/table/csv-table.js";
import { caught, opts } from "./helpers.js";

// Issue 10.8: a --size-field or kept (--label) field that no record has is FIELD_MISSING naming the
// fields the records do have, in every format; never a tree without sizes or labels, exit 0.

/** A CSV table with a header line (RFC 4180 §2, item 3: the first record may name the fields). */
const CSV = "id,parent,name,cost\nq1,,Rosa,3\nq2,q1,Ada,4\n";
/** Nested JSON nodes (RFC 8259 §4: an object's members are name/value pairs; the names are the fields). */
const NODES = '{"name":"tidewater","bytes":5,"children":[{"name":"kelp","bytes":2,"owner":"ledger"}]}';
/** JSON rows linked by id. */
const ROWS = '[{"id":"r","parent":null,"cost":1},{"id":"a","parent":"r","cost":2}]';
/** A lock-file-shaped map keyed by path ("" is the root). */
const PATH_MAP = '{"packages":{"":{"version":"1.0.0"},"node_modules/kelp":{"version":"2.0.0"}}}';
const YAML = "name: tidewater\nbytes: 5\nchildren:\n  - name: kelp\n    bytes: 2\n";
const PATHS = "5\ttidewater/kelp\n7\ttidewater/brine\n";

const inputs: [string, string][] = [
  ["org.csv", CSV],
  ["deps.json", NODES],
  ["rows.json", ROWS],
  ["lock.json", PATH_MAP],
  ["deps.yaml", YAML],
];

describe("loadTree(input, { sizeField }) with a named size field no record has", () => {
  it("is FIELD_MISSING naming the fields seen, in every record format", () => {
    const seen: Record<string, string[]> = {
      "org.csv": ["id", "parent", "name", "cost"],
      "deps.json": ["name", "bytes", "children", "owner"],
      "rows.json": ["id", "parent", "cost"],
      "lock.json": ["version"],
      "deps.yaml": ["name", "bytes", "children"],
    };
    for (const [file, text] of inputs) {
      const err = caught(() => loadTree(text, opts({ file, sizeField: "weight" })));
      expect(err.code, file).toBe("FIELD_MISSING");
      expect(err.details, file).toMatchObject({ option: "--size-field", field: "weight" });
      expect(new Set(err.details.fieldsSeen as string[]), file).toEqual(new Set(seen[file]));
    }
  });

  it("loads with sizes when the named field is there", () => {
    expect(loadTree(CSV, opts({ file: "org.csv", sizeField: "cost" })).hasSizes).toBe(true);
    expect(loadTree(NODES, opts({ file: "deps.json", sizeField: "bytes" })).hasSizes).toBe(true);
    expect(loadTree(YAML, opts({ file: "deps.yaml", sizeField: "bytes" })).hasSizes).toBe(true);
    expect(loadTree(ROWS, opts({ file: "rows.json", sizeField: "cost" })).hasSizes).toBe(true);
  });

  it("leaves the default size field optional: no `size` anywhere is a tree without sizes", () => {
    for (const [file, text] of inputs) expect(loadTree(text, opts({ file })).hasSizes, file).toBe(false);
  });

  it("is FIELD_MISSING when the default name is named on purpose (sizeFieldNamed)", () => {
    const err = caught(() => loadTree(CSV, opts({ file: "org.csv", sizeFieldNamed: true })));
    expect(err.code).toBe("FIELD_MISSING");
  });

  it("is FIELD_MISSING on a path list and on a document read as values, whose sizes come from elsewhere", () => {
    expect(caught(() => loadTree(PATHS, opts({ file: "f.paths", sizeField: "bytes" }))).code).toBe(
      "FIELD_MISSING",
    );
    for (const [file, text] of [
      ["doc.json", NODES],
      ["doc.yaml", YAML],
    ]) {
      const err = caught(() => loadTree(text, opts({ file, sizeField: "bytes", readAs: "values" })));
      expect(err.code, file).toBe("FIELD_MISSING");
      expect(err.details).toMatchObject({ option: "--size-field" });
    }
  });

  it("streams to the same error as the whole text", async () => {
    for (const [file, text] of inputs) {
      const chunks = (async function* () {
        const bytes = Buffer.from(text);
        for (let k = 0; k < bytes.length; k += 3) yield bytes.subarray(k, k + 3);
      })();
      const err = await loadTreeFromStream(chunks, opts({ file, sizeField: "weight" })).catch((e) => e);
      expect(err, file).toBeInstanceOf(EspalierError);
      expect((err as EspalierError).code, file).toBe("FIELD_MISSING");
      expect((err as EspalierError).details.fieldsSeen, file).toEqual(
        caught(() => loadTree(text, opts({ file, sizeField: "weight" }))).details.fieldsSeen,
      );
    }
  });
});

describe("loadTree(input, { keepFields }) with a kept field no record has", () => {
  it("is FIELD_MISSING naming the fields seen, in every record format", () => {
    for (const [file, text] of inputs) {
      const err = caught(() => loadTree(text, opts({ file, keepFields: ["titel"] })));
      expect(err.code, file).toBe("FIELD_MISSING");
      expect(err.details.field, file).toBe("titel");
      expect((err.details.fieldsSeen as string[]).length, file).toBeGreaterThan(0);
    }
  });
});

describe("loadTree(input, { nameField }) with a named name field no record has", () => {
  it("is FIELD_MISSING naming the fields seen, in every record format", () => {
    for (const [file, text] of inputs) {
      const err = caught(() => loadTree(text, opts({ file, nameField: "title" })));
      expect(err.code, file).toBe("FIELD_MISSING");
      expect(err.details, file).toMatchObject({ option: "--name-field", field: "title" });
      expect((err.details.fieldsSeen as string[]).length, file).toBeGreaterThan(0);
    }
  });

  it("is FIELD_MISSING when the default name is named on purpose and no record has it", () => {
    // rows.json and lock.json have no "name" anywhere; the others do and load.
    for (const file of ["rows.json", "lock.json"]) {
      const text = inputs.find(([f]) => f === file)![1];
      expect(caught(() => loadTree(text, opts({ file, nameFieldNamed: true }))).code, file).toBe(
        "FIELD_MISSING",
      );
      expect(loadTree(text, opts({ file })).length, file).toBeGreaterThan(1);
    }
    for (const file of ["org.csv", "deps.json", "deps.yaml"]) {
      const text = inputs.find(([f]) => f === file)![1];
      expect(loadTree(text, opts({ file, nameFieldNamed: true })).name.get(1), file).not.toBe("");
    }
  });

  it("does not count a key that names a child: a name field only keys name is missing", () => {
    // Children keyed by name (an object of objects) take their key as the name, never the name field.
    const keyed = '{"children":{"kelp":{"size":2},"brine":{"size":3}}}';
    expect(caught(() => loadTree(keyed, opts({ file: "k.json", nameField: "label" }))).code).toBe(
      "FIELD_MISSING",
    );
    const labelled = '{"label":"tidewater","children":{"kelp":{"size":2}}}';
    expect(loadTree(labelled, opts({ file: "k.json", nameField: "label" })).name.get(0)).toBe("tidewater");
  });

  it("is FIELD_MISSING on a path list and on a document read as values, named by their own rules", () => {
    const err = caught(() => loadTree(PATHS, opts({ file: "f.paths", nameFieldNamed: true })));
    expect(err.code).toBe("FIELD_MISSING");
    expect(err.details).toMatchObject({ option: "--name-field", field: "name" });
    for (const [file, text] of [
      ["doc.json", NODES],
      ["doc.yaml", YAML],
    ]) {
      const values = caught(() => loadTree(text, opts({ file, nameField: "title", readAs: "values" })));
      expect(values.code, file).toBe("FIELD_MISSING");
      expect(values.details).toMatchObject({ option: "--name-field" });
    }
  });

  it("streams to the same error as the whole text", async () => {
    for (const [file, text] of inputs) {
      const chunks = (async function* () {
        const bytes = Buffer.from(text);
        for (let k = 0; k < bytes.length; k += 3) yield bytes.subarray(k, k + 3);
      })();
      const err = await loadTreeFromStream(chunks, opts({ file, nameField: "title" })).catch((e) => e);
      expect((err as EspalierError).code, file).toBe("FIELD_MISSING");
      expect((err as EspalierError).details.fieldsSeen, file).toEqual(
        caught(() => loadTree(text, opts({ file, nameField: "title" }))).details.fieldsSeen,
      );
    }
  });
});

describe("graphs: a named size or name field no record has", () => {
  const EDGES = "tidewater kelp\ntidewater brine\nkelp brine\n";
  // Read as the CLI reads --nodes: by the same id, name and size fields (src/cli/node-records.ts).
  const records = (text: string, fields = {}) =>
    csvTableFromBytes(Buffer.from(text), ",", opts({ maxNodes: 1e9, ...fields }));

  it("an edge list alone has no records: the error says names and sizes come from node records", () => {
    for (const named of [{ sizeFieldNamed: true }, { nameField: "title" }]) {
      const err = caught(() => loadTree(EDGES, opts({ file: "g.txt", format: "edges", ...named })));
      expect(err.code).toBe("FIELD_MISSING");
      expect(err.details).toMatchObject({ remedies: ["--nodes"] });
    }
  });

  it("node records without the field are FIELD_MISSING naming their columns; with it the graph loads", () => {
    const err = caught(() =>
      loadTree(
        EDGES,
        opts({ format: "edges", sizeField: "bytes", nodeRecords: records("id,cost\nkelp,3\n") }),
      ),
    );
    expect(err.code).toBe("FIELD_MISSING");
    expect(err.details.fieldsSeen).toEqual(["id", "cost"]);
    const tree = loadTree(
      EDGES,
      opts({
        format: "edges",
        sizeField: "cost",
        nameField: "title",
        nodeRecords: records("id,cost,title\nkelp,3,Kelp\n", { sizeField: "cost", nameField: "title" }),
      }),
    );
    expect(tree.hasSizes).toBe(true);
  });

  it("an id-parent table read as a graph and an adjacency map check their own records", () => {
    const table = "id,parent,cost\nt,,1\nk,t,2\nb,t,3\nb,k,\n";
    expect(
      caught(() => loadTree(table, opts({ file: "g.csv", graph: true, nameField: "title" }))).details,
    ).toMatchObject({
      field: "title",
      fieldsSeen: ["id", "parent", "cost"],
    });
    const map = '{"t":{"children":["k","b"],"cost":1},"k":["b"]}';
    const err = caught(() => loadTree(map, opts({ file: "g.json", graph: true, sizeFieldNamed: true })));
    expect(err.details).toMatchObject({ option: "--size-field", fieldsSeen: ["children", "cost"] });
    expect(loadTree(map, opts({ file: "g.json", graph: true, sizeField: "cost" })).hasSizes).toBe(true);
  });
});
