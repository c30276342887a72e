import { readFileSync } from "node:fs";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { EspalierError } from "../../src/errors.js";
import { loadTree } from "../../src/load/index.js";
import {
  defaultLoadOptions,
  type InputFormat,
  inputFormats,
  type LoadOptions,
} from "../../src/load/load-options.js";
import { loadTreeFromStream } from "../../src/load/stream/index.js";
import type { Tree } from "../../src/model/tree.js";
import { renderJson } from "../../src/render/summary-json.js";
import { renderMarkdown } from "../../src/render/summary-markdown.js";
import { renderText } from "../../src/render/summary-text.js";
import { prepare, summarize } from "../../src/summarize.js";
import { cli } from "../helpers/cli.js";

// Random and mutated inputs into every loader and into the command line, accepting only a tree or a
// typed error (EspalierError; exit 2 with one line): no other exception, no hang. In the test suite each
// property runs 100 cases (about a second in all); `npm run fuzz` runs a long campaign of 20,000 per
// property. FUZZ_RUNS sets the number, FUZZ_SEED replays the seed a failure reports.
const RUNS = Number(process.env.FUZZ_RUNS ?? (process.env.npm_lifecycle_event === "fuzz" ? 20_000 : 100));
const SEED = process.env.FUZZ_SEED === undefined ? undefined : Number(process.env.FUZZ_SEED);
const LONG = RUNS > 1000;
/** Inputs stay this small, so each case is quick; a case slower than CASE_MS fails as a hang. */
const MAX_BYTES = 4096;
const CASE_MS = 3000;
const TIMEOUT = 60_000 + RUNS * 200;
const params = { numRuns: RUNS, seed: SEED, endOnFailure: true } as const;

// C0 controls but line feed, DEL, C1 controls, bidi controls, line and paragraph separators.
const UNSAFE =
  /[\u0000-\u0009\u000b-\u001f\u007f-\u009f\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069]/u;

interface Seed {
  format: InputFormat;
  text: string;
  options?: Partial<LoadOptions>;
  args?: string[];
}

/** The first `lines` lines of a fixture: still valid for line-based formats. */
function head(path: string, lines: number): string {
  return readFileSync(new URL(`../../${path}`, import.meta.url), "utf8")
    .split("\n")
    .slice(0, lines)
    .join("\n");
}

