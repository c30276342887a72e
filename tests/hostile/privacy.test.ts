import { readFileSync } from "node:fs";
import { mkdtemp, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { parse } from "csv-parse/sync";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { runBin } from "../helpers/bin.js";
import { cli } from "../helpers/cli.js";
import { leakedNames } from "../helpers/leaked-names.js";
import { oneErrorLine } from "./error-line.js";

// Org charts are personal data and CI logs are widely readable: under --pseudonymize no real name, id
// or node path may appear anywhere espalier writes, error lines and suggestions included.
const KEY = { ESPALIER_PSEUDONYM_KEY: "quillfeather-secret" };

interface Case {
  what: string;
  file: string;
  text: string;
  /** Names, ids and paths of the input that the plain error names (at least one) and the private one must not. */
  secrets: string[];
  code: string;
  args?: string[];
}

// Each fault class, in the formats that can have it; people of the invented Quillfeather Instruments.
const CASES: Case[] = [
  {
    what: "a negative size (nested JSON)",
    file: "org.json",
    text: '{"name":"Talia Brenbek","children":[{"name":"Marit Okonkwo","size":-3}]}',
    secrets: ["Talia", "Marit"],
    code: "BAD_SIZE",
  },
  {
    what: "a size that is text (nested JSON)",
    file: "org.json",
    text: '{"name":"Talia Brenbek","size":"Marit Okonkwo"}',
    secrets: ["Talia", "Marit"],
    code: "BAD_SIZE",
  },
  {
    what: "a size that is text (YAML)",
    file: "org.yaml",
    text: "name: Talia Brenbek\nsize: Marit Okonkwo\n",
    secrets: ["Talia", "Marit"],
    code: "BAD_SIZE",
  },
  {
    what: "a size cell that is a name (CSV)",
    file: "org.csv",
    text: "id,parent,name,size\nQ1,,Talia Brenbek,Marit Okonkwo\n",
    secrets: ["Marit"],
    code: "BAD_SIZE",
  },
  {
    what: "a size column that is a name (path list)",
    file: "org.paths",
    text: "Talia Brenbek\tquill/Marit Okonkwo\n",
    secrets: ["Talia"],
    code: "BAD_SIZE",
  },
  {
    what: "a duplicate id (CSV)",
    file: "org.csv",
    text: "id,parent,name\nQ2417,,Talia Brenbek\nQ2417,,Marit Okonkwo\n",
    secrets: ["Q2417"],
    code: "DUPLICATE_ID",
  },
  {
    what: "a duplicate id (JSON rows)",
    file: "org.json",
    text: '[{"id":"Q2417","parent":null,"name":"Talia"},{"id":"Q2417","parent":"Q2417","name":"Marit"}]',
    secrets: ["Q2417"],
    code: "DUPLICATE_ID",
    args: ["--input-format", "rows"],
  },
  {
    what: "a missing parent (TSV)",
    file: "org.tsv",
    text: "id\tparent\tname\nQ1\t\tTalia Brenbek\nQ2\tQ9999\tMarit Okonkwo\n",
    secrets: ["Q9999"],
    code: "MISSING_PARENT",
  },
  {
    what: "a cycle (CSV)",
    file: "org.csv",
    text: "id,parent,name\nQ1,,Root\nQ2417,Q3111,Talia Brenbek\nQ3111,Q2417,Marit Okonkwo\n",
    secrets: ["Q2417", "Q3111"],
    code: "CYCLE",
  },
  {
    what: "a shape fault: children that are text (JSON)",
    file: "org.json",
    text: '{"name":"Talia Brenbek","children":"Marit Okonkwo"}',
    secrets: ["Talia"],
    code: "SHAPE",
  },
  {
    what: "a shape fault: a child that is a number (YAML)",
    file: "org.yaml",
    text: "name: Talia Brenbek\nchildren:\n  - name: Marit Okonkwo\n    children: [3]\n",
    secrets: ["Talia", "Marit"],
    code: "SHAPE",
  },
  {
    what: "a duplicate path (path list)",
    file: "org.paths",
    text: "quill/Talia Brenbek\nquill/Talia Brenbek\n",
    secrets: ["Talia"],
    code: "DUPLICATE_PATH",
  },
  {
    what: "a duplicate path (path column)",
    file: "org.csv",
    text: "path\nquill/Talia Brenbek\nquill/Talia Brenbek\n",
    secrets: ["Talia"],
    code: "DUPLICATE_PATH",
  },
  {
    what: "a JSON syntax error",
    file: "org.json",
    text: '{"name":"Talia", Marit}',
    secrets: ['"M"'],
    code: "PARSE_JSON",
  },
  {
    what: "a lone root whose other fields are named for people (JSON, a named children field)",
    file: "org.json",
    text: '{"name":"quill","Talia Brenbek":{"desk":1},"Marit Okonkwo":[1]}',
    secrets: ["Talia", "Marit"],
    code: "FIELD_MISSING",
    args: ["--children-field", "reports"],
  },
  {
    what: "a lone root whose other fields are named for people (YAML, a named children field)",
    file: "org.yaml",
    text: "name: quill\nTalia Brenbek: {desk: 1}\nMarit Okonkwo: [1]\n",
    secrets: ["Talia", "Marit"],
    code: "FIELD_MISSING",
    args: ["--children-field", "reports"],
  },
  {
    what: "columns named for people, none of them id/parent or path (CSV)",
    file: "org.csv",
    text: "Talia Brenbek,Marit Okonkwo\n1,2\n",
    secrets: ["Talia", "Marit"],
    code: "FIELD_MISSING",
  },
  {
    what: "a duplicate path in a map keyed by path (JSON)",
    file: "lock.json",
    text: '{"packages":{"":{},"desks/Talia Brenbek":{},"desks/Talia Brenbek":{}}}',
    secrets: ["Talia"],
    code: "DUPLICATE_PATH",
  },
  {
    what: "a map keyed by path whose late value is not a record (JSON, past the sample)",
    file: "lock.json",
    text: `{"packages":{"":{},${Array.from({ length: 70 }, (_, i) => `"desks/d${i}":{}`).join(",")},"desks/Talia Brenbek":3}}`,
    secrets: ["Talia"],
    code: "SHAPE",
  },
  {
    what: "a document read as values, with a bad focus near a real name (JSON values)",
    file: "org.json",
    text: '{"Talia Brenbek":{"desk":1},"Marit Okonkwo":[1,2]}',
    secrets: ["Marit Okonkwx"],
    code: "FOCUS_NO_MATCH",
    args: ["--read-as", "values", "--focus", "Marit Okonkwx"],
  },
  {
    what: "a focus that names a real person",
    file: "org.csv",
    text: "id,parent,name\nQ1,,Talia Brenbek\nQ2,Q1,Marit Okonkwo\n",
    secrets: ["Marit Okonkwx"],
    code: "FOCUS_NO_MATCH",
    args: ["--focus", "Talia Brenbek/Marit Okonkwx"],
  },
  {
    what: "a parent no row has (graph table)",
    file: "org.csv",
    text: "id,parent,name\nTalia Brenbek,,T\nQ2,Marit Okonkwo,M\n",
    secrets: ["Marit"],
    code: "MISSING_PARENT",
    args: ["--graph"],
  },
  {
    what: "an id repeated with another name (graph table)",
    file: "org.csv",
    text: "id,parent,name\nTalia Brenbek,,T\nMarit Okonkwo,Talia Brenbek,M\nMarit Okonkwo,Talia Brenbek,N\n",
    secrets: ["Marit"],
    code: "DUPLICATE_ID",
    args: ["--graph"],
  },
  {
    what: "a size cell that is a name (graph table)",
    file: "org.csv",
    text: "id,parent,name,size\nQ1,,T,Marit Okonkwo\n",
    secrets: ["Marit"],
    code: "BAD_SIZE",
    args: ["--graph"],
  },
  {
    what: "an entry that is no list (adjacency map)",
    file: "org.json",
    text: '{"Talia Brenbek":["Marit Okonkwo"],"Marit Okonkwo":"Q9"}',
    secrets: ["Marit"],
    code: "SHAPE",
    args: ["--graph"],
  },
  {
    what: "a focus with a bad escape",
    file: "org.csv",
    text: "id,parent,name\nQ1,,Talia Brenbek\n",
    secrets: ["Marit~2"],
    code: "FOCUS_SYNTAX",
    args: ["--focus", "Marit~2/x"],
  },
];

async function inDir(files: Record<string, string>): Promise<string> {
  const dir = await mkdtemp(join(tmpdir(), "espalier-privacy-"));
  for (const [name, text] of Object.entries(files)) await writeFile(join(dir, name), text);
  return dir;
}

const leaks = (text: string, secrets: readonly string[]) =>
  secrets.filter((s) => text.toLowerCase().includes(s.toLowerCase()));

describe("espalier --pseudonymize: no real name, id or path in any error line", () => {
  for (const c of CASES) {
    it(`${c.what}: ${c.code}, named in plain runs, hidden under --pseudonymize (summary and diff)`, async () => {
      const dir = await inDir({ [c.file]: c.text });
      const input = join(dir, c.file);
      const args = c.args ?? [];
      // Plain: the message quotes the input, which is what makes the private run's check mean something.
      const plain = await cli([input, ...args]);
      expect(oneErrorLine(plain).code).toBe(c.code);
      expect(leaks(plain.stderr, c.secrets).length, plain.stderr).toBeGreaterThan(0);
      const runs = [
        [input, ...args, "--pseudonymize"],
        // Both versions are the faulty file: OLD loads first and its error is reported.
        ["diff", input, input, ...args, "--pseudonymize"],
      ];
      for (const argv of runs) {
        const r = await cli(argv, { env: KEY });
        expect(oneErrorLine(r).code).toBe(c.code);
        expect(leaks(r.stderr, c.secrets), r.stderr).toEqual([]);
      }
    });
  }

  it("the issue's repro through bin/espalier.js: neither name is printed", async () => {
    const dir = await inDir({ "p.json": '{"name":"Alice","children":[{"name":"Bob","size":-3}]}' });
    const r = await runBin([join(dir, "p.json"), "--pseudonymize"], { env: { ESPALIER_PSEUDONYM_KEY: "k" } });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/\[BAD_SIZE\]\n$/);
    expect(r.stderr).not.toMatch(/Alice|Bob/);
    // The diff's versions load on a worker thread through the launcher: the error crosses as data.
    const d = await runBin(["diff", join(dir, "p.json"), join(dir, "p.json"), "--pseudonymize"], {
      env: { ESPALIER_PSEUDONYM_KEY: "k" },
    });
    expect(d.code).toBe(2);
    expect(d.stderr).not.toMatch(/Alice|Bob/);
  });

  it('"did you mean" is no oracle: every guess of a real name gets the same answer', async () => {
    const dir = await inDir({ "org.csv": "id,parent,name\nQ1,,Talia Brenbek\nQ2,Q1,Marit Okonkwo\n" });
    const answers = new Set<string>();
    for (const guess of [
      "Marit Okonkwo",
      "marit okonkwo",
      "Marit Okonkw",
      "q2",
      "Talia Brenbek/Marit",
      "nobody",
    ]) {
      const spec = guess === "Marit Okonkwo" ? "Talia Brenbek/Marit Okonkwo/x" : guess;
      const r = await cli(
        [join(dir, "org.csv"), "--parent-field", "parent", "--focus", spec, "--pseudonymize"],
        {
          env: KEY,
        },
      );
      expect(oneErrorLine(r).code).toBe("FOCUS_NO_MATCH");
      expect(leaks(r.stderr, ["Marit", "Talia", "Okonkw", "nobody"])).toEqual([]);
      answers.add(r.stderr);
    }
    expect(answers.size).toBe(1);
  });
});

