import { describe, expect, it } from "vitest";
import { sampleJson } from "../../../src/load/json/json-sample.js";
import { chooseReading } from "../../../src/load/shape/choose-reading.js";
import { opts } from "../helpers.js";

const choose = (text: string, overrides = {}) =>
  chooseReading(sampleJson(Buffer.from(text)), opts(overrides));

describe("chooseReading(sample, fields)", () => {
  it("chooseReading reads nodes by the configured children field when the first node object has it", () => {
    expect(choose('{"name":"r","children":[{"name":"a"}]}')).toEqual({
      kind: "nodes",
      childrenField: "children",
      found: false,
    });
  });

  it("chooseReading finds the field that holds children at the next level too, as a dependency listing", () => {
    const listing = {
      version: "1.0.0",
      name: "tidewater",
      problems: ["invalid: a@1"],
      dependencies: {
        alpha: { version: "2.0.0", dependencies: { beta: { version: "1.1.0" } } },
        gamma: { version: "0.3.0" },
      },
    };
    expect(choose(JSON.stringify(listing))).toEqual({
      kind: "nodes",
      childrenField: "dependencies",
      found: true,
    });
    // An array of objects holding the same field: found too.
    const arrays = { title: "q", parts: [{ title: "a", parts: [{ title: "b" }] }] };
    expect(choose(JSON.stringify(arrays))).toMatchObject({ childrenField: "parts", found: true });
  });

  it("chooseReading takes no list of nameless records beside other objects and arrays for children", () => {
    // Shaped as a CloudFormation resource schema that cfn-lint ships (JSON Schema draft 7 composition,
    // `allOf` of `allOf`), keys sorted: read under `allOf` it was 3 nodes printed as "", its
    // `definitions` and `properties` unseen; read as values every key is a node.
    const schema = {
      additionalProperties: false,
      allOf: [{ allOf: [{ required: ["BerthId"] }], anyOf: [{ required: ["Tide"] }] }],
      definitions: { Tide: { properties: { Level: { type: "number" } }, type: "object" } },
      properties: { BerthId: { type: "string" }, Tide: { $ref: "#/definitions/Tide" } },
    };
    expect(choose(JSON.stringify(schema))).toEqual({ kind: "values" });
    // Alone in its object, or with a name on its records, such a list is children still.
    expect(choose(JSON.stringify({ allOf: schema.allOf }))).toMatchObject({ childrenField: "allOf" });
    const named = { ...schema, allOf: [{ name: "quay", allOf: [{ name: "crane" }] }] };
    expect(choose(JSON.stringify(named))).toMatchObject({ childrenField: "allOf", found: true });
  });

  it("chooseReading takes a field of leaves as children only when it is the one nested field", () => {
    expect(choose('{"name":"app","dependencies":{"a":{"version":"1"},"b":{}}}')).toMatchObject({
      childrenField: "dependencies",
    });
    // A configuration: `defaults` holds objects of scalars beside `jobs`; neither recurs: every value.
    const config = {
      name: "CI",
      defaults: { run: { shell: "bash" } },
      jobs: { build: { steps: [{ run: "make" }] } },
    };
    expect(choose(JSON.stringify(config))).toEqual({ kind: "values" });
  });

  it("chooseReading reads an object keyed by path with record values as a path map, top level or a field", () => {
    const lock = {
      name: "tidewater",
      lockfileVersion: 3,
      packages: { "": { name: "tidewater" }, "node_modules/a": {}, "node_modules/a/node_modules/b": {} },
    };
    expect(choose(JSON.stringify(lock))).toEqual({ kind: "path-map", field: "packages" });
    expect(choose('{"":{},"src":{},"src/a.ts":{"size":3}}')).toEqual({ kind: "path-map", field: "" });
    // Scoped names hold a "/" but no key is another's parent and there is no "": not paths.
    expect(choose('{"deps":{"@q/a":{"deps":{"@q/b":{}}},"@q/c":{}}}')).toMatchObject({ kind: "nodes" });
  });

  it("chooseReading reads values when nothing is shaped like nodes, and rows by their keys", () => {
    expect(choose("[1, 2, 3]")).toEqual({ kind: "values" });
    expect(choose('"text"')).toEqual({ kind: "values" });
    expect(choose('{"a":{"b":[1,2]},"c":true}')).toEqual({ kind: "values" });
    expect(choose('[{"id":"r","parent":null,"x":{"d":1}}]')).toEqual({ kind: "rows" });
    // A leaf node object (nothing nested but its own fields) stays a node.
    expect(choose('{"name":"r","size":4,"tags":["a"]}', { keepFields: ["tags"] })).toMatchObject({
      kind: "nodes",
    });
  });

  it("chooseReading obeys readAs and a children field given by name", () => {
    expect(choose('{"name":"r","children":[]}', { readAs: "values" })).toEqual({ kind: "values" });
    expect(choose('{"a":{"b":1}}', { readAs: "nodes" })).toEqual({
      kind: "nodes",
      childrenField: "children",
      found: false,
    });
    // The default field named on purpose: no search either.
    expect(
      choose('{"name":"r","dependencies":{"a":{"dependencies":{}}}}', {
        childrenFieldNamed: true,
        readAs: "nodes",
      }),
    ).toEqual({ kind: "nodes", childrenField: "children", found: false });
    // Another children field named: no search, so a lone root becomes the loader's error, not a guess.
    expect(
      choose('{"name":"r","dependencies":{"a":{"dependencies":{}}}}', { childrenField: "kids" }),
    ).toEqual({
      kind: "nodes",
      childrenField: "kids",
      found: false,
    });
  });

  it("chooseReading decides on the start of a document, as far as the sample goes", () => {
    // The loader samples the first bytes of a stream (64 KiB or more): a cut document is enough once
    // a child holding the same field has begun.
    const text = JSON.stringify({ name: "r", dependencies: { a: { dependencies: { b: {} } } } });
    expect(choose(text.slice(0, text.indexOf('"b"') + 5))).toMatchObject({ childrenField: "dependencies" });
    expect(choose(text.slice(0, text.indexOf('"b"')))).toEqual({ kind: "values" });
  });

  it("chooseReading takes the one field of records of the top object's kind beside other arrays and objects", () => {
    // `npm ls --all --json` of a checkout with nothing installed (npm 10, from this project's own run):
    // missing entries hold a `problems` list as the top object does, beside it an `error` object.
    const missing = {
      version: "4.2.0",
      name: "tidewater",
      problems: ["missing: quay-lint@5.1.0, required by tidewater@4.2.0"],
      dependencies: {
        "quay-lint": { required: "5.1.0", missing: true, problems: ["missing: quay-lint@5.1.0"] },
        "tidal-math": {},
      },
      error: { code: "ELSPROBLEMS", summary: "missing: quay-lint@5.1.0" },
    };
    expect(choose(JSON.stringify(missing))).toEqual({
      kind: "nodes",
      childrenField: "dependencies",
      found: true,
    });
    // Records that share no field with the top object are not its kind: a configuration stays values.
    const config = { name: "CI", env: ["A=1"], services: { db: { image: "pg", ports: [5432] } } };
    expect(choose(JSON.stringify(config))).toEqual({ kind: "values" });
    // Two fields holding records: neither is taken.
    const two = { ...missing, exports: { ".": { import: "./dist/index.js" } } };
    expect(choose(JSON.stringify(two))).toEqual({ kind: "values" });
    // Records holding records of their own below are no leaves.
    const deeper = { ...missing, dependencies: { a: { problems: [], engines: { node: { min: 20 } } } } };
    expect(choose(JSON.stringify(deeper))).toEqual({ kind: "values" });
  });

  it("chooseReading takes no records sharing a field by chance, nor a package's exports, for the document's children", () => {
    // Shapes met on this machine (node_modules, a cloud SDK's command files), with invented values.
    // A package.json: its contributors (a list) share its `name`, its funding list its `type`.
    const manifest = {
      name: "tidewater-ledger",
      version: "4.2.0",
      type: "module",
      keywords: ["ledger"],
      contributors: [{ name: "Harbor Crew", email: "crew@tidewater.invalid" }],
    };
    expect(choose(JSON.stringify(manifest))).toEqual({ kind: "values" });
    const funded = { ...manifest, contributors: undefined, funding: [{ type: "opencollective", url: "x" }] };
    expect(choose(JSON.stringify(funded))).toEqual({ kind: "values" });
    // Keyed by name and sharing `name` and `version`, beside a dozen other fields holding objects.
    const engines = {
      ...manifest,
      scripts: { build: "make" },
      files: ["dist"],
      devEngines: { packageManager: { name: "kelp", version: "1.0.0" } },
    };
    expect(choose(JSON.stringify(engines))).toEqual({ kind: "values" });
    // A command file: its arguments' records share `help_text`, a string there and an object here.
    const command = {
      help_text: { brief: "List the ledgers." },
      arguments: { resource: { help_text: "The harbor to list.", spec: "ledger" } },
      request: { collection: "ledgers" },
    };
    expect(choose(JSON.stringify([command]))).toEqual({ kind: "values" });
    // A package's exports: keyed by subpath ("." and "./…"), one under another, but no listing.
    const exported = {
      ...manifest,
      contributors: undefined,
      exports: { ".": { import: "./a.js" }, "./b/c": { import: "./c.js" }, "./b": { import: "./b.js" } },
    };
    expect(choose(JSON.stringify(exported))).toEqual({ kind: "values" });
    const lock = { name: "t", packages: { "": { version: "1" }, "node_modules/a": { version: "2" } } };
    expect(choose(JSON.stringify(lock))).toEqual({ kind: "path-map", field: "packages" });
  });

  it("chooseReading reads as another version was read (sameReading) when the document fits, else SHAPE", () => {
    const lock = '{"packages":{"":{},"node_modules/a":{}}}';
    const listing = '{"name":"r","dependencies":{"a":{"version":"1"}}}';
    expect(choose(listing, { sameReading: { kind: "values" } })).toEqual({ kind: "values" });
    expect(choose(lock, { sameReading: { kind: "path-map", field: "packages" } })).toEqual({
      kind: "path-map",
      field: "packages",
    });
    expect(() => choose(listing, { sameReading: { kind: "path-map", field: "packages" } })).toThrow(
      expect.objectContaining({ code: "SHAPE" }),
    );
    expect(() =>
      choose("[1, 2]", { sameReading: { kind: "nodes", childrenField: "deps", found: true } }),
    ).toThrow(expect.objectContaining({ code: "SHAPE" }));
    expect(() => choose('[{"name":"a"}]', { sameReading: { kind: "rows" } })).toThrow(
      expect.objectContaining({ code: "SHAPE" }),
    );
    expect(choose('[{"id":"1","parent":""}]', { sameReading: { kind: "rows" } })).toEqual({ kind: "rows" });
  });
});