const SEEDS: Seed[] = [
  {
    format: "json",
    text:
      '{"name": "tidewater", "size": 0, "children": [\n' +
      '  {"name": "services", "children": {"ledger": {"size": 120, "children": {"src": 40, "test": null}},\n' +
      '    "mooring-log": 7, "2": 1, "10": 2}},\n' +
      '  {"name": "@tidewater/ledger-core", "size": 2048, "owner": "team-ledger", "deps": ["a", {"b": 1}]},\n' +
      '  {"name": "caf\\u00e9 \\"q\\" ~/x\\n", "size": 1.5e2},\n' +
      '  {"name": "services", "size": 3}\n]}\n',
    args: ["--label", "{name} {owner}"],
  },
  {
    format: "rows",
    text:
      '[{"id": "Q1", "parent": "", "name": "Rosa Istrian", "title": "Chief", "size": 250000},\n' +
      ' {"id": "Q2", "parent": "Q1", "name": "Juno Ashvik", "title": "VP", "size": 180000},\n' +
      ' {"id": "Q3", "parent": "Q2", "name": "Esme Orby", "title": "Lead", "size": 120000.5},\n' +
      ' {"id": "Q4", "parent": "Q2", "name": null, "title": true, "size": null}]\n',
    args: ["--label", "{title}", "--focus", "Q3"],
  },
  {
    format: "yaml",
    text:
      "name: Quillfeather Instruments\nsize: 0\nchildren:\n  - name: Software & Firmware\n" +
      "    children:\n      Fleet Telemetry: 1200\n      Ledger: &l {size: 30, children: {a: 1, b: ~}}\n" +
      '  - name: "Operations: east"\n    size: 0x1f4\n    team: [a, b]\n' +
      "  - name: 'it''s'\n" +
      "    children: []\n",
    args: ["--label", "{team}"],
  },
  {
    format: "csv",
    text:
      'id,parent,name,size\r\n1,,"Quillfeather, Inc.",0\r\n2,1,Ledger,120\r\n3,2,"say ""hi""",7\r\n' +
      '4,2,,\r\n5,1,"two\nlines",1e3\r\n',
  },
  {
    format: "csv",
    text: head("fixtures/quillfeather-org.csv", 40),
    args: ["--parent-field", "manager", "--label", "{title}"],
    options: { parentField: "manager", keepFields: ["title"] },
  },
  {
    format: "tsv",
    text: 'id\tparent\tname\tsize\n1\t\tquill\t0\n2\t1\t"raw quotes"\t5\n3\t1\tb\t\n4\t3\tc\t.5\n',
  },
  { format: "paths", text: head("fixtures/tidewater-files.paths", 60) },
  { format: "paths", text: "a/b/c\n/abs/x\nd//e/\n./f\na/b\n" },
  { format: "yaml", text: head("fixtures/quillfeather-costs.yaml", 40) },
  // The readings choose-reading picks by shape: a map keyed by path ("" the root, as lock files
  // write it), every value a node (JSON and YAML), and a path list of NUL-ended entries.
  {
    format: "json",
    text:
      '{"name": "tidewater", "lockfileVersion": 3, "packages": {"": {"version": "1.0.0"},\n' +
      ' "node_modules/ledger-core": {"version": "2.1.0", "size": 2048},\n' +
      ' "node_modules/ledger-core/node_modules/mooring": {"size": 7},\n' +
      ' "node_modules/@tidewater/tide-tables": {"size": 1.5e2, "dev": true}}}\n',
  },
  {
    format: "json",
    text: '{"tidewater": {"services": ["ledger", {"mooring-log": 7}], "ok": true, "none": null, "a/b~c": ""}}\n',
    options: { readAs: "values" },
    args: ["--read-as", "values"],
  },
  {
    format: "yaml",
    text: "tidewater:\n  services: [ledger, {mooring-log: 7}]\n  ok: true\n  base: &b {x: 1}\n  copy: *b\n",
    options: { readAs: "values" },
    args: ["--read-as", "values"],
  },
  {
    format: "paths",
    text: "12\tservices/ledger/src\x007\tservices/ledger/test\x000\tdocs/read me\n\x00",
    options: { nulSeparated: true },
    args: ["--nul-separated"],
  },
  // Graphs: a JSON adjacency map and JSON rows with a repeated id (read whole, maxJsonGraphBytes), an
  // edge list and a CSV whose ids repeat with other parents (streamed, maxLineBytes).
  {
    format: "json",
    text:
      '{"tidewater": ["ledger", "mooring-log"], "ledger": {"children": ["core", 7], "size": 12},\n' +
      ' "mooring-log": ["core"], "core": null}\n',
    options: { graph: true },
    args: ["--graph"],
  },
  {
    format: "rows",
    text: '[{"id": "Q1", "parent": ""}, {"id": "Q2", "parent": "Q1"}, {"id": "Q3", "parent": "Q1"},\n {"id": "Q3", "parent": "Q2", "size": 4}]\n',
    options: { graph: true },
    args: ["--graph"],
  },
  { format: "edges", text: "Q1 Q2\nQ1 Q3\nQ2 Q4\nQ3 Q4\n# a comment\nQ4 Q5\n" },
  {
    format: "csv",
    text: "id,parent,name,size\nQ1,,Quillfeather,0\nQ2,Q1,Optics,3\nQ3,Q1,Firmware,\nQ3,Q2,,\n",
    options: { graph: true },
    args: ["--graph"],
  },
];

const INTERESTING = [
  0x22, 0x2c, 0x09, 0x0a, 0x0d, 0x7b, 0x7d, 0x5b, 0x5d, 0x3a, 0x26, 0x2a, 0x2d, 0x2f, 0x7e, 0x5c, 0x23, 0x20,
  0x30, 0x39, 0x2e, 0x65, 0x1b, 0x00, 0xff, 0xc3, 0xe2, 0x80, 0xae, 0xef, 0xbb, 0xbf,
];
const byte = fc.oneof(fc.constantFrom(...INTERESTING), fc.integer({ min: 0, max: 255 }));
const where = fc.double({ min: 0, max: 1, noNaN: true, maxExcluded: true });

