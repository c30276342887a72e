import { describe, expect, it } from "vitest";
import { stringify } from "yaml";
import { loadTree } from "../../src/load/index.js";
import { loadTreeFromStream } from "../../src/load/stream/index.js";
import { slots } from "../helpers/graph-slots.js";
import { caught, opts } from "./helpers.js";
import { chunked, utf8 } from "./stream/helpers.js";

// A fictional company's packages (Tidewater): each record names its id and the ids it depends on,
// as a CycloneDX SBOM's `dependencies: [{"ref": …, "dependsOn": [...]}]` does (ECMA-424).
const RECORDS = [
  { ref: "tidewater-app", dependsOn: ["ledger-core", "tern-fmt", "harbor-cli"] },
  { ref: "ledger-core", dependsOn: ["mooring-log", "buoy-math"] },
  { ref: "tern-fmt", dependsOn: ["mooring-log"] },
  { ref: "harbor-cli", dependsOn: ["tern-fmt", "tidewater-app"] },
  { ref: "mooring-log", dependsOn: [] },
];

/**
 * The independent answer, from the records as JSON.parse gives them: the distinct ids (records' and
 * those they list) and each id's listed children. A graph shown as a spanning tree has one full entry
 * per id, and under it one slot (a full entry or a reference) per child it lists.
 */
function byWalk(records: readonly { ref: string; dependsOn: readonly string[] }[]) {
  const ids = new Set<string>();
  const children = new Map<string, string[]>();
  for (const r of records) {
    ids.add(r.ref);
    children.set(r.ref, [...new Set(r.dependsOn)]);
    for (const c of r.dependsOn) ids.add(c);
  }
  return { ids, children };
}

const graphOpts = (format: "json" | "yaml") =>
  opts({ format, graph: true, idField: "ref", childrenField: "dependsOn" });

describe("loadTree(rows naming their children, --graph)", () => {
  it("reads records naming their children as an adjacency map: every node once, references, a cycle", () => {
    const tree = loadTree(JSON.stringify(RECORDS), graphOpts("json"));
    // The graph rules (docs/input.md): tern-fmt under its deepest parent (harbor-cli, depth 1, beats
    // tidewater-app, depth 0), so mooring-log under tern-fmt (depth 2, beats ledger-core), the cycle
    // back to the root a reference.
    expect(slots(tree)).toEqual([
      "tidewater-app",
      "  ledger-core",
      "    &mooring-log",
      "    buoy-math",
      "  &tern-fmt",
      "  harbor-cli",
      "    tern-fmt",
      "      mooring-log",
      "    &tidewater-app",
    ]);
  });

  it("gives one full entry per id and one slot per listed child, as a walk of the parsed records does", async () => {
    const want = byWalk(JSON.parse(JSON.stringify(RECORDS)));
    for (const tree of [
      loadTree(JSON.stringify(RECORDS), graphOpts("json")),
      loadTree(stringify(RECORDS), graphOpts("yaml")),
      await loadTreeFromStream(chunked(utf8(JSON.stringify(RECORDS)), [5, 40, 41]), graphOpts("json")),
    ]) {
      const full = new Map<string, number>();
      for (let i = 0; i < tree.length; i++)
        if ((tree.referenceTo?.[i] ?? -1) === -1) full.set(tree.name.get(i), i);
      expect(new Set(full.keys())).toEqual(want.ids);
      expect(full.size).toBe(tree.length - [...tree.referenceTo!].filter((r) => r !== -1).length);
      for (const [id, i] of full) {
        const under: string[] = [];
        for (let j = 0; j < tree.length; j++) if (tree.parent[j] === i) under.push(tree.name.get(j));
        expect(under, id).toEqual(want.children.get(id) ?? []);
      }
    }
  });

  it("names a node by its record's name field, and keeps its other fields for labels", () => {
    const records = [
      { ref: "p1", name: "tidewater-app", version: "4.2.0", dependsOn: ["p2"] },
      { ref: "p2", name: "ledger-core", version: "1.0.4", dependsOn: [] },
    ];
    const tree = loadTree(JSON.stringify(records), { ...graphOpts("json"), keepFields: ["version"] });
    expect(slots(tree)).toEqual(["tidewater-app", "  ledger-core"]);
    expect(tree.fields.get("version")).toEqual(["4.2.0", "1.0.4"]);
  });

  it("is DUPLICATE_ID at the second row of a repeated id, and a row without an id is FIELD_MISSING at it", () => {
    const twice = caught(() =>
      loadTree('[{"ref":"a","dependsOn":["b"]},\n{"ref":"a","dependsOn":[]}]', graphOpts("json")),
    );
    expect(twice.code).toBe("DUPLICATE_ID");
    expect(twice.pos).toMatchObject({ line: 2 });
    const none = caught(() =>
      loadTree('[{"ref":"a","dependsOn":["b"]},\n{"dependsOn":[]}]', graphOpts("json")),
    );
    expect(none.code).toBe("FIELD_MISSING");
    expect(none.pos).toMatchObject({ line: 2 });
  });

  it("still reads rows linked by parent as a graph table, in JSON and in YAML", () => {
    const rows = [
      { ref: "a", parent: "" },
      { ref: "b", parent: "a" },
      { ref: "c", parent: "a" },
      { ref: "c", parent: "b" },
    ];
    for (const [format, text] of [
      ["json", JSON.stringify(rows)],
      ["yaml", stringify(rows)],
    ] as const) {
      const tree = loadTree(text, opts({ format, graph: true, idField: "ref" }));
      expect(slots(tree), format).toEqual(["a", "  b", "    c", "  &c"]);
    }
  });
});