// Names and ids made of letters (Q, Z, X, K, J, W) that no message wording uses in a run of three: any
// run of them in an error line is input leaking through.
const token = fc.stringMatching(/^[QZXKJW]{6,8}$/);
const LEAK = /[QZXKJW]{3,}/;

describe("espalier --pseudonymize on random faulty inputs (property)", () => {
  it("no run of the input's name letters in any error line or output, every format, summary and diff", async () => {
    const dir = await mkdtemp(join(tmpdir(), "espalier-privacy-fuzz-"));
    await fc.assert(
      fc.asyncProperty(
        fc.array(token, { minLength: 2, maxLength: 6 }),
        fc.constantFrom("csv", "tsv", "json", "rows", "yaml", "paths", "pathmap", "values", "lone"),
        fc.nat(),
        fc.constantFrom("dup", "size", "parent", "cycle", "cut", "focus", "hit"),
        async (names, format, pick, fault) => {
          const text = faultyInput(names, format, pick, fault);
          const file = join(dir, `in.${FILE_TYPE[format] ?? format}`);
          await writeFile(file, text);
          // "focus" names no node (an error); "hit" names real nodes that exist, by path and by id, so
          // the output (its header and JSON foci too) is checked with foci typed as real names.
          const focus =
            fault === "focus"
              ? ["--focus", `${names[0]}/${names[pick % names.length]}x`]
              : fault === "hit"
                ? hits(names, format)
                : [];
          const output = ["--format", ["text", "json", "markdown", "svg"][pick % 4]];
          const fmt = FORMAT_ARGS[format] ?? ["--input-format", format];
          for (const argv of [
            [file, ...fmt, ...focus, ...output, "--pseudonymize"],
            ["diff", file, file, ...fmt, ...focus, ...output, "--pseudonymize"],
          ]) {
            const r = await cli(argv, { env: KEY });
            // The file's own path is no input text: its random folder names (mkdtemp) may hold such a run.
            expect(r.stderr.replaceAll(dir, "DIR"), `${format} ${fault}: ${text}`).not.toMatch(LEAK);
            expect(r.stdout).not.toMatch(LEAK);
          }
        },
      ),
      { numRuns: 60 },
    );
  });
});