type Mutation =
  | { kind: "flip"; at: number; bit: number }
  | { kind: "insert"; at: number; bytes: number[] }
  | { kind: "delete"; at: number; length: number }
  | { kind: "copy"; at: number; length: number; to: number }
  | { kind: "truncate"; at: number };

const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ kind: fc.constant("flip" as const), at: where, bit: fc.integer({ min: 0, max: 7 }) }),
  fc.record({
    kind: fc.constant("insert" as const),
    at: where,
    bytes: fc.array(byte, { minLength: 1, maxLength: 8 }),
  }),
  fc.record({ kind: fc.constant("delete" as const), at: where, length: fc.integer({ min: 1, max: 40 }) }),
  fc.record({
    kind: fc.constant("copy" as const),
    at: where,
    length: fc.integer({ min: 1, max: 200 }),
    to: where,
  }),
  fc.record({ kind: fc.constant("truncate" as const), at: where }),
);

/** Applies byte mutations to `input`, keeping the result under MAX_BYTES. */
function mutate(input: Uint8Array, mutations: readonly Mutation[]): Uint8Array {
  let bytes = Array.from(input);
  for (const m of mutations) {
    const at = Math.floor(m.at * (bytes.length + 1));
    switch (m.kind) {
      case "flip":
        if (at < bytes.length) bytes[at] ^= 1 << m.bit;
        break;
      case "insert":
        bytes.splice(at, 0, ...m.bytes);
        break;
      case "delete":
        bytes.splice(at, m.length);
        break;
      case "copy":
        bytes.splice(Math.floor(m.to * (bytes.length + 1)), 0, ...bytes.slice(at, at + m.length));
        break;
      case "truncate":
        bytes = bytes.slice(0, at);
        break;
    }
  }
  return Uint8Array.from(bytes.slice(0, MAX_BYTES));
}

const utf8 = (text: string) => new TextEncoder().encode(text);
const decode = (bytes: Uint8Array) => new TextDecoder("utf-8").decode(bytes);

/** An input: a mutated seed or random bytes, with the seed's options and a format to force (or detect). */
const input = fc.oneof(
  {
    weight: 4,
    arbitrary: fc
      .record({
        seed: fc.integer({ min: 0, max: SEEDS.length - 1 }),
        mutations: fc.array(mutation, { minLength: 0, maxLength: 6 }),
        forced: fc.oneof(
          fc.constant("seed" as const),
          fc.constant(undefined),
          fc.constantFrom(...inputFormats),
        ),
      })
      .map(({ seed, mutations, forced }) => {
        const s = SEEDS[seed];
        return {
          bytes: mutate(utf8(s.text), mutations),
          format: forced === "seed" ? s.format : forced,
          options: s.options ?? {},
          args: s.args ?? [],
        };
      }),
  },
  {
    weight: 1,
    arbitrary: fc.record({
      bytes: fc.oneof(
        fc.uint8Array({ maxLength: 300 }),
        fc.string({ unit: "binary", maxLength: 200 }).map(utf8),
      ),
      format: fc.oneof(fc.constant(undefined), fc.constantFrom(...inputFormats)),
      options: fc.constant({} as Partial<LoadOptions>),
      args: fc.constant([] as string[]),
    }),
  },
);

/** Runs `load`; a tree or an EspalierError is fine, anything else (or a slow case) fails the property. */
async function typedOnly(load: () => Tree | Promise<Tree>): Promise<Tree | undefined> {
  const start = performance.now();
  try {
    return await load();
  } catch (error) {
    if (error instanceof EspalierError) return undefined;
    throw error;
  } finally {
    expect(performance.now() - start, "a case took too long").toBeLessThan(CASE_MS);
  }
}

