import { describe, expect, it } from "vitest";
import type { InputFormat } from "../../src/load/load-options.js";
import { cli } from "../helpers/cli.js";
import { oneErrorLine } from "./error-line.js";

/** A YAML document whose aliases would expand to 9^levels values (the "billion laughs" shape). */
function laughs(levels: number): string {
  const lines = [`l0: &l0 [${Array(9).fill('"lol"').join(", ")}]`];
  for (let k = 1; k < levels; k++)
    lines.push(
      `l${k}: &l${k} [${Array(9)
        .fill(`*l${k - 1}`)
        .join(", ")}]`,
    );
  return lines.join("\n");
}

/** The same with node objects: each level a node whose nine children are aliases of the level below. */
function nodeLaughs(levels: number): string {
  const lines = ["l0: &l0 {name: lol}"];
  for (let k = 1; k < levels; k++)
    lines.push(
      `l${k}: &l${k} {name: n${k}, children: [${Array(9)
        .fill(`*l${k - 1}`)
        .join(", ")}]}`,
    );
  return lines.join("\n");
}

// These check what comes out (an error code, a short line, a small tree), not how fast: speed is
// checked by the benchmark (npm run bench), never by a timed unit test, which fails on a busy machine.
describe("espalier - (resource bombs)", () => {
  it("a billion-laughs YAML document is never expanded: an error or a small tree, at once", async () => {
    // Nine levels of nine aliases each: 387,420,489 leaves if aliases were expanded.
    const scalars = `${laughs(9)}\nname: root\nchildren: *l8\n`;
    const a = await cli(["-", "--input-format", "yaml"], { stdin: scalars });
    expect(oneErrorLine(a).code).toBe("SHAPE");

    // The same with node objects: an alias placed a second time is a one-line reference, so the tree
    // has one slot per alias written (a few dozen), never the expansion.
    const nodes = `${nodeLaughs(9)}\nname: root\nchildren: [*l8]\n`;
    const b = await cli(["-", "--input-format", "yaml", "--format", "json"], { stdin: nodes });
    expect(b.code, b.stderr).toBe(0);
    expect(JSON.parse(b.stdout).totals.nodes).toBeLessThan(100);

    // Aliases inside a kept field: the label shows the field as written, not expanded.
    const field = `${laughs(9)}\nname: root\nchildren:\n  - name: k\n    team: *l8\n`;
    const c = await cli(["-", "--input-format", "yaml", "--label", "{team}"], { stdin: field });
    expect(c.code, c.stderr).toBe(0);
    expect(c.stdout.length).toBeLessThan(1000);
  });

  it("a 10 MB name does not flood the terminal: text lines stay short, JSON keeps the data whole", async () => {
    const name = "q".repeat(10 * 1024 * 1024);
    const stdin = JSON.stringify({ name: "root", children: [{ name }, { name: "b" }] });
    const text = await cli(["-", "--budget", "5"], { stdin });
    expect(text.code, text.stderr).toBe(0);
    for (const line of text.stdout.split("\n")) expect(line.length).toBeLessThan(600);
    const json = await cli(["-", "--budget", "5", "--format", "json"], { stdin });
    expect(JSON.parse(json.stdout).root.children[0].name).toBe(name);
  });

  it("a 10 MB focus that matches nothing fails at once with FOCUS_NO_MATCH and a short line", async () => {
    const stdin = JSON.stringify({ name: "root", children: [{ name: "q".repeat(1_000_000) }] });
    const spec = `${"q".repeat(10 * 1024 * 1024)}x`;
    const r = await cli(["-", "--focus", spec], { stdin });
    expect(oneErrorLine(r).code).toBe("FOCUS_NO_MATCH");
    expect(r.stderr.length).toBeLessThan(5000);
  });

  it("a focus of 100,000 segments that matches nothing fails at once", async () => {
    const spec = Array(100_000).fill("a").join("/");
    const r = await cli(["-", "--focus", spec], { stdin: "a/a\na/b\n" });
    expect(oneErrorLine(r).code).toBe("FOCUS_NO_MATCH");
  });

  it("ten thousand foci (paths, row ids, globs) are resolved and all shown", async () => {
    const paths: string[] = [];
    for (let d = 0; d < 100; d++) for (let f = 0; f < 200; f++) paths.push(`quill/d${d}/f${f}`);
    const stdin = `${paths.join("\n")}\n`;
    const foci = paths.filter((_, k) => k % 2 === 0).map((p) => p.slice("quill/".length));
    expect(foci).toHaveLength(10_000);
    const focusArgs = foci.flatMap((f) => ["--focus", f]);
    const r = await cli(["-", ...focusArgs, "--budget", "20101", "--format", "json"], { stdin });
    expect(r.code, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).foci).toHaveLength(10_000);

    const rows = ["id,parent", "q,", ...Array.from({ length: 10_000 }, (_, k) => `p${k},q`)].join("\n");
    const ids = Array.from({ length: 10_000 }, (_, k) => ["--focus", `p${k}`]).flat();
    const byId = await cli(["-", "--input-format", "csv", ...ids, "--budget", "10002"], { stdin: rows });
    expect(byId.code, byId.stderr).toBe(0);
    expect(byId.stdout.split("\n").filter((l) => l.includes("* p"))).toHaveLength(10_000);

    const globs = Array.from({ length: 10_000 }, (_, k) => ["--focus", `d${k % 100}/f${k % 200}*`]).flat();
    const byGlob = await cli(["-", ...globs, "--budget", "20101", "--format", "json"], { stdin });
    expect(byGlob.code, byGlob.stderr).toBe(0);
  });

  it("--max-nodes N refuses bigger inputs in every format with LIMIT_EXCEEDED at the node past the limit", async () => {
    const inputs: [InputFormat, string, { line?: number; column?: number }][] = [
      ["paths", "q/a\nq/b\nq/c\n", { line: 3 }],
      // Data row 4 is line 5 (from standard input, not read again: the line, and column 1 for the
      // row's first field, which starts the line).
      ["csv", "id,parent\n1,\n2,1\n3,1\n4,1\n", { line: 5, column: 1 }],
      ["tsv", "id\tparent\n1\t\n2\t1\n3\t1\n4\t1\n", { line: 5, column: 1 }],
      [
        "rows",
        '[{"id":"1","parent":""},{"id":"2","parent":"1"},{"id":"3","parent":"1"},{"id":"4","parent":"1"}]',
        // The 4th row's "{": "[", the first row (22) and ",", two rows of 24 with their ",": column 73.
        { line: 1, column: 73 },
      ],
      // The 4th node's "{", at the start of line 4.
      [
        "json",
        '{"name": "q", "children": [\n{"name": "a"},\n{"name": "b"},\n{"name": "c"}]}',
        { line: 4, column: 1 },
      ],
      ["yaml", "name: q\nchildren:\n  - name: a\n  - name: b\n  - name: c\n", { line: 5 }],
    ];
    for (const [format, stdin, at] of inputs) {
      const over = await cli(["-", "--input-format", format, "--max-nodes", "3"], { stdin });
      const e = oneErrorLine(over);
      expect(e.code, format).toBe("LIMIT_EXCEEDED");
      if (at.line !== undefined) expect(e.line, format).toBe(at.line);
      if (at.column !== undefined) expect(e.column, format).toBe(at.column);
      const fits = await cli(["-", "--input-format", format, "--max-nodes", "4"], { stdin });
      expect(fits.code, `${format}: ${fits.stderr}`).toBe(0);
    }
    expect(oneErrorLine(await cli(["-", "--max-nodes", "0"], { stdin: "a\n" })).code).toBe("USAGE");
  });
});
