import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Parser } from "commonmark";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { oneErrorLine } from "./error-line.js";

// Names that try to forge output: terminal control sequences (ECMA-48: ESC, the 8-bit CSI U+009B, NEL
// U+0085), line breaks, Unicode bidirectional controls (UAX #9; CVE-2021-42574), the line and paragraph
// separators, and lines CI runners read as commands (common practice, no source: GitHub Actions runs
// lines starting "::", Azure Pipelines lines starting "##vso[" or "##[").
const HOSTILE = [
  "\u001b[2J\u001b[31mred",
  "a\nb",
  "\r::error::forged",
  "\n::error file=x::forged",
  "::error::x",
  "##vso[task.setvariable variable=x]y",
  "##[error]x",
  "invoice\u202egpj.exe",
  "\u2066isolated\u2069",
  "line\u2028sep\u2029para",
  "\u0085next line",
  "\u009b31m",
  "nul\u0000del\u007f",
  "</text><script>alert(1)</script>",
  "*bold* _em_ [link](x) <b>",
];

// C0 controls but line feed, DEL, C1 controls, bidi controls, line and paragraph separators.
const UNSAFE =
  /[\u0000-\u0009\u000b-\u001f\u007f-\u009f\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069]/u;

// A tree line starts with indentation and a mark (src/render/marks.ts); the header and the key line
// under it with a fixed word.
const LINE = /^(?:(?: {2})*[*:.] |summary: |diff by |key: )/;

function nestedJson(names: readonly string[]): string {
  return JSON.stringify({ name: "root", children: names.map((name, k) => ({ name, size: k })) });
}

describe("espalier - (no injection): names are data in every human-readable format", () => {
  const stdin = nestedJson(HOSTILE);
  const base = ["-", "--budget", "40", "--color", "never", "--no-chains"];

  it("text: every line is indentation and a mark, no control or bidi character gets through", async () => {
    for (const focus of [[], ["--focus", "::error::x"]]) {
      const r = await cli([...base, ...focus], { stdin });
      expect(r.code, r.stderr).toBe(0);
      const lines = r.stdout.slice(0, -1).split("\n");
      // The header, the key line, the root and one line per name.
      expect(lines).toHaveLength(HOSTILE.length + 3);
      for (const line of lines) {
        expect(line).toMatch(LINE);
        expect(line).not.toMatch(UNSAFE);
      }
    }
  });

  it("text with colour: the only escape sequences are the palette's own SGR codes", async () => {
    const r = await cli(["-", "--budget", "40", "--color", "always", "--focus", "::error::x"], { stdin });
    expect(r.code, r.stderr).toBe(0);
    const plain = r.stdout.replace(/\u001b\[[0-9;]*m/g, "");
    expect(plain).not.toMatch(UNSAFE);
    for (const line of plain.slice(0, -1).split("\n")) expect(line).toMatch(LINE);
  });

  it("markdown: every line is a list item, no control or bidi character, no markup from a name", async () => {
    const r = await cli([...base, "--format", "markdown"], { stdin });
    expect(r.code, r.stderr).toBe(0);
    const [header, key, blank, ...items] = r.stdout.slice(0, -1).split("\n");
    expect(header).toMatch(/^summary: /);
    expect(key).toMatch(/^key: /);
    expect(blank).toBe("");
    for (const line of items) {
      expect(line).toMatch(/^(?: {2})*- /);
      expect(line).not.toMatch(UNSAFE);
    }
    // Names are code spans (CommonMark 0.31, section 6.1), whose content is never markup: parsed by
    // commonmark.js (the reference implementation), the output holds no HTML, link or emphasis node.
    const walker = new Parser().parse(r.stdout).walker();
    const kinds = new Set<string>();
    const code: string[] = [];
    for (let e = walker.next(); e; e = walker.next()) {
      kinds.add(e.node.type);
      if (e.node.type === "code" && e.node.literal) code.push(e.node.literal);
    }
    for (const kind of ["html_inline", "html_block", "link", "image", "emph"])
      expect(kinds).not.toContain(kind);
    expect(code).toContain("</text><script>alert(1)</script>");
    expect(code).toContain("*bold* _em_ [link](x) <b>");
  });

  it("svg: no control or bidi character, no element from a name", async () => {
    const r = await cli([...base, "--format", "svg"], { stdin });
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout.replaceAll("\n", "")).not.toMatch(UNSAFE);
    expect(r.stdout).not.toContain("<script");
    expect(r.stdout).toContain("&lt;/text&gt;&lt;script&gt;");
  });

  it("json: names come back exactly, and the text holds no raw control, separator or bidi character", async () => {
    const r = await cli([...base, "--format", "json"], { stdin });
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout.replaceAll("\n", "")).not.toMatch(UNSAFE);
    const names = JSON.parse(r.stdout).root.children.map((c: { name: string }) => c.name);
    expect(names).toEqual(HOSTILE);
  });

  it("labels: record fields and the template's own text are escaped like names", async () => {
    const rows = ["id,parent,team", '1,,"\u001b]0;title\u0007"', '2,1,"x\r\n::error::y"'].join("\n");
    const r = await cli(
      ["-", "--input-format", "csv", "--label", "{team}\n::warning::{id}", "--color", "never"],
      {
        stdin: rows,
      },
    );
    expect(r.code, r.stderr).toBe(0);
    for (const line of r.stdout.slice(0, -1).split("\n")) {
      expect(line).toMatch(LINE);
      expect(line).not.toMatch(UNSAFE);
    }
  });

  it("diff text: names of added and removed nodes are escaped too", async () => {
    const dir = await mkdtemp(join(tmpdir(), "espalier-inject-"));
    try {
      await writeFile(join(dir, "old.json"), nestedJson(HOSTILE.slice(0, 5)));
      await writeFile(join(dir, "new.json"), nestedJson(HOSTILE.slice(3)));
      const d = await cli([
        "diff",
        join(dir, "old.json"),
        join(dir, "new.json"),
        "--color",
        "never",
        "--no-chains",
      ]);
      expect(d.code, d.stderr).toBe(0);
      const lines = d.stdout.slice(0, -1).split("\n");
      for (const line of lines) expect(line).toMatch(LINE);
      expect(d.stdout).not.toMatch(UNSAFE);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });

  it("error lines: a hostile focus, file name or option value is escaped, and stays one line", async () => {
    const focus = await cli(["-", "--focus", "\u001b[2J\n::error::forged"], { stdin: "a/b\n" });
    expect(oneErrorLine(focus).code).toBe("FOCUS_NO_MATCH");
    expect(focus.stderr.slice(0, -1)).not.toMatch(UNSAFE);
    const file = await cli(["no\nsuch\u001b[31m.json"]);
    expect(oneErrorLine(file).code).toBe("IO");
    expect(file.stderr.slice(0, -1)).not.toMatch(UNSAFE);
    const option = await cli(["-", "--format", "\u001b[2J\n::error::x"], { stdin: "a\n" });
    expect(option.code).toBe(2);
    expect(option.stderr).not.toMatch(UNSAFE);
    expect(option.stderr.split("\n").filter((l) => l.startsWith("::"))).toEqual([]);
  });
});