// Readings of a JSON document that choose-reading picks by its shape: a map keyed by path (a lock
// file's "packages"), every value a node, a lone root beside a children field named on purpose.
const FILE_TYPE: Record<string, string> = { rows: "json", pathmap: "json", values: "json", lone: "json" };
const FORMAT_ARGS: Record<string, string[]> = {
  pathmap: [],
  values: ["--read-as", "values"],
  lone: ["--children-field", "reports"],
};

/** Foci that name existing nodes of `faultyInput(names, format, …)`: by path, and by id in tables. */
function hits(names: string[], format: string): string[] {
  // A root row or node object is the root itself (path ""); path lists, path maps and values have a
  // root above the first name.
  const rooted = ["csv", "tsv", "rows", "json", "yaml"].includes(format);
  const path = rooted ? names[1] : names.slice(0, 2).join("/");
  const id = ["csv", "tsv", "rows"].includes(format) ? ["--focus", [...names[1]].reverse().join("")] : [];
  return ["--focus", path, ...id];
}

/** An input of `format` naming people `names` (ids are the names reversed), with one fault. */
function faultyInput(names: string[], format: string, pick: number, fault: string): string {
  const k = 1 + (pick % (names.length - 1));
  const ids = names.map((n) => [...n].reverse().join(""));
  const rows = names.map((name, i) => ({
    id: ids[i],
    parent: i === 0 ? "" : ids[i - 1],
    name,
    size: String(i),
  }));
  if (fault === "dup") rows[k].id = ids[0];
  if (fault === "size") rows[k].size = names[k];
  if (fault === "parent") rows[k].parent = `${ids[k]}QQ`;
  if (fault === "cycle") rows[0].parent = ids[names.length - 1];
  let text: string;
  if (format === "csv" || format === "tsv") {
    const sep = format === "csv" ? "," : "\t";
    text = [
      "id,parent,name,size".replaceAll(",", sep),
      ...rows.map((r) => [r.id, r.parent, r.name, r.size].join(sep)),
    ].join("\n");
  } else if (format === "rows") {
    text = JSON.stringify(
      rows.map((r) => ({ ...r, parent: r.parent === "" ? null : r.parent, size: Number(r.size) || r.size })),
    );
  } else if (format === "pathmap") {
    // Keys are paths of the names; a repeated key, a size that is a name, or a record that is text.
    const entries = [`"":{"size":0}`];
    names.forEach((_, i) => {
      const path = JSON.stringify(names.slice(0, i + 1).join("/"));
      const size = fault === "size" && i === k ? JSON.stringify(names[k]) : String(i);
      entries.push(
        fault === "parent" && i === k ? `${path}:${JSON.stringify(names[i])}` : `${path}:{"size":${size}}`,
      );
      if (fault === "dup" && i === k) entries.push(`${path}:{}`);
    });
    text = `{"lockfileVersion":3,"packages":{${entries.join(",")}}}`;
  } else if (format === "values") {
    // Keys are the names, nested: each value's node is named by its key (JSON Pointer segments).
    let value: unknown = fault === "size" ? names[k] : names.length;
    for (let i = names.length - 1; i >= 0; i--) value = { [names[i]]: value, [`${names[i]}s`]: [i] };
    text = JSON.stringify(value);
  } else if (format === "lone") {
    // The top-level object's fields are the names: no "reports" field, so FIELD_MISSING lists them.
    text = JSON.stringify(
      Object.fromEntries([["name", "quill"], ...names.map((n, i) => [n, i % 2 ? [i] : { i }])]),
    );
  } else if (format === "paths") {
    const paths = names.map((_, i) => names.slice(0, i + 1).join("/"));
    if (fault === "dup") paths.push(paths[k]);
    text = paths.map((p, i) => `${fault === "size" && i === k ? names[k] : i}\t${p}`).join("\n");
  } else {
    // Nested: a chain of the names; faults become a bad size, a bad shape or a repeated alias.
    let node: Record<string, unknown> = {
      name: names[names.length - 1],
      size: fault === "size" ? names[k] : 1,
    };
    for (let i = names.length - 2; i >= 0; i--) {
      node = {
        name: names[i],
        size: fault === "dup" && i === k - 1 ? -1 : i,
        children: fault === "parent" && i === 0 ? names[k] : [node],
      };
    }
    text = format === "yaml" ? toYaml(node, "") : JSON.stringify(node);
  }
  if (fault === "cut")
    text = text.slice(0, Math.max(1, Math.floor(text.length * ((pick % 90) / 100 + 0.05))));
  return text;
}

