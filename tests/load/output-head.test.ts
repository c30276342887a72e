import { readFileSync } from "node:fs";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ANY_ORDER_UNITS, OUTPUT_MEMBERS, OutputHead } from "../../src/load/output-head.js";

/** The verdict on `text` read in the pieces `cuts` make, at its end. */
function verdict(text: string, cuts: number[] = []): string | null {
  const head = new OutputHead();
  let from = 0;
  for (const cut of [...cuts].sort((a, b) => a - b)) {
    head.read(text.slice(from, cut));
    from = cut;
  }
  head.read(text.slice(from));
  return head.end();
}

/** `value` with every object's keys sorted, as `jq -S .` writes it (2 spaces; common practice, no source). */
function sorted(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sorted);
  if (value === null || typeof value !== "object") return value;
  const record = value as Record<string, unknown>;
  return Object.fromEntries(
    Object.keys(record)
      .sort()
      .map((k) => [k, sorted(record[k])]),
  );
}

// A small summary of the fictional Tidewater monorepo, in the shape docs/summary.schema.json gives.
const summary = {
  format: "espalier-summary/1",
  budget: 4,
  lines: 4,
  totals: { nodes: 3, size: 20 },
  foci: ["docs/tides.md", 'a "quoted" {name} [1]'],
  input: { shape: "paths", sizeUnit: "bytes", notes: [] },
  root: { name: "tidewater", path: "", nodes: 3, size: 20, children: [], hidden: null },
};

describe("new OutputHead().read(text)", () => {
  it("tells espalier's format in any member order and spacing: as written, jq -S ., jq -c ., python3 -m json.tool", () => {
    for (const text of [
      JSON.stringify(summary, null, 2),
      JSON.stringify(sorted(summary), null, 2),
      JSON.stringify(summary),
      JSON.stringify(sorted(summary), null, 4),
      // The root and every other member before the format (a hand-made order), escaped "/" as some writers do.
      JSON.stringify({ root: summary.root, totals: summary.totals, format: "espalier-summary/1" }),
      '\uFEFF\r\n\t{ "budget" : 4 ,\n"format"\n:\n"espalier-diff\\/1" }',
    ]) {
      expect(verdict(text), text).toBe(text.includes("diff") ? "espalier-diff/1" : "espalier-summary/1");
    }
  });

  it("gives the same verdict however the text is cut into pieces", () => {
    const texts = [
      JSON.stringify(sorted(summary), null, 2),
      JSON.stringify(summary),
      '{"budget": 4, "name": "x", "format": "espalier-summary/1"}',
    ];
    fc.assert(
      fc.property(fc.constantFrom(...texts), fc.array(fc.nat(), { maxLength: 12 }), (text, cuts) => {
        expect(
          verdict(
            text,
            cuts.map((c) => c % (text.length + 1)),
          ),
        ).toBe(verdict(text));
      }),
    );
  });

  it("is null for a document of the user's own, however like an output its members are", () => {
    for (const text of [
      // A member espalier's outputs do not write comes first: not an output, whatever follows.
      '{ "name": "x", "format": "espalier-summary/1" }',
      '{ "budget": 12, "title": "Q3 plan", "format": "espalier-summary/1", "root": {} }',
      // Another program's format, a format that is no string, or one with other escapes.
      '{ "format": "tarball/3", "root": {} }',
      '{ "budget": 4, "format": ["espalier-summary/1"] }',
      '{ "format": "\\u0065spalier-summary/1" }',
      '{ "format": "espalier-summary/1 draft" }',
      // No format at all, an array, or not JSON.
      JSON.stringify({ ...summary, format: undefined }),
      '[{ "format": "espalier-summary/1" }]',
      "format: espalier-summary/1\n",
    ]) {
      expect(verdict(text), text).toBeNull();
    }
  });

  it("stops at once at a first member espalier does not write, without reading its value", () => {
    const head = new OutputHead();
    expect(head.read('{ "dependencies": { "kelp": ')).toBeNull();
    const later = new OutputHead();
    expect(later.read('{ "foci": ["a", "b"')).toBeUndefined();
    expect(later.read('], "format": "espalier-summary/1"')).toBe("espalier-summary/1");
  });

  it("reads on past its first 16K units only while the members sort before format (long foci), not after a long root", () => {
    const long = "x".repeat(ANY_ORDER_UNITS);
    const foci = JSON.stringify({ budget: 4, foci: [long, long], format: "espalier-summary/1" });
    expect(verdict(foci)).toBe("espalier-summary/1");
    // A user's document whose first member has an output's name: given up at the limit, not held to its end.
    const root = JSON.stringify({ root: { name: long }, format: "espalier-summary/1" });
    expect(verdict(root)).toBeNull();
    const head = new OutputHead();
    expect(head.read(`{"notes": ["${long}`)).toBeNull();
  });

  it("knows exactly the top-level members docs/summary.schema.json and docs/diff.schema.json allow", () => {
    const members = new Set<string>();
    for (const file of ["summary", "diff"]) {
      const schema = JSON.parse(
        readFileSync(new URL(`../../docs/${file}.schema.json`, import.meta.url), "utf8"),
      );
      expect(schema.additionalProperties).toBe(false);
      for (const key of Object.keys(schema.properties)) members.add(key);
    }
    expect([...OUTPUT_MEMBERS].sort()).toEqual([...members].sort());
  });
});
