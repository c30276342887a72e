import { Buffer } from "node:buffer";
import { describe, expect, it } from "vitest";
import { isMap, isSeq, type Node, parseAllDocuments } from "yaml";
import { cli } from "../helpers/cli.js";

// Field test: a YAML stream of several documents, as deployment manifests and many generated
// configurations are written (YAML 1.2.2 §9.2, "Streams": documents separated by `---` markers),
// reduced to an invented tidewater deployment. It was refused with PARSE_YAML ("split the file").

const stream = [
  "# tidewater deployment",
  "kind: Service",
  "metadata: {name: ledger, labels: {tier: back}}",
  "---",
  "kind: Deployment",
  "metadata: {name: ledger}",
  "spec:",
  "  replicas: 3",
  "  ports: [8080, 8081]",
  "---",
  "kind: ConfigMap",
  "data: {retries: '5'}",
  "",
].join("\n");

/** Values of each document by the yaml package (the registry's reference reader): every map, seq and scalar. */
function valuesOf(text: string): number[] {
  const count = (v: Node | null): number =>
    1 +
    (isMap(v)
      ? v.items.reduce((n, pair) => n + count(pair.value as Node | null), 0)
      : isSeq(v)
        ? v.items.reduce((n: number, item) => n + count(item as Node | null), 0)
        : 0);
  const docs = parseAllDocuments(text);
  if (!Array.isArray(docs)) return [];
  return docs.map((doc) => count(doc.contents as Node | null));
}

describe("a YAML stream of several documents", () => {
  it("reads each document's values under the root, named by index, the bytes adding up to the file", async () => {
    const result = await cli(["deploy.yaml", "--format", "json", "--budget", "100"], {
      files: { "deploy.yaml": stream },
    });
    expect(result.stderr).toBe("");
    const json = JSON.parse(result.stdout);
    expect(json.input.shape).toBe("values");
    const perDocument = valuesOf(stream);
    expect(perDocument).toEqual([6, 9, 4]);
    // The root and every value of every document.
    expect(json.totals.nodes).toBe(1 + 6 + 9 + 4);
    expect(json.totals.size).toBe(Buffer.byteLength(stream));
    expect(json.root.children.map((c: { name: string }) => c.name)).toEqual(["0", "1", "2"]);
    expect(json.root.children.map((c: { nodes: number }) => c.nodes)).toEqual(perDocument);
    // The `0`, `1`, `2` read like a list's items: the output says they are documents.
    expect(json.input.documents).toBe(perDocument.length);
  });

  it("says on the header that the root's children are documents, and how many each version has", async () => {
    const files = { "deploy.yaml": stream, "one.yaml": "kind: Service\n" };
    const summary = await cli(["deploy.yaml", "--budget", "5"], { files });
    expect(summary.stdout.split("\n")[0]).toMatch(/; every value a node; 3 YAML documents, named 0 to 2; /);
    const single = await cli(["one.yaml", "--read-as", "values"], { files });
    expect(single.stdout).not.toContain("YAML documents");
    const diff = await cli(["diff", "one.yaml", "deploy.yaml", "--budget", "5"], { files });
    expect(diff.stdout.split("\n")[0]).toContain("; 1 -> 3 YAML documents; ");
  });

  it("still refuses a stream read as nodes, naming --read-as values", async () => {
    const result = await cli(["deploy.yaml", "--read-as", "nodes"], { files: { "deploy.yaml": stream } });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/^espalier: deploy\.yaml:4:1: .*--read-as values \[PARSE_YAML\]\n$/);
  });
});
