import { describe, expect, it } from "vitest";
import { loadTree } from "../../src/load/index.js";
import { renderJson } from "../../src/render/summary-json.js";
import { renderText } from "../../src/render/summary-text.js";
import { prepare, summarize } from "../../src/summarize.js";
import { cli } from "../helpers/cli.js";
import { caught, opts } from "../load/helpers.js";
import { oneErrorLine } from "./error-line.js";

const N = 1_000_000;

describe("espalier - (faults of structure): each named by its row or line", () => {
  it("a row that is its own parent: CYCLE at its row", async () => {
    // From standard input (not read again) a row's error names the line the row starts on.
    const r = await cli(["-", "--input-format", "csv"], { stdin: "id,parent\n1,\n2,2\n" });
    expect(oneErrorLine(r)).toMatchObject({ code: "CYCLE", line: 3 });
  });

  it("a longer cycle: CYCLE at its first row, also in JSON rows", async () => {
    const csv = await cli(["-", "--input-format", "csv"], { stdin: "id,parent\n1,\n2,4\n3,2\n4,3\n" });
    expect(oneErrorLine(csv)).toMatchObject({ code: "CYCLE", line: 3 });
    const rows = '[{"id":"r","parent":""},{"id":"a","parent":"b"},{"id":"b","parent":"a"}]';
    // A JSON row is placed at its "{".
    expect(oneErrorLine(await cli(["-", "--input-format", "rows"], { stdin: rows }))).toMatchObject({
      code: "CYCLE",
      line: 1,
      column: 25,
    });
  });

  it("a cycle names its fix: the option that reads the same rows as a graph, which reads them whole", async () => {
    const stdin = "id,parent\n1,\n2,3\n3,2\n";
    const r = await cli(["-", "--input-format", "csv"], { stdin });
    expect(oneErrorLine(r).code).toBe("CYCLE");
    expect(r.stderr).toContain("(--graph)");
    const graph = await cli(["-", "--input-format", "csv", "--graph", "--bare"], { stdin });
    expect(graph.code).toBe(0);
  });

  it("a cycle with no top-level row at all: CYCLE, not an empty tree", async () => {
    const r = await cli(["-", "--input-format", "csv"], { stdin: "id,parent\n1,2\n2,1\n" });
    expect(oneErrorLine(r)).toMatchObject({ code: "CYCLE", line: 2 });
  });

  it("a duplicate id: DUPLICATE_ID at the second row", async () => {
    const r = await cli(["-", "--input-format", "csv"], { stdin: "id,parent\n1,\n2,1\n2,1\n" });
    expect(oneErrorLine(r)).toMatchObject({ code: "DUPLICATE_ID", line: 4 });
  });

  it("a missing parent: MISSING_PARENT at the row that names it", async () => {
    const r = await cli(["-", "--input-format", "tsv"], { stdin: "id\tparent\n1\t\n2\t9\n" });
    expect(oneErrorLine(r)).toMatchObject({ code: "MISSING_PARENT", line: 3 });
  });

  it("a node with two parents (a YAML alias placed twice): one entry and a reference, counted once", async () => {
    const yaml = "name: quill\nchildren:\n  - &a {name: ledger, size: 4}\n  - *a\n";
    const r = await cli(["-", "--input-format", "yaml", "--format", "json"], { stdin: yaml });
    expect(r.code, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).totals).toEqual({ nodes: 2, size: 4 });
    const keyed = "name: quill\nchildren:\n  a: &x {children: {q: 1}}\n  b: *x\n";
    const text = await cli(["-", "--input-format", "yaml", "--bare"], { stdin: keyed });
    expect(text.code, text.stderr).toBe(0);
    expect(text.stdout).toMatch(/^\s*& b\s+full entry at a$/m);
  });

  it("a repeated path: DUPLICATE_PATH at the second line or row", async () => {
    expect(
      oneErrorLine(await cli(["-", "--input-format", "paths"], { stdin: "a/b\na/c\na/b\n" })),
    ).toMatchObject({
      code: "DUPLICATE_PATH",
      line: 3,
    });
    expect(
      oneErrorLine(await cli(["-", "--input-format", "csv"], { stdin: "path\na/b\na/b\n" })),
    ).toMatchObject({
      code: "DUPLICATE_PATH",
      line: 3,
    });
  });

  it("duplicate sibling names stay addressable: the N-th gets the path suffix ~~N, accepted back as a focus", async () => {
    const stdin = JSON.stringify({
      name: "r",
      children: [
        { name: "x", size: 1 },
        { name: "x", size: 2 },
      ],
    });
    const all = await cli(["-", "--format", "json"], { stdin });
    expect(JSON.parse(all.stdout).root.children.map((c: { path: string }) => c.path)).toEqual(["x", "x~~2"]);
    const second = await cli(["-", "--format", "json", "--focus", "x~~2"], { stdin });
    expect(second.code, second.stderr).toBe(0);
    const focused = JSON.parse(second.stdout).root.children.filter((c: { focus: boolean }) => c.focus);
    expect(focused.map((c: { size: number }) => c.size)).toEqual([2]);
  });
});