function toYaml(node: Record<string, unknown>, indent: string): string {
  let out = `${indent}name: ${node.name}\n${indent}size: ${node.size}\n`;
  const children = node.children;
  if (typeof children === "string") out += `${indent}children: ${children}\n`;
  else if (Array.isArray(children)) {
    out += `${indent}children:\n`;
    for (const child of children) {
      const body = toYaml(child as Record<string, unknown>, `${indent}    `);
      out += `${indent}  - ${body.trimStart()}`;
    }
  }
  return out;
}

describe("espalier --pseudonymize with --label fields beyond {name} and {id}", () => {
  // The invented org chart: every column a label can name (name, title, team) holds personal data.
  const ORG = new URL("../../fixtures/quillfeather-org.csv", import.meta.url).pathname;
  // Read with csv-parse, an RFC 4180 reader from the registry (titles hold quoted commas).
  const rows = (parse(readFileSync(ORG, "utf8")) as string[][]).slice(1);
  // id,manager,name,title,team,cost: names, titles and teams (longer than 3 characters, so that a
  // word of the output's own wording is no false alarm), and ids.
  const secrets = new Set<string>();
  for (const [id, , name, title, team] of rows)
    for (const v of [id, name, title, team]) if (v !== undefined && v.length > 3) secrets.add(v);
  const args = [ORG, "--parent-field", "manager", "--size-field", "cost", "--focus", "Q2417"];
  const label = ["--label", "{name} <{title}> {team} #{id}"];

  it("no name, id, title or team in any output format, summary and diff (a leak scan)", async () => {
    // The plain run prints them, so the scan can fail.
    const plain = await cli([...args, ...label]);
    expect(plain.code, plain.stderr).toBe(0);
    expect(leakedNames(plain.stdout, secrets).length).toBeGreaterThan(10);
    for (const format of ["text", "json", "markdown", "svg"]) {
      const r = await cli([...args, ...label, "--format", format, "--pseudonymize"], { env: KEY });
      expect(r.code, r.stderr).toBe(0);
      expect(leakedNames(r.stdout + r.stderr, secrets), format).toEqual([]);
      const d = await cli(
        ["diff", ORG, ORG, ...args.slice(1), ...label, "--format", format, "--pseudonymize"],
        {
          env: KEY,
        },
      );
      expect(d.code, d.stderr).toBe(0);
      expect(leakedNames(d.stdout + d.stderr, secrets), `diff ${format}`).toEqual([]);
    }
  });

  it("a label field no record has: FIELD_MISSING lists the columns as pseudonyms", async () => {
    const dir = await inDir({ "org.csv": "id,parent,Marit Okonkwo\nQ1,,x\n" });
    const plain = await cli([join(dir, "org.csv"), "--label", "{email}"]);
    expect(oneErrorLine(plain).code).toBe("FIELD_MISSING");
    expect(plain.stderr).toContain("Marit Okonkwo");
    const r = await cli([join(dir, "org.csv"), "--label", "{email}", "--pseudonymize"], { env: KEY });
    expect(oneErrorLine(r).code).toBe("FIELD_MISSING");
    expect(r.stderr).not.toContain("Marit");
  });
});
