import { describe, expect, it } from "vitest";
import { loadTree } from "../../src/load/index.js";
import { cli } from "../helpers/cli.js";
import { slots } from "../helpers/graph-slots.js";
import { opts } from "./helpers.js";

// A CycloneDX 1.5 SBOM (ECMA-424: bomFormat, specVersion, metadata.component, components with
// bom-ref, dependencies with ref and dependsOn) of a fictional company's application, Tidewater. Two
// versions of one component's name (tern-fmt) stand side by side, as a lock file can hold them; a
// component nests another (a build target), which no dependency names.
function sbom(ledgerVersion = "1.0.4", harborDeps = ["pkg:npm/tern-fmt@2.1.0"]) {
  const component = (name: string, version: string) => ({
    type: "library",
    "bom-ref": `pkg:npm/${name}@${version}`,
    name,
    version,
    purl: `pkg:npm/${name}@${version}`,
  });
  return {
    bomFormat: "CycloneDX",
    specVersion: "1.5",
    version: 1,
    metadata: {
      component: {
        ...component("tidewater-app", "4.2.0"),
        components: [{ type: "application", "bom-ref": "tidewater-app-cli", name: "tidewater-app-cli" }],
      },
    },
    components: [
      { ...component("ledger-core", ledgerVersion), "bom-ref": "pkg:npm/ledger-core" },
      component("tern-fmt", "2.1.0"),
      component("tern-fmt", "1.9.3"),
      component("harbor-api", "0.8.0"),
      component("mooring-log", "3.0.1"),
    ],
    dependencies: [
      { ref: "pkg:npm/tidewater-app@4.2.0", dependsOn: ["pkg:npm/ledger-core", "pkg:npm/harbor-api@0.8.0"] },
      { ref: "pkg:npm/ledger-core", dependsOn: ["pkg:npm/tern-fmt@1.9.3", "pkg:npm/mooring-log@3.0.1"] },
      { ref: "pkg:npm/harbor-api@0.8.0", dependsOn: harborDeps },
      { ref: "pkg:npm/tern-fmt@2.1.0", dependsOn: ["pkg:npm/mooring-log@3.0.1"] },
      { ref: "pkg:npm/tern-fmt@1.9.3" },
      { ref: "pkg:npm/mooring-log@3.0.1", dependsOn: [] },
    ],
  };
}

/**
 * The independent answer, from the document as JSON.parse gives it: every bom-ref of a component
 * (nested ones too) and every ref the dependencies list names, once; and the edges it lists.
 */
function refsByWalk(doc: ReturnType<typeof sbom>) {
  const refs = new Set<string>();
  const walk = (list: readonly { "bom-ref": string; components?: unknown }[]) => {
    for (const c of list) {
      refs.add(c["bom-ref"]);
      walk((c.components ?? []) as never);
    }
  };
  walk([doc.metadata.component]);
  walk(doc.components);
  let edges = 0;
  for (const d of doc.dependencies) {
    refs.add(d.ref);
    for (const to of d.dependsOn ?? []) {
      refs.add(to);
      edges++;
    }
  }
  return { refs, edges };
}

describe("loadTree(CycloneDX SBOM)", () => {
  it("reads a CycloneDX document as its dependency graph, a node per ref, named by component name", () => {
    const doc = JSON.parse(JSON.stringify(sbom()));
    const tree = loadTree(JSON.stringify(doc, null, 2), opts({ rootName: "tidewater.cdx.json" }));
    const { refs, edges } = refsByWalk(doc);
    const references = [...(tree.referenceTo ?? [])].filter((r) => r !== -1).length;
    // Every ref once, under one synthetic root (the nested build target is a second top-level node).
    const full = tree.length - 1 - references;
    expect(full).toBe(refs.size);
    // Every listed edge is a full entry's place under its parent or a reference (two top-level nodes).
    expect(full - 2 + references).toBe(edges);
    expect(slots(tree)).toEqual([
      "tidewater.cdx.json",
      "  tidewater-app",
      "    ledger-core",
      "      tern-fmt",
      "      &mooring-log",
      "    harbor-api",
      "      tern-fmt",
      "        mooring-log",
      "  tidewater-app-cli",
    ]);
    // Ids: the name, or name@version where two components share the name.
    expect([3, 6].map((i) => tree.ids?.get(i))).toEqual(["tern-fmt@1.9.3", "tern-fmt@2.1.0"]);
    expect(tree.ids?.get(2)).toBe("ledger-core");
    expect(tree.reading?.shape).toBe("graph");
    expect(tree.reading?.notes?.map((n) => n.code)).toEqual(["SBOM_DEPENDENCIES"]);
  });

  it("keeps each component's version and other scalar fields for labels", () => {
    const tree = loadTree(JSON.stringify(sbom()), opts({ keepFields: ["version", "purl"] }));
    const names: string[] = [];
    for (let i = 0; i < tree.length; i++) names.push(tree.name.get(i));
    const i = names.indexOf("ledger-core");
    expect(tree.fields.get("version")?.[i]).toBe("1.0.4");
    expect(tree.fields.get("purl")?.[i]).toBe("pkg:npm/ledger-core@1.0.4");
  });

  it("reads the values under --read-as values, and a document without dependencies as before", () => {
    const values = loadTree(JSON.stringify(sbom()), opts({ readAs: "values" }));
    expect(values.reading?.shape).toBe("values");
    const { dependencies: _, ...bare } = sbom();
    expect(loadTree(JSON.stringify(bare), opts()).reading?.shape).not.toBe("graph");
  });

  it("espalier diff of two versions of the SBOM says a version bump as an edit and a dropped link as unlinked", async () => {
    const result = await cli(["diff", "old.cdx.json", "new.cdx.json", "--format", "json", "--budget", "30"], {
      files: {
        "old.cdx.json": JSON.stringify(sbom()),
        "new.cdx.json": JSON.stringify(sbom("1.0.5", [])),
      },
    });
    expect(result.code).toBe(0);
    const json = JSON.parse(result.stdout);
    expect(json.changes).toMatchObject({ added: 0, removed: 0, edited: 1, unlinked: 1 });
  });
});