/** `{"name":"n0","children":[{"name":"n1","children":[…]}]}`, `depth` nodes deep. */
function chainJson(depth: number): string {
  const open: string[] = new Array(depth);
  for (let i = 0; i < depth; i++) open[i] = `{"name":"n${i}","size":1,"children":[`;
  return `${open.join("")}${"]}".repeat(depth)}`;
}

describe("a million nodes deep or wide (no recursion on the input's shape)", () => {
  it("loadTree(json) -> summarize -> text and JSON of a chain 1,000,000 deep: budget 40, and a focus at the bottom", () => {
    const prepared = prepare(loadTree(chainJson(N), opts({ format: "json" })));
    const result = summarize(prepared, { foci: [], budget: 40, importance: "depth" });
    const text = renderText(result.view, { units: "plain", sizes: true });
    expect(text.split("\n").length - 1).toBeLessThanOrEqual(40);
    const doc = JSON.parse(
      renderJson(result.view, { budget: 40, lines: result.selection.lines, foci: [], labels: false }),
    );
    expect(doc.totals).toEqual({ nodes: N, size: N });

    // The focus and its N - 1 ancestors are all forced: N lines, one each.
    const bottom = Array.from({ length: N - 1 }, (_, i) => `n${i + 1}`).join("/");
    const tight = () => summarize(prepared, { foci: [bottom], budget: N - 1, importance: "depth" });
    expect(caught(tight).code).toBe("BUDGET_TOO_SMALL");
    const deep = summarize(prepared, { foci: [bottom], budget: N, importance: "depth", chains: true });
    expect(deep.selection.admitted.length).toBe(N);
    // Chained only children share one line; without chains the text would hold a million squared
    // spaces of indentation, past the longest string the engine allows (see docs/reliability.md).
    const line = renderText(deep.view, { units: "plain", sizes: true, chains: true });
    expect(line.split("\n")).toHaveLength(2);
    // The numbers are the top node's: all N nodes, each of size 1 (one node per name on the line).
    expect(line).toContain(` / n${N - 1}  ${N.toLocaleString("en-US")} nodes, ${N.toLocaleString("en-US")}
`);
  }, 240_000); // a million-node chain takes ~20 s alone and over a minute on a busy shared machine

  it("espalier - of a path list with a node of 1,000,000 children, within budget 40", async () => {
    const lines = new Array<string>(N);
    // Byte sizes of 0 and up from 1,001 (a quarter of them 1 to 4 would read as whole KiB, all multiples of 4 as 1 KiB blocks).
    for (let i = 0; i < N; i++) lines[i] = `${(i % 7) * 1001}\tquill/c${i}`;
    const r = await cli(["-", "--input-format", "paths", "--budget", "40", "--format", "json"], {
      stdin: lines.join("\n"),
    });
    expect(r.code, r.stderr).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.lines).toBeLessThanOrEqual(40);
    expect(doc.totals.nodes).toBe(N + 1);
    expect(doc.root.children.length + doc.root.hidden.children).toBe(N);
  }, 240_000);
});