describe("espalier - (__proto__, constructor, prototype): ordinary strings everywhere", () => {
  const SPECIAL = ["__proto__", "constructor", "prototype", "toString", "hasOwnProperty"];

  function childNames(stdout: string): string[] {
    return JSON.parse(stdout).root.children.map((c: { name: string }) => c.name);
  }

  it("as keys of JSON and YAML children objects, and as names", async () => {
    const keyed = `{"name": "r", "children": {${SPECIAL.map((k, i) => `"${k}": ${i + 1}`).join(", ")}}}`;
    const json = await cli(["-", "--format", "json"], { stdin: keyed });
    expect(json.code, json.stderr).toBe(0);
    expect(childNames(json.stdout)).toEqual(SPECIAL);
    expect(JSON.parse(json.stdout).totals.size).toBe(15);
    const yaml = `name: r\nchildren:\n${SPECIAL.map((k, i) => `  ${k}: ${i + 1}\n`).join("")}`;
    const y = await cli(["-", "--input-format", "yaml", "--format", "json"], { stdin: yaml });
    expect(childNames(y.stdout)).toEqual(SPECIAL);
    const named = JSON.stringify({ name: "r", children: SPECIAL.map((name) => ({ name })) });
    expect(childNames((await cli(["-", "--format", "json"], { stdin: named })).stdout)).toEqual(SPECIAL);
  });

  it("as focus paths, ids and globs", async () => {
    const keyed = `{"name": "r", "children": {"__proto__": {"children": {"constructor": 1}}, "prototype": 2}}`;
    for (const focus of ["__proto__/constructor", "prototype", "__proto__/*", "**/constructor"]) {
      const r = await cli(["-", "--focus", focus, "--format", "json"], { stdin: keyed });
      expect(r.code, `${focus}: ${r.stderr}`).toBe(0);
      expect(JSON.parse(r.stdout).foci.length, focus).toBeGreaterThan(0);
    }
    const rows = "id,parent,name\n__proto__,,a\nconstructor,__proto__,b\nprototype,constructor,c\n";
    const byId = await cli(["-", "--input-format", "csv", "--focus", "prototype", "--format", "json"], {
      stdin: rows,
    });
    expect(JSON.parse(byId.stdout).foci).toEqual(["b/c"]);
    const missing = await cli(["-", "--input-format", "csv", "--focus", "toString"], { stdin: rows });
    expect(oneErrorLine(missing).code).toBe("FOCUS_NO_MATCH");
  });

  it("as column names, label fields and field options", async () => {
    const csv = "id,parent,__proto__,constructor\n1,,x,y\n2,1,z,w\n";
    const r = await cli(
      ["-", "--input-format", "csv", "--label", "{__proto__}-{constructor}", "--no-chains"],
      {
        stdin: csv,
      },
    );
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toContain("x-y");
    expect(r.stdout).toContain("z-w");
    const rows = '[{"id": "1", "parent": "", "__proto__": "p"}]';
    const j = await cli(["-", "--input-format", "rows", "--label", "{__proto__}"], { stdin: rows });
    expect(j.stdout).toContain("p");
    // Fields no node has: inherited members of Object.prototype are not fields.
    const plain = JSON.stringify({ name: "r", children: [{ name: "a", size: 1 }] });
    for (const option of ["--size-field", "--children-field", "--name-field"]) {
      for (const field of ["constructor", "__proto__", "toString"]) {
        const o = await cli(["-", option, field, "--format", "json"], { stdin: plain });
        // No node has that field: the root alone would hide its "children", a named size field no
        // node has would print a tree without sizes, a named name field one named by nothing (issue
        // 10.8): a typed error each time.
        expect(o.code, `${option} ${field}: ${o.stderr}`).toBe(2);
        expect(o.stderr).toContain("[FIELD_MISSING]");
      }
    }
    expect(oneErrorLine(await cli(["-", "--label", "{constructor}"], { stdin: plain })).code).toBe(
      "FIELD_MISSING",
    );
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    expect(Object.keys(Object.prototype)).toEqual([]);
  });
});
