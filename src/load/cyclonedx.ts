import { quoted, quotedList, say } from "../errors.js";
import type { GraphNodes } from "../model/graph-nodes.js";
import type { ReadingNote } from "../model/reading-note.js";
import { adjacencyNodes } from "./adjacency.js";
import type { LoadOptions } from "./load-options.js";

/**
 * A CycloneDX SBOM (ECMA-424, the CycloneDX Bill of Materials Standard) says so in its first members:
 * `"bomFormat": "CycloneDX"` beside a `specVersion`. Whether the start of a JSON text `head` does, so
 * that the document is read whole and looked at (see {@link sbomGraph}); no other document pays for it.
 */
export function mayBeSbom(
  head: string,
  options: Pick<LoadOptions, "graph" | "readAs" | "startAt" | "childrenFieldNamed">,
): boolean {
  if (
    options.graph ||
    options.readAs !== undefined ||
    options.startAt !== undefined ||
    options.childrenFieldNamed
  )
    return false;
  return /"bomFormat"\s*:\s*"CycloneDX"/.test(head);
}

/** The records' children field: the SBOM's own name for the list (`dependencies[].dependsOn`). */
const DEPENDS_ON = "dependsOn";

/**
 * A parsed CycloneDX document's dependency graph (ECMA-424: `dependencies` lists, for a component's
 * `bom-ref` under `ref`, the refs it `dependsOn`), read as records naming their children
 * (adjacency.ts): one node per component (`metadata.component`, then `components`, nested ones
 * included) and per ref no component has, named by its component's `name`. A node's id is that name,
 * or `name@version` where two components share a name (then its bom-ref where those clash too), so a
 * diff of two versions of the SBOM pairs a component whose version changed and compares its `version`
 * field; the component's other fields are its record's (for `--label`, and compared by a diff but
 * bom-ref: {@link NOT_COMPARED}; an object or array by its JSON text). Nodes come in order: the
 * described component, the refs as the dependencies list names them, then components it leaves out
 * (each a top-level node: nothing depends on it). Undefined when `doc` is no CycloneDX document with a
 * dependencies list: it is read as any other document then.
 */
export function sbomGraph(doc: unknown, options: LoadOptions): GraphNodes | undefined {
  if (!isRecord(doc) || doc.bomFormat !== "CycloneDX" || typeof doc.specVersion !== "string")
    return undefined;
  const dependencies = doc.dependencies;
  if (!Array.isArray(dependencies) || dependencies.length === 0) return undefined;
  if (!dependencies.every((d) => isRecord(d) && typeof d.ref === "string")) return undefined;
  const components: Record<string, unknown>[] = [];
  const metadata = isRecord(doc.metadata) ? doc.metadata : {};
  const described = isRecord(metadata.component) ? metadata.component : undefined;
  const collect = (list: unknown) => {
    if (!Array.isArray(list)) return;
    for (const c of list) {
      if (!isRecord(c)) continue;
      components.push(c);
      collect(c.components);
    }
  };
  if (described) {
    components.push(described);
    collect(described.components);
  }
  collect(doc.components);
  const byRef = new Map<string, Record<string, unknown>>();
  for (const c of components) {
    const ref = c["bom-ref"];
    if (typeof ref === "string" && !byRef.has(ref)) byRef.set(ref, c);
  }
  const refs: string[] = [];
  const seen = new Set<string>();
  const mention = (ref: string) => {
    if (seen.has(ref)) return;
    seen.add(ref);
    refs.push(ref);
  };
  const rootRef = typeof described?.["bom-ref"] === "string" ? (described["bom-ref"] as string) : undefined;
  if (rootRef !== undefined) mention(rootRef);
  for (const d of dependencies as Record<string, unknown>[]) {
    mention(d.ref as string);
    if (Array.isArray(d.dependsOn)) for (const to of d.dependsOn) if (typeof to === "string") mention(to);
  }
  const named = refs.length;
  for (const ref of byRef.keys()) mention(ref);
  const idOf = nodeIds(refs, byRef);
  const dependsOn = new Map<string, string[]>();
  for (const d of dependencies as Record<string, unknown>[]) {
    const list = dependsOn.get(d.ref as string) ?? [];
    if (Array.isArray(d.dependsOn))
      for (const to of d.dependsOn) if (typeof to === "string" && to !== "") list.push(idOf.get(to)!);
    dependsOn.set(d.ref as string, list);
  }
  const rows = refs.map((ref) => {
    const record: Record<string, unknown> = {};
    // Nested components are nodes of their own; every other field is the component's (hashes and
    // licenses as their JSON text).
    for (const [key, value] of Object.entries(byRef.get(ref) ?? {}))
      if (key !== "components") record[key] = value;
    record["bom-ref"] = ref;
    if (typeof record.name !== "string" || record.name === "") record.name = ref;
    record[SBOM_ID] = idOf.get(ref);
    record[DEPENDS_ON] = dependsOn.get(ref) ?? [];
    return record;
  });
  const graph = adjacencyNodes(
    rows,
    { ...options, idField: SBOM_ID, childrenField: DEPENDS_ON },
    NOT_COMPARED,
  );
  const root = described && typeof described.name === "string" ? described.name : undefined;
  const apart = rows.slice(named).map((row) => row.name as string);
  const note = sbomNote(doc.specVersion, named, apart, root);
  // The fields built here for the reading are no fields of the SBOM's.
  const recordFields = (graph.recordFields ?? []).filter((f) => f !== SBOM_ID && f !== DEPENDS_ON);
  return { ...graph, linkedBy: "sbom", recordFields, notes: [...(graph.notes ?? []), note] };
}

