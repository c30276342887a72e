import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { stringify } from "yaml";
import { loadTree } from "../../src/load/index.js";
import type { LoadOptions } from "../../src/load/load-options.js";
import type { Tree } from "../../src/model/tree.js";
import { opts } from "./helpers.js";

// loadTree(text, { keepOtherFields: true }) keeps, in the one read, every field its records hold beside
// those read for the tree: the same fields, with the same text, as a second read naming the fields the
// first one listed (reading.otherFields) kept before (a diff without --compare-field read so twice).

/** The fields kept and listed by one read that keeps the other fields, and by two reads. */
function bothWays(text: string, given: Partial<LoadOptions>): { one: Kept; two: Kept } {
  const first = loadTree(text, opts(given));
  const listed = first.reading?.otherFields ?? [];
  const second = loadTree(text, opts({ ...given, keepFields: [...listed], optionalKeepFields: [...listed] }));
  const one = loadTree(text, opts({ ...given, keepOtherFields: true }));
  return { one: kept(one), two: { fields: kept(second).fields, listed: [...listed] } };
}

interface Kept {
  fields: Record<string, readonly string[]>;
  listed: string[];
}

function kept(tree: Tree): Kept {
  return { fields: Object.fromEntries(tree.fields), listed: [...(tree.reading?.otherFields ?? [])] };
}

// Column names beside id, parent and name; `size` is read for the tree, so none of them.
const extraNames = fc.uniqueArray(fc.constantFrom("team", "title", "version", "note", "cost centre", "é"), {
  maxLength: 4,
});
// Parents: row r's parent is an earlier row (a tree), the first row none.
const parents = fc
  .integer({ min: 1, max: 12 })
  .chain((n) =>
    fc.tuple(
      ...Array.from({ length: n }, (_, r) => (r === 0 ? fc.constant(0) : fc.integer({ min: 1, max: r }))),
    ),
  );
// CSV cells with the characters RFC 4180 §2.6 and §2.7 quote: commas, quotes, line breaks.
const csvCell = fc.string({ unit: fc.constantFrom("a", "b", " ", ",", '"', "\n", "é", "7"), maxLength: 6 });
const tsvCell = fc.string({ unit: fc.constantFrom("a", "b", " ", ",", "é", "7"), maxLength: 6 });
// A JSON value of a record (RFC 8259 §3): a scalar, an object, an array, or the member absent.
const jsonValue = fc.oneof(
  fc.constant(undefined),
  fc.string({ maxLength: 4 }),
  fc.integer(),
  fc.boolean(),
  fc.constant(null),
  fc.dictionary(fc.constantFrom("k", "j"), fc.integer(), { maxKeys: 2 }),
  fc.array(fc.string({ maxLength: 2 }), { maxLength: 2 }),
);

// Values of the other fields of up to 12 records, 5 a record.
const recordValues = fc.array(jsonValue, { minLength: 60, maxLength: 60 });

/** Record `r`'s other fields: each of `names` with its value, absent where the value is undefined. */
function record(names: readonly string[], values: readonly unknown[], r: number): Record<string, unknown> {
  const fields: Record<string, unknown> = {};
  names.forEach((field, c) => {
    if (values[r * 5 + c] !== undefined) fields[field] = values[r * 5 + c];
  });
  return fields;
}