/** Chunks of `bytes` cut at the given fractions. */
async function* chunks(bytes: Uint8Array, cuts: readonly number[]): AsyncGenerator<Uint8Array> {
  const at = [...new Set(cuts.map((c) => Math.floor(c * bytes.length)))].sort((a, b) => a - b);
  let from = 0;
  for (const to of [...at, bytes.length]) {
    if (to > from) yield bytes.subarray(from, to);
    from = Math.max(from, to);
  }
}

/** Summarises and renders a loaded tree: only typed errors, lines within the budget, nothing unsafe. */
function renderChecked(tree: Tree, budget: number, focus: number): void {
  const prepared = prepare(tree);
  const spec = prepared.index.path(Math.min(focus, tree.length - 1));
  let result: ReturnType<typeof summarize>;
  try {
    result = summarize(prepared, { foci: [spec], budget, importance: "depth", chains: focus % 2 === 0 });
  } catch (error) {
    if (error instanceof EspalierError) return;
    throw error;
  }
  const chains = focus % 2 === 0;
  const text = renderText(result.view, { units: "bytes", sizes: tree.hasSizes, chains });
  const lines = text.slice(0, -1).split("\n");
  expect(lines.length).toBeLessThanOrEqual(budget);
  for (const line of lines) {
    // A graph's reference line carries the mark & (src/render/marks.ts MARK.reference).
    expect(line).toMatch(/^(?: {2})*[*:.&] /);
    expect(line).not.toMatch(UNSAFE);
  }
  expect(renderMarkdown(result.view, { units: "plain", sizes: tree.hasSizes, chains })).not.toMatch(UNSAFE);
  const json = renderJson(result.view, {
    budget,
    lines: result.selection.lines,
    foci: result.fociPaths,
    labels: false,
  });
  // Every node once: a graph's reference slots (referenceTo >= 0) stand for a node counted at its full entry.
  let nodes = tree.length;
  if (tree.referenceTo) for (const to of tree.referenceTo) if (to >= 0) nodes--;
  expect(JSON.parse(json).totals.nodes).toBe(nodes);
}