/**
 * The component fields a diff does not compare by default (LoadOptions.keepOtherFields), though it
 * compares every other one (a changed hash, purl or license of the same version is a change): `bom-ref`
 * (ECMA-424: an identifier unique within one BOM by which other parts of it refer to the component; the
 * wording from memory) links the dependencies, which the graph is read by; its text is the generator's
 * choice, which may hold the build's folder (`path+file:///…/.tmpXdQ78X/…#cryptography-rust@0.1.0`), so
 * two builds of one tree would differ in every such component. `--compare-field bom-ref` compares it.
 */
const NOT_COMPARED = ["bom-ref"];

/** The field of the records built above that holds each node's id (none of CycloneDX's own). */
const SBOM_ID = "\u0000id";

/**
 * Each ref's node id: its component's name where no other component has it; else `name@version`, unless
 * that too is shared (or there is no name or component), when the ref itself.
 */
function nodeIds(
  refs: readonly string[],
  byRef: ReadonlyMap<string, Record<string, unknown>>,
): Map<string, string> {
  const nameOf = (ref: string) => {
    const name = byRef.get(ref)?.name;
    return typeof name === "string" && name !== "" ? name : undefined;
  };
  const withVersion = (ref: string) => {
    const version = byRef.get(ref)?.version;
    return typeof version === "string" && version !== "" ? `${nameOf(ref)}@${version}` : undefined;
  };
  const count = (texts: (string | undefined)[]) => {
    const counts = new Map<string, number>();
    for (const t of texts) if (t !== undefined) counts.set(t, (counts.get(t) ?? 0) + 1);
    return counts;
  };
  const names = count(refs.map(nameOf));
  const versions = count(refs.map((ref) => (nameOf(ref) === undefined ? undefined : withVersion(ref))));
  const ids = new Map<string, string>();
  const used = new Set<string>();
  for (const ref of refs) {
    const name = nameOf(ref);
    const versioned = name === undefined ? undefined : withVersion(ref);
    let id = ref;
    if (name !== undefined && names.get(name) === 1) id = name;
    else if (versioned !== undefined && versions.get(versioned) === 1) id = versioned;
    // A name equal to another component's ref (or to a ref with no component): the ref keeps its own.
    if (used.has(id)) id = ref;
    used.add(id);
    ids.set(ref, id);
  }
  return ids;
}

/**
 * SBOM_DEPENDENCIES: the document was read as its dependency graph, not as its values; says how many
 * nodes, from which component down, how they are named, and what reads the values instead.
 */
function sbomNote(
  specVersion: string,
  named: number,
  apart: readonly string[],
  root: string | undefined,
): ReadingNote {
  const from = root === undefined ? "" : say`, from the component it describes, ${quoted.name(root)}, down`;
  const others =
    apart.length === 0
      ? ""
      : say`, and ${apart.length} ${apart.length === 1 ? "component" : "components"} it does not name, each a top-level node (${quotedList("name", apart, 3)})`;
  return {
    code: "SBOM_DEPENDENCIES",
    parts: say`read as a CycloneDX SBOM's dependency graph (specVersion ${specVersion}, ECMA-424): ${named} ${named === 1 ? "node" : "nodes"} its "dependencies" list names${from}${others}; each named by its component's name, with its version a field (--label '{name} {version}'); --read-as values reads the document's values instead`,
  };
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}