function quotedCsv(cell: string): string {
  return /[",\n]/.test(cell) ? `"${cell.replaceAll('"', '""')}"` : cell;
}

describe("loadTree(text, { keepOtherFields }) keeps what a second read named them would", () => {
  it("keeps a CSV table's other columns, in one read", () => {
    fc.assert(
      fc.property(
        extraNames,
        parents,
        fc.array(csvCell, { minLength: 60, maxLength: 60 }),
        (names, ps, cells) => {
          const header = ["id", "parent", "name", ...names].map(quotedCsv).join(",");
          const rows = ps.map((p, r) =>
            [String(r + 1), p === 0 ? "" : String(p), `n${r}`, ...names.map((_, c) => cells[r * 5 + c])]
              .map(quotedCsv)
              .join(","),
          );
          const { one, two } = bothWays(`${header}\n${rows.join("\n")}\n`, { format: "csv" });
          expect(one).toEqual(two);
          expect(one.listed).toEqual(names);
        },
      ),
    );
  });

  it("keeps a TSV table's other columns, in one read", () => {
    fc.assert(
      fc.property(
        extraNames,
        parents,
        fc.array(tsvCell, { minLength: 60, maxLength: 60 }),
        (names, ps, cells) => {
          const rows = ps.map((p, r) =>
            [String(r + 1), p === 0 ? "" : String(p), `n${r}`, ...names.map((_, c) => cells[r * 5 + c])].join(
              "\t",
            ),
          );
          const text = `${["id", "parent", "name", ...names].join("\t")}\n${rows.join("\n")}\n`;
          const { one, two } = bothWays(text, { format: "tsv" });
          expect(one).toEqual(two);
        },
      ),
    );
  });

  it("keeps JSON rows' other fields, nested values as their JSON text", () => {
    fc.assert(
      fc.property(extraNames, parents, recordValues, (names, ps, values) => {
        const rows = ps.map((p, r) => ({
          id: `r${r + 1}`,
          parent: p === 0 ? null : `r${p}`,
          name: `n${r}`,
          ...record(names, values, r),
        }));
        const { one, two } = bothWays(JSON.stringify(rows), { format: "rows" });
        expect(one).toEqual(two);
      }),
    );
  });

  it("keeps the other fields of records keyed by path (a lock file's packages)", () => {
    fc.assert(
      fc.property(extraNames, parents, recordValues, (names, ps, values) => {
        const paths: string[] = [];
        const packages: Record<string, Record<string, unknown>> = {};
        ps.forEach((p, r) => {
          paths[r] = r === 0 ? "" : `${paths[p - 1] === "" ? "" : `${paths[p - 1]}/`}node_modules/n${r}`;
          packages[paths[r]] = record(names, values, r);
        });
        const text = JSON.stringify({ name: "tidewater", lockfileVersion: 3, packages });
        expect(loadTree(text, opts({ format: "json" })).reading?.shape).toBe("path-map");
        const { one, two } = bothWays(text, { format: "json" });
        expect(one).toEqual(two);
      }),
    );
  });

  // Nested node objects: a name, children as an array, and other fields of any JSON value, absent on some.
  const nested = fc.letrec((tie) => ({
    node: fc.record({
      extra: fc.array(
        fc.tuple(fc.constantFrom("team", "title", "version", "path", "cost centre"), jsonValue),
        {
          maxLength: 3,
        },
      ),
      children: fc.oneof(
        { depthSize: "small", withCrossShrink: true },
        fc.constant([]),
        fc.array(tie("node"), { maxLength: 3 }),
      ),
    }),
  })).node as fc.Arbitrary<Shape>;

  it("keeps nested JSON node objects' other fields, read streamed", () => {
    fc.assert(
      fc.property(nested, (shape) => {
        const { one, two } = bothWays(JSON.stringify(document(shape)), { format: "json" });
        expect(one).toEqual(two);
      }),
    );
  });

  it("keeps nested YAML node objects' other fields", () => {
    fc.assert(
      fc.property(nested, (shape) => {
        const { one, two } = bothWays(stringify(document(shape)), { format: "yaml" });
        expect(one).toEqual(two);
      }),
    );
  });

  it("keeps a field first met past the 1,000th node object, which the sample of fields did not see", () => {
    const children = Array.from({ length: 1500 }, (_, k) => ({
      name: `crate-${k}`,
      ...(k >= 1200 ? { owner: `quay-${k % 3}` } : {}),
    }));
    for (const text of [
      JSON.stringify({ name: "harbour", children }),
      stringify({ name: "harbour", children }),
    ]) {
      const format = text.startsWith("{") ? "json" : "yaml";
      expect(loadTree(text, opts({ format })).reading?.otherFields).toBeUndefined();
      const tree = loadTree(text, opts({ format, keepOtherFields: true }));
      expect(tree.reading?.otherFields).toEqual(["owner"]);
      const owner = tree.fields.get("owner")!;
      expect(owner).toHaveLength(1501);
      expect(owner[1200]).toBe("");
      expect(owner[1201]).toBe("quay-0");
      expect(owner.filter((v) => v !== "")).toHaveLength(300);
    }
  });

  it("keeps nothing more without keepOtherFields", () => {
    const text = "id,parent,name,team\n1,,Harbour board,quay\n2,1,Night crew,dock\n";
    const tree = loadTree(text, opts({ format: "csv" }));
    expect([...tree.fields.keys()]).toEqual([]);
    expect(tree.reading?.otherFields).toEqual(["team"]);
    const one = loadTree(text, opts({ format: "csv", keepOtherFields: true }));
    expect(Object.fromEntries(one.fields)).toEqual({ team: ["quay", "dock"] });
  });
});

// Graphs: loadTree(text, { graph: true, keepOtherFields: true }) keeps, in the one read, the fields a
// read naming them (keepFields) keeps, and lists them as reading.otherFields; on main's build a graph
// kept none (a diff compared only `version`).

/** The kept fields of one read keeping the other fields, and of a read naming the fields it listed. */
function graphBothWays(text: string, given: Partial<LoadOptions>): { one: Kept; two: Kept } {
  const one = loadTree(text, opts({ ...given, graph: true, keepOtherFields: true }));
  const listed = [...(one.reading?.otherFields ?? [])];
  const named = loadTree(
    text,
    opts({ ...given, graph: true, keepFields: listed, optionalKeepFields: listed }),
  );
  return { one: kept(one), two: { fields: kept(named).fields, listed } };
}

// Each node after the first under one or two earlier nodes (a shared node: its second row).
const dag = fc
  .integer({ min: 1, max: 10 })
  .chain((n) =>
    fc.tuple(
      ...Array.from({ length: n }, (_, r) =>
        r === 0
          ? fc.constant([] as number[])
          : fc.uniqueArray(fc.integer({ min: 0, max: r - 1 }), { minLength: 1, maxLength: 2 }),
      ),
    ),
  );

describe("loadTree(text, { graph, keepOtherFields }) keeps what a read naming them would", () => {
  it("keeps a graph table's other columns, a shared node's record from its first row", () => {
    fc.assert(
      fc.property(
        extraNames,
        dag,
        fc.array(csvCell, { minLength: 50, maxLength: 50 }),
        (names, ps, cells) => {
          const header = ["id", "parent", "name", ...names].map(quotedCsv).join(",");
          const rows = ps.flatMap((parents, r) => {
            const own = names.map((_, c) => cells[r * 5 + c]);
            const first = [`s${r}`, r === 0 ? "" : `s${parents[0]}`, `n${r}`, ...own];
            // A later row of the id leaves the cells empty.
            const later = parents.slice(1).map((p) => [`s${r}`, `s${p}`, "", ...own.map(() => "")]);
            return [first, ...later].map((row) => row.map(quotedCsv).join(","));
          });
          const { one, two } = graphBothWays(`${header}\n${rows.join("\n")}\n`, { format: "csv" });
          expect(one).toEqual(two);
          expect(one.listed).toEqual(names);
        },
      ),
    );
  });

  it("keeps an adjacency map's record fields, nested values as their JSON text", () => {
    fc.assert(
      fc.property(extraNames, dag, recordValues, (names, ps, values) => {
        const map: Record<string, Record<string, unknown>> = {};
        ps.forEach((_, r) => {
          map[`s${r}`] = { ...record(names, values, r), children: [] };
        });
        ps.forEach((parents, r) => {
          for (const p of parents) (map[`s${p}`].children as string[]).push(`s${r}`);
        });
        const { one, two } = graphBothWays(JSON.stringify(map), { format: "json" });
        expect(one).toEqual(two);
        // Listed: the names some record holds, in the order first met.
        const held = names.filter((f) => Object.values(map).some((rec) => Object.hasOwn(rec, f)));
        expect([...one.listed].sort()).toEqual([...held].sort());
      }),
    );
  });

  it("keeps an edge table's other columns by each node's edges in, by parent where they differ", () => {
    // parent,child,since: db has one edge in, cache two with different cells, hub none.
    const text = "parent,child,since\nhub,api,2024\nhub,db,\napi,cache,2024\ndb,cache,2026\n";
    const tree = loadTree(text, opts({ format: "edges", keepOtherFields: true }));
    expect(tree.reading?.otherFields).toEqual(["since"]);
    const since = tree.fields.get("since")!;
    const at = (name: string) =>
      since[[...Array(tree.length).keys()].find((i) => tree.name.get(i) === name)!];
    expect(["hub", "api", "db", "cache"].map(at)).toEqual(["", "2024", "", '{"api":"2024","db":"2026"}']);
    // Without keepOtherFields (a summary), none.
    expect([...loadTree(text, opts({ format: "edges" })).fields.keys()]).toEqual([]);
  });
});

interface Shape {
  extra: [string, unknown][];
  children: Shape[];
}

/** The node objects of a shape, named by their place (`n`, `n0`, `n01`, …). */
function document(shape: Shape, name = "n"): Record<string, unknown> {
  const node: Record<string, unknown> = { name };
  for (const [field, value] of shape.extra) if (value !== undefined) node[field] = value;
  if (shape.children.length > 0)
    node.children = shape.children.map((child, k) => document(child, `${name}${k}`));
  return node;
}
