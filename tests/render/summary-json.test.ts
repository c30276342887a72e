import { readFileSync } from "node:fs";
import Ajv2020 from "ajv/dist/2020.js";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { measure } from "../../src/model/measure.js";
import { PathIndex } from "../../src/model/path-index.js";
import { summaryJsonSchema } from "../../src/render/summary-json-schema.js";
import { SUMMARY_FORMAT, summarySchema } from "../../src/render/summary-schema.js";
import { cli } from "../helpers/cli.js";
import { makeTree } from "../helpers/make-tree.js";
import { arbTreeWithFoci } from "../helpers/random-tree.js";
import { summaryOf } from "../helpers/summary.js";

const published = JSON.parse(
  readFileSync(new URL("../../docs/summary.schema.json", import.meta.url), "utf8"),
);

describe("renderJson(view, options)", () => {
  it("publishes in docs/ exactly the JSON Schema generated from the zod schema", () => {
    expect(published).toEqual(JSON.parse(JSON.stringify(summaryJsonSchema())));
  });

  it("writes JSON (RFC 8259) that validates against the published schema", () => {
    // Validated with Ajv, a general-purpose JSON Schema (draft 2020-12) validator from the registry.
    const ajv = new Ajv2020.default({ allErrors: true });
    const validate = ajv.compile(published);
    fc.assert(
      fc.property(arbTreeWithFoci(40), ([tree, f]) => {
        const index = new PathIndex(tree, measure(tree));
        const foci = f.map((i) => index.path(i));
        const { json } = summaryOf(tree, foci, 1000);
        const doc = JSON.parse(json);
        expect(validate(doc), JSON.stringify(validate.errors)).toBe(true);
        expect(summarySchema.safeParse(doc).success).toBe(true);
      }),
      { numRuns: 50 },
    );
  });

  it("validates against the published schema when no node has the name field (input.unnamed)", async () => {
    // Field test: app.yaml files on the machine (a list of handlers, none named) wrote input.unnamed,
    // which the published schema did not allow. Validated with Ajv, as above. An invented service of
    // the fictional Tidewater monorepo.
    const yaml =
      "runtime: tidewater-py\nhandlers:\n  - url: /ledger\n    script: ledger.app\n  - url: /tides\n    script: tides.app\n";
    const out = await cli(["app.yaml", "--format", "json"], { files: { "app.yaml": yaml } });
    expect(out.code, out.stderr).toBe(0);
    const doc = JSON.parse(out.stdout);
    expect(doc.input.unnamed).toBe("name");
    const validate = new Ajv2020.default({ allErrors: true }).compile(published);
    expect(validate(doc), JSON.stringify(validate.errors)).toBe(true);
    expect(summarySchema.safeParse(doc).success).toBe(true);
  });

  it("carries the format version, the budget, the lines used, totals and the foci", () => {
    const tree = makeTree("R{A:1{A1:2},B:3}");
    const { json } = summaryOf(tree, ["A/A1"], 3);
    const doc = JSON.parse(json);
    expect(doc.format).toBe(SUMMARY_FORMAT);
    expect(doc.budget).toBe(3);
    expect(doc.lines).toBe(3);
    expect(doc.totals).toEqual({ nodes: 4, size: 6 });
    expect(doc.foci).toEqual(["A/A1"]);
    expect(doc.root.hidden).toEqual({ children: 1, nodes: 1, size: 3 });
    expect(doc.root.children[0].children[0]).toMatchObject({
      name: "A1",
      path: "A/A1",
      focus: true,
      interest: 0,
    });
  });
});