describe("fuzz: random and mutated inputs", () => {
  it(
    "loadTree(text) of every format gives a tree or an EspalierError, and the tree summarises and renders safely",
    async () => {
      await fc.assert(
        fc.asyncProperty(input, fc.integer({ min: 1, max: 60 }), fc.nat(), async (c, budget, focus) => {
          const options = { ...defaultLoadOptions, ...c.options, format: c.format, file: "fuzz" };
          const tree = await typedOnly(() => loadTree(decode(c.bytes), options));
          if (tree) renderChecked(tree, budget, focus);
        }),
        params,
      );
    },
    TIMEOUT,
  );

  it(
    "loadTreeFromStream(chunks) gives a tree or an EspalierError however the bytes are cut",
    async () => {
      await fc.assert(
        fc.asyncProperty(input, fc.array(where, { maxLength: 8 }), async (c, cuts) => {
          const options = { ...defaultLoadOptions, ...c.options, format: c.format };
          await typedOnly(() => loadTreeFromStream(chunks(c.bytes, cuts), options));
        }),
        params,
      );
    },
    TIMEOUT,
  );

  it(
    "loadTreeFromStream(chunks) with tiny read limits stops at a limit with LIMIT_EXCEEDED, never holds more",
    async () => {
      const limits = fc.record({
        maxLineBytes: fc.integer({ min: 1, max: 64 }),
        maxTokenBytes: fc.integer({ min: 1, max: 32 }),
        maxYamlBytes: fc.integer({ min: 1, max: 512 }),
        maxJsonGraphBytes: fc.integer({ min: 1, max: 512 }),
      });
      await fc.assert(
        fc.asyncProperty(input, fc.array(where, { maxLength: 8 }), limits, async (c, cuts, lim) => {
          const options = { ...defaultLoadOptions, ...c.options, format: c.format, limits: lim };
          const tree = await typedOnly(() => loadTreeFromStream(chunks(c.bytes, cuts), options));
          if (!tree) return;
          // A tree came back: no piece held whole past its limit can have been in the input.
          if (c.format === "yaml") expect(c.bytes.length).toBeLessThanOrEqual(lim.maxYamlBytes + 3);
          if (c.options?.graph === true && (c.format === "json" || c.format === "rows"))
            expect(c.bytes.length).toBeLessThanOrEqual(lim.maxJsonGraphBytes);
          if (c.format === "paths" || c.format === "csv" || c.format === "tsv") {
            const end = c.options?.nulSeparated === true ? 0x00 : 0x0a;
            let run = 0;
            for (const b of c.bytes) {
              run = b === end ? 0 : run + 1;
              if (c.format === "paths") expect(run).toBeLessThanOrEqual(lim.maxLineBytes + 1);
            }
          }
        }),
        params,
      );
    },
    TIMEOUT,
  );

  it(
    "run(argv) on any input exits 0 with output and at most notes, or 2 with one error line and no output",
    async () => {
      const outputs = fc.constantFrom("text", "json", "markdown", "svg");
      const focus = fc.constantFrom(
        "services",
        "**/ledger",
        "Q2",
        "*",
        "a/b",
        "~2",
        "services/ledger~~2",
        "",
      );
      const extra = fc.subarray([
        ["--importance", "size"],
        ["--no-chains"],
        ["--width", "20"],
        ["--units", "plain"],
        ["--color", "always"],
        ["--focus"],
        ["--label", "{name}/{path}/{id}"],
        ["--pseudonymize"],
        ["--max-nodes", "7"],
      ]);
      await fc.assert(
        fc.asyncProperty(
          input,
          fc.integer({ min: 1, max: 60 }),
          outputs,
          extra,
          focus,
          async (c, budget, output, more, spec) => {
            const options = more.flatMap((o) => (o[0] === "--focus" ? ["--focus", spec] : o));
            const args = ["-", "--budget", String(budget), "--format", output, ...c.args, ...options];
            if (c.format !== undefined) args.push("--input-format", c.format);
            const start = performance.now();
            const r = await cli(args, { stdin: c.bytes, env: { ESPALIER_PSEUDONYM_KEY: "fuzz" } });
            expect(performance.now() - start, "a case took too long").toBeLessThan(CASE_MS);
            // A loader's notes (docs/architecture.md: a reading that may not be what the input meant is
            // said, one `espalier: note:` line each) come first, whatever the exit; nothing else may.
            const notes = /^(?:espalier: note: [^\n]*\[[A-Z_]+\]\n)*/.exec(r.stderr)?.[0] ?? "";
            const rest = r.stderr.slice(notes.length);
            if (r.code === 0) {
              expect(rest).toBe("");
              expect(r.stdout.length).toBeGreaterThan(0);
            } else {
              expect(r.code).toBe(2);
              expect(r.stdout).toBe("");
              expect(rest).toMatch(/^espalier: [^\n]*\[[A-Z_]+\]\n$/);
              expect(rest).not.toMatch(/^espalier: note:/);
              expect(r.stderr).not.toContain("[INTERNAL]");
            }
          },
        ),
        params,
      );
    },
    TIMEOUT,
  );

  it(
    "renderText and renderMarkdown of random names: every line starts with indentation and a mark, nothing unsafe",
    async () => {
      const name = fc.string({
        unit: LONG
          ? "binary"
          : fc.constantFrom(
              "a",
              "\n",
              "\r",
              "\u001b",
              "\u202e",
              "\u2028",
              "\u009b",
              ":",
              "#",
              "/",
              "~",
              "*",
              " ",
              "\u0000",
              "é",
              "😀",
            ),
        maxLength: 30,
      });
      await fc.assert(
        fc.property(
          fc.array(name, { minLength: 1, maxLength: 12 }),
          fc.integer({ min: 1, max: 20 }),
          (names, budget) => {
            const doc = JSON.stringify({
              name: names[0],
              children: names.slice(1).map((n) => ({ name: n, size: 1 })),
            });
            const tree = loadTree(doc, { ...defaultLoadOptions, format: "json" });
            renderChecked(tree, Math.max(budget, 2), budget);
          },
        ),
        params,
      );
    },
    TIMEOUT,
  );
});
