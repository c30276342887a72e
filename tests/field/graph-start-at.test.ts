import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: a build tool's task graph saved as JSON/YAML wraps its adjacency map in an object
// ({"version": 2, "tasks": {...}}); --graph --start-at /tasks reads only the map. The header and the
// JSON output must say which part was read, as they do for nested nodes and rows (invented tidewater
// tasks; the pointer /tasks names the member "tasks" of the top-level object, RFC 6901 section 4).

const wrapped = JSON.stringify({
  version: 2,
  tasks: { build: ["compile", "bundle"], compile: ["codegen"], bundle: ["codegen"], codegen: [] },
});
const wrappedYaml =
  "version: 2\ntasks:\n  build: [compile, bundle]\n  compile: [codegen]\n  bundle: [codegen]\n  codegen: []\n";

describe("--graph --start-at on an adjacency map inside a wrapper object", () => {
  it("says 'read at /tasks' in the text header, JSON or YAML, from a file or standard input", async () => {
    for (const [text, format] of [
      [wrapped, "json"],
      [wrappedYaml, "yaml"],
    ]) {
      const result = await cli(
        ["-", "--graph", "--start-at", "/tasks", "--input-format", format, "--budget", "10", "--no-key"],
        { stdin: text },
      );
      expect(result.stderr).toBe("");
      expect(result.code).toBe(0);
      const header = result.stdout.split("\n")[0];
      // 4 tasks: build, compile, bundle, codegen (codegen once, with a reference under its second parent).
      expect(header).toMatch(/^summary: 4 nodes; read at \/tasks; /);
    }
  });

  it("gives input.startAt in the summary JSON, and the diff header names it too", async () => {
    const json = await cli(["-", "--graph", "--start-at", "/tasks", "--format", "json"], { stdin: wrapped });
    expect(json.code).toBe(0);
    const summary = JSON.parse(json.stdout);
    expect(summary.input).toMatchObject({ shape: "graph", startAt: "/tasks" });
    expect(summary.totals.nodes).toBe(4);

    const grown = JSON.stringify({
      version: 3,
      tasks: {
        build: ["compile", "bundle"],
        compile: ["codegen"],
        bundle: ["codegen", "lint"],
        codegen: [],
        lint: [],
      },
    });
    const both = await cli(["diff", "old.json", "-", "--graph", "--start-at", "/tasks", "--budget", "12"], {
      stdin: grown,
      files: { "old.json": wrapped },
    });
    expect(both.stderr).toBe("");
    expect(both.code).toBe(0);
    expect(both.stdout.split("\n")[0]).toMatch(/^diff by id: 1 added, .*4 -> 5 nodes; read at \/tasks; /);
  });
});

describe("--graph on an adjacency map that gives a task twice (a merge kept both sides)", () => {
  // RFC 8259 section 4: "The names within an object SHOULD be unique"; ECMA-262 JSON.parse keeps the
  // last value of a repeated name. The earlier "build" entry's link to "lint" was dropped, with exit 0
  // and nothing said: "lint" showed as a top-level task.
  const text = '{\n"build": ["compile", "lint"],\n"compile": [],\n"lint": [],\n"build": ["compile"]\n}\n';

  it("reads the last entry, as JSON.parse does, and says so on standard error and in JSON", async () => {
    const result = await cli(["-", "--graph", "--format", "json"], { stdin: text });
    expect(result.code).toBe(0);
    const summary = JSON.parse(result.stdout);
    // As JSON.parse reads it: build -> compile; lint alone; 3 tasks under espalier's root.
    const parsed = JSON.parse(text) as Record<string, string[]>;
    expect(parsed.build).toEqual(["compile"]);
    expect(summary.totals.nodes).toBe(Object.keys(parsed).length + 1);
    expect(summary.input.notes).toEqual([expect.objectContaining({ code: "REPEATED_KEY", line: 5 })]);
    expect(result.stderr).toMatch(
      /^espalier: note: <stdin>:5: line 5 repeats the id "build" .*\[REPEATED_KEY\]\n$/,
    );
  });

  it("says nothing when every task is given once", async () => {
    const once = '{"build": ["compile", "lint"], "compile": [], "lint": []}';
    const result = await cli(["-", "--graph"], { stdin: once });
    expect(result.code).toBe(0);
    expect(result.stderr).toBe("");
  });
});
