import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import Ajv2020 from "ajv/dist/2020.js";
import { describe, expect, it } from "vitest";
import { defaultLoadOptions, loadTree } from "../../src/load/index.js";
import { FOLD_NAME, SAVED_SUMMARY_FORMAT, savedOutputFormat } from "../../src/load/saved-output.js";
import { SUMMARY_FORMAT } from "../../src/render/summary-schema.js";
import { cli } from "../helpers/cli.js";
import { leakedNames } from "../helpers/leaked-names.js";

// The fixtures are an invented scenario: Quillfeather's org chart (a fictional company) and the
// Tidewater monorepo's file listing.
const org = (file: string) => new URL(`../../fixtures/${file}`, import.meta.url).pathname;
const ORG = ["fixtures/quillfeather-org.csv", "--parent-field", "manager", "--size-field", "cost"];
const FILES = ["fixtures/tidewater-files.paths"];

// Validated with Ajv 8.20.0, a general-purpose JSON Schema (draft 2020-12) validator from the registry,
// against the schema espalier publishes (docs/summary.schema.json).
const schema = JSON.parse(readFileSync(new URL("../../docs/summary.schema.json", import.meta.url), "utf8"));
const validate = new Ajv2020.default({ allErrors: true }).compile(schema);

interface Node {
  name: string;
  path: string;
  nodes: number;
  size: number;
  children: Node[];
  hidden: { children: number; nodes: number; size: number } | null;
}

const dir = mkdtempSync(join(tmpdir(), "saved-output-"));
let written = 0;
function save(text: string): string {
  const file = join(dir, `saved-${++written}.json`);
  writeFileSync(file, text);
  return file;
}

/** A summary the CLI writes, saved to a file, and the document. */
async function saved(
  args: string[],
): Promise<{ file: string; doc: { totals: Node; root: Node } & Record<string, unknown> }> {
  const made = await cli([...args, "--format", "json"]);
  expect(made.code, made.stderr).toBe(0);
  return { file: save(made.stdout), doc: JSON.parse(made.stdout) };
}

function* walk(node: Node): Generator<Node> {
  const stack = [node];
  while (stack.length > 0) {
    const n = stack.pop()!;
    yield n;
    stack.push(...n.children);
  }
}

/**
 * Every node's count adds up: nodes = 1 + shown children + folded, size likewise (docs/selection.md
 * rule 5); but a saved fold's entry, a leaf that stands for the nodes and size the fold hid
 * (docs/input.md).
 */
function addsUp(root: Node): void {
  for (const n of walk(root)) {
    if (n.name === FOLD_NAME) {
      expect(n.children, n.path).toEqual([]);
      expect(n.hidden, n.path).toBeNull();
      continue;
    }
    const nodes = 1 + n.children.reduce((s, c) => s + c.nodes, 0) + (n.hidden?.nodes ?? 0);
    expect(n.nodes, n.path).toBe(nodes);
    const inside = n.children.reduce((s, c) => s + c.size, 0) + (n.hidden?.size ?? 0);
    expect(n.size, n.path).toBeGreaterThanOrEqual(inside);
  }
}

describe("savedOutputFormat(head)", () => {
  it("reads the format espalier writes, and the summary format is the one read back", () => {
    expect(SAVED_SUMMARY_FORMAT).toBe(SUMMARY_FORMAT);
    expect(savedOutputFormat('{\n  "format": "espalier-summary/1",\n  "budget": 4')).toBe(
      "espalier-summary/1",
    );
    expect(savedOutputFormat('\uFEFF { "format" : "espalier-diff/1" }')).toBe("espalier-diff/1");
    // Another first member, or another program's format: not espalier's output.
    expect(savedOutputFormat('{ "name": "x", "format": "espalier-summary/1" }')).toBeUndefined();
    expect(savedOutputFormat('{ "format": "tarball/3" }')).toBeUndefined();
    expect(savedOutputFormat('[{ "format": "espalier-summary/1" }]')).toBeUndefined();
  });
});

describe("espalier SAVED.json (a summary espalier wrote)", () => {
  for (const [what, args] of [
    ["an org chart", ORG],
    ["a file listing", FILES],
  ] as const) {
    it(`reads ${what}'s saved view with the saved totals, every node's count and size, and each fold as one entry`, async () => {
      const { file, doc } = await saved([
        ...args,
        "--budget",
        "24",
        "--focus",
        args === ORG ? "Q2417" : "data/tide-tables/gull-rock",
      ]);
      const again = await cli([file, "--budget", "200", "--format", "json"]);
      expect(again.code, again.stderr).toBe(0);
      const back = JSON.parse(again.stdout);
      expect(validate(back), JSON.stringify(validate.errors)).toBe(true);
      expect(back.totals).toEqual(doc.totals);
      expect(back.input.notes.map((n: { code: string }) => n.code)).toContain("SAVED_VIEW");
      addsUp(back.root);
      // Everything the saved view showed is shown (the budget holds it all), with its own totals; each
      // fold is one leaf named so, standing for the fold's nodes and size.
      const shown = new Map([...walk(back.root)].map((n) => [n.path, n]));
      let folds = 0;
      for (const n of walk(doc.root)) {
        expect(shown.get(n.path), n.path).toMatchObject({ nodes: n.nodes, size: n.size });
        if (n.hidden === null) continue;
        folds++;
        const entry = shown.get(n.path === "" ? FOLD_NAME : `${n.path}/${FOLD_NAME}`);
        expect(entry, n.path).toMatchObject({ nodes: n.hidden.nodes, size: n.hidden.size, children: [] });
      }
      expect(folds).toBeGreaterThan(0);
    });
  }

  it("keeps the saved totals at any budget, the folds' entries folded again", async () => {
    const { file, doc } = await saved([...FILES, "--budget", "40"]);
    for (const budget of ["4", "9", "25"]) {
      const again = await cli([file, "--budget", budget, "--format", "json"]);
      expect(again.code, again.stderr).toBe(0);
      const back = JSON.parse(again.stdout);
      expect(validate(back), JSON.stringify(validate.errors)).toBe(true);
      expect(back.totals).toEqual(doc.totals);
      addsUp(back.root);
    }
    const text = await cli([file, "--budget", "12"]);
    expect(text.code, text.stderr).toBe(0);
    expect(text.stdout).toContain(`${doc.totals.nodes.toLocaleString("en-US")} nodes`);
  });

  it("starts at a shown node with --start-at /root/children/N, with that node's totals", async () => {
    const { file, doc } = await saved([...FILES, "--budget", "20"]);
    const child = doc.root.children[0];
    const whole = await cli([file, "--start-at", "/root", "--format", "json"]);
    expect(JSON.parse(whole.stdout).totals).toEqual(doc.totals);
    const part = await cli([file, "--start-at", "/root/children/0", "--format", "json"]);
    expect(part.code, part.stderr).toBe(0);
    expect(JSON.parse(part.stdout).totals).toEqual({ nodes: child.nodes, size: child.size });
    for (const pointer of ["/root/hidden", "/totals", "/root/children/99"]) {
      const bad = await cli([file, "--start-at", pointer]);
      expect(bad.code).toBe(2);
      expect(bad.stderr).toContain("[USAGE]");
      expect(bad.stdout).toBe("");
    }
  });

  it("reads the same with --read-as nodes, and its JSON text with --read-as values", async () => {
    const { file, doc } = await saved([...ORG, "--budget", "12"]);
    const nodes = await cli([file, "--read-as", "nodes", "--format", "json"]);
    expect(JSON.parse(nodes.stdout).totals).toEqual(doc.totals);
    const values = await cli([file, "--read-as", "values", "--format", "json"]);
    expect(values.code, values.stderr).toBe(0);
    expect(JSON.parse(values.stdout).input.shape).toBe("values");
  });

  it("prints no name of the saved org chart under --pseudonymize", async () => {
    const { file, doc } = await saved([...ORG, "--budget", "30"]);
    const names = [...walk(doc.root)].map((n) => n.name);
    const hidden = await cli([file, "--pseudonymize", "--budget", "30"], {
      env: { ESPALIER_PSEUDONYM_KEY: "saved-output-test" },
    });
    expect(hidden.code, hidden.stderr).toBe(0);
    expect(leakedNames(hidden.stdout + hidden.stderr, names)).toEqual([]);
  });

  it("is SHAPE when its counts were changed after espalier wrote it (no other totals are read)", async () => {
    const { doc } = await saved([...FILES, "--budget", "12"]);
    const child = doc.root.children[0];
    child.nodes += 1;
    const changed = await cli([save(JSON.stringify(doc)), "--format", "json"]);
    expect(changed.code).toBe(2);
    expect(changed.stderr).toContain("[SHAPE]");
    expect(changed.stdout).toBe("");
    child.nodes -= 1;
    (doc.totals as unknown as { size: number }).size += 1;
    const totals = await cli([save(JSON.stringify(doc))]);
    expect(totals.code).toBe(2);
    expect(totals.stderr).toContain("[SHAPE]");
  });

  it("is PARSE_JSON at its line when cut short (a CI log's copy), with nothing on standard output", async () => {
    const { file } = await saved([...ORG, "--budget", "12"]);
    const text = readFileSync(file, "utf8");
    const cut = text.slice(0, text.indexOf('"root"') + 20);
    const read = await cli([save(cut)]);
    expect(read.code).toBe(2);
    expect(read.stderr).toContain("[PARSE_JSON]");
    expect(read.stderr).toContain(`:${cut.split("\n").length}:`);
    expect(read.stdout).toBe("");
  });

  it("is SHAPE for a summary with reference lines (YAML aliases), whose folds may hide what they name", async () => {
    // An invented build graph: the alias *kelp names the anchored node a second time.
    const yaml = join(mkdtempSync(join(dir, "yaml-")), "harbour-ci.yaml");
    writeFileSync(
      yaml,
      "name: harbour\nchildren:\n  - &kelp\n    name: kelp-runner\n    children:\n      - name: net\n  - name: tern\n    children:\n      - *kelp\n",
    );
    const { file } = await saved([yaml, "--budget", "5"]);
    const read = await cli([file]);
    expect(read.code).toBe(2);
    expect(read.stderr).toContain("[SHAPE]");
    expect(read.stdout).toBe("");
  });

  it("is SHAPE for a format version it does not read", async () => {
    const { doc } = await saved([...ORG, "--budget", "12"]);
    const later = await cli([save(JSON.stringify({ ...doc, format: "espalier-summary/2" }))]);
    expect(later.code).toBe(2);
    expect(later.stderr).toContain("[SHAPE]");
  });
});

/** `value` with every object's keys sorted, as `jq -S .` writes them (common practice, no source). */
function sortedKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sortedKeys);
  if (value === null || typeof value !== "object") return value;
  const record = value as Record<string, unknown>;
  return Object.fromEntries(
    Object.keys(record)
      .sort()
      .map((k) => [k, sortedKeys(record[k])]),
  );
}

/**
 * A saved output as CI steps rewrite it: `jq -S .` (keys sorted, 2 spaces), `jq -c .` (one line) and
 * `python3 -m json.tool --sort-keys` (4 spaces, non-ASCII as \u escapes); the layouts are those tools'
 * defaults (common practice, no source).
 */
function rewritten(doc: unknown): Record<string, string> {
  const ascii = (s: string) =>
    s.replace(/[^\x00-\x7f]/g, (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, "0")}`);
  return {
    "jq -S .": `${JSON.stringify(sortedKeys(doc), null, 2)}\n`,
    "jq -c .": `${JSON.stringify(doc)}\n`,
    "python3 -m json.tool --sort-keys": `${ascii(JSON.stringify(sortedKeys(doc), null, 4))}\n`,
  };
}

describe("espalier SAVED.json rewritten by a CI step (keys sorted, re-spaced)", () => {
  it("reads the view it holds, with the saved totals, from a file, from standard input and through loadTree", async () => {
    const { doc } = await saved([...ORG, "--budget", "16", "--focus", "Q2417"]);
    const asSaved = await cli([save(JSON.stringify(doc)), "--budget", "40", "--format", "json"]);
    expect(asSaved.code, asSaved.stderr).toBe(0);
    for (const [step, text] of Object.entries(rewritten(doc))) {
      for (const read of [
        await cli([save(text), "--budget", "40", "--format", "json"]),
        await cli(["-", "--budget", "40", "--format", "json"], { stdin: text }),
      ]) {
        expect(read.code, `${step}: ${read.stderr}`).toBe(0);
        const back = JSON.parse(read.stdout);
        expect(
          back.input.notes.map((n: { code: string }) => n.code),
          step,
        ).toContain("SAVED_VIEW");
        expect(back.totals, step).toEqual(doc.totals);
        expect(back.root, step).toEqual(JSON.parse(asSaved.stdout).root);
      }
      const tree = loadTree(text, { ...defaultLoadOptions, file: "org.json" });
      expect(
        tree.reading?.notes?.map((n) => n.code),
        step,
      ).toContain("SAVED_VIEW");
    }
  });

  it("reads it when sorted foci fill more than the start read to tell the format (64 KiB)", async () => {
    // jq -S puts "budget" and "foci" before "format": a long list of foci pushes it further.
    const { doc } = await saved([...FILES, "--budget", "12"]);
    const foci = Array.from({ length: 4000 }, (_, k) => `data/tide-tables/station-${k}/{spring,neap}`);
    const text = JSON.stringify(sortedKeys({ ...doc, foci }), null, 2);
    expect(text.indexOf('"format"')).toBeGreaterThan(1 << 17);
    const read = await cli([save(text), "--format", "json"]);
    expect(read.code, read.stderr).toBe(0);
    expect(JSON.parse(read.stdout).totals).toEqual(doc.totals);
    expect(read.stderr).toContain("[SAVED_VIEW]");
  });

  it("reads a user's document with such members as its values: a member espalier does not write comes first", async () => {
    const { doc } = await saved([...FILES, "--budget", "8"]);
    const own = JSON.stringify(sortedKeys({ ...doc, audience: "harbour ops" }), null, 2);
    const read = await cli([save(own), "--format", "json"]);
    expect(read.code, read.stderr).toBe(0);
    expect(read.stderr).not.toContain("SAVED_VIEW");
    expect(JSON.parse(read.stdout).input.shape).toBe("values");
  });

  it("is SHAPE for a saved diff passed through jq -S ., naming what to run", async () => {
    const made = await cli(["diff", ...FILES, ...FILES, "--format", "json"]);
    expect(made.code, made.stderr).toBe(0);
    for (const [step, text] of Object.entries(rewritten(JSON.parse(made.stdout)))) {
      const read = await cli([save(text)]);
      expect(read.code, step).toBe(2);
      expect(read.stdout, step).toBe("");
      expect(read.stderr, step).toContain("[SHAPE]");
      expect(read.stderr, step).toContain("run espalier diff on the two inputs it compared");
    }
  });
});

describe("espalier diff and saved outputs", () => {
  it("is SHAPE for a saved diff read as a tree, and reads its JSON text with --read-as values", async () => {
    const made = await cli([
      "diff",
      org("quillfeather-org.csv"),
      org("quillfeather-org.csv"),
      "--parent-field",
      "manager",
      "--format",
      "json",
    ]);
    expect(made.code, made.stderr).toBe(0);
    const file = save(made.stdout);
    const read = await cli([file]);
    expect(read.code).toBe(2);
    expect(read.stderr).toContain("[SHAPE]");
    expect(read.stdout).toBe("");
    const values = await cli([file, "--read-as", "values"]);
    expect(values.code, values.stderr).toBe(0);
  });

  // Validated with Ajv 8.20.0 against the diff schema espalier publishes (docs/diff.schema.json).
  const diffSchema = JSON.parse(
    readFileSync(new URL("../../docs/diff.schema.json", import.meta.url), "utf8"),
  );
  const validateDiff = new Ajv2020.default({ allErrors: true }).compile(diffSchema);

  it("compares views of one tree saved at different budgets at the coarser one's folds: nothing changed", async () => {
    // One tree saved at two budgets: the bigger view shows nodes the smaller folds. Counting them added
    // (a first version did, exit 1 under --fail-on-change) is a change no one made; refusing them (the
    // next) left CI jobs whose budget changed nothing to compare. Selections are nested
    // (docs/selection.md rule 2), so every pair reads exactly at the smaller view's folds.
    for (const args of [FILES, [...ORG, "--focus", "Q2417"]]) {
      const views = [];
      for (const budget of ["8", "12", "20", "40"]) views.push(await saved([...args, "--budget", budget]));
      for (const [k, a] of views.entries()) {
        for (const b of views.slice(k + 1)) {
          for (const [old, now, finer] of [
            [a, b, "NEW"],
            [b, a, "OLD"],
          ] as const) {
            const diff = await cli(["diff", old.file, now.file, "--fail-on-change", "--format", "json"]);
            expect(diff.code, diff.stderr).toBe(0);
            const doc = JSON.parse(diff.stdout);
            expect(validateDiff(doc), JSON.stringify(validateDiff.errors)).toBe(true);
            expect(doc.changes).toEqual({
              added: 0,
              removed: 0,
              moved: 0,
              renamed: 0,
              edited: 0,
              resized: 0,
            });
            expect(doc.totals.old).toEqual(old.doc.totals);
            expect(doc.totals.new).toEqual(now.doc.totals);
            const atFolds = doc.notes.filter((n: { code: string }) => n.code === "COMPARED_AT_FOLDS");
            expect(atFolds.map((n: { version: string }) => n.version)).toEqual(
              JSON.stringify(a.doc.root) === JSON.stringify(b.doc.root) ? [] : [finer],
            );
            addsUp(doc.root);
          }
        }
      }
    }
  });

  it("compares a saved view with the input itself at the view's folds, and says so in the header", async () => {
    const a = await saved([...FILES, "--budget", "12"]);
    const diff = await cli(["diff", a.file, ...FILES, "--fail-on-change", "--budget", "30"]);
    expect(diff.code, diff.stderr).toBe(0);
    expect(diff.stdout.split("\n")[0]).toMatch(
      /NEW: compared at [0-9]+ folds of OLD, the nodes inside counted in them/,
    );
    expect(diff.stderr).toContain("[COMPARED_AT_FOLDS]");
  });

  it("counts a node removed inside the coarser view's fold in that fold, exactly", async () => {
    const listing = readFileSync(org("tidewater-files.paths"), "utf8");
    // The same file name, so the two roots are named alike; a file the budget-12 view folds, shown at 40.
    const later = join(mkdtempSync(join(dir, "budgets-")), "tidewater-files.paths");
    const gone = "./tools/";
    const lines = listing.trimEnd().split("\n");
    const at = lines.findIndex((l) => l.includes(gone) && /\.[a-z]+$/.test(l));
    writeFileSync(later, `${lines.filter((_, k) => k !== at).join("\n")}\n`);
    const a = await saved([...FILES, "--budget", "12"]);
    const b = await saved([later, "--budget", "40"]);
    const direct = await cli(["diff", ...FILES, later, "--format", "json"]);
    const whole = JSON.parse(direct.stdout);
    const diff = await cli(["diff", a.file, b.file, "--budget", "200", "--format", "json"]);
    expect(diff.code, diff.stderr).toBe(0);
    const doc = JSON.parse(diff.stdout);
    expect(doc.totals.old).toEqual(a.doc.totals);
    expect(doc.totals.new).toEqual(b.doc.totals);
    expect(doc.totals.delta).toBe(whole.totals.delta);
    // The one change: the fold of tools that holds the file, its count one less (1 + shown + folded).
    const edited = [...walk(doc.root)].filter((n) => (n as { change?: string }).change === "edited");
    expect(edited.map((n) => n.path)).toEqual([`tools/${FOLD_NAME}`]);
    expect(doc.changes).toMatchObject({ added: 0, removed: 0, edited: 1 });
    addsUp(doc.root);
  });

  it("compares a saved view with an input whose records hold fields the view does not keep: not an edit from nothing", async () => {
    // Field test: a saved org chart against the table it came from said every node edited, "title
    // (none) -> Pilot", and --fail-on-change exited 1. An invented crew list of the fictional Tidewater
    // harbour office.
    const crew = join(mkdtempSync(join(dir, "crew-")), "crew.csv");
    writeFileSync(
      crew,
      "id,parent,name,title\nQ1,,Ines Harrow,Harbourmaster\nQ2,Q1,Oda Brine,Pilot\nQ3,Q1,Tove Lind,Deckhand\nQ4,Q2,Arno Vell,Pilot\n",
    );
    for (const budget of ["3", "10"]) {
      const a = await saved([crew, "--budget", budget]);
      for (const pair of [
        [a.file, crew],
        [crew, a.file],
      ]) {
        const diff = await cli(["diff", ...pair, "--fail-on-change", "--format", "json"]);
        expect(diff.code, diff.stdout).toBe(0);
        expect(JSON.parse(diff.stdout).changes).toMatchObject({ edited: 0, added: 0, removed: 0 });
        expect(diff.stderr).toContain("[FIELDS_NOT_COMPARED]");
      }
    }
  });

  it("refuses two views whose folds cross (saved with other foci): a node each shows may be in the other's fold", async () => {
    const a = await saved([...FILES, "--budget", "12", "--focus", "libs"]);
    const b = await saved([...FILES, "--budget", "12", "--focus", "services"]);
    const diff = await cli(["diff", a.file, b.file, "--fail-on-change"]);
    expect(diff.code, diff.stderr).toBe(2);
    expect(diff.stdout).toBe("");
    expect(diff.stderr).toContain("[SHAPE]");
    expect(diff.stderr).toContain('NEW shows "services"');
    expect(diff.stderr).toContain('OLD shows "libs"');
    expect(diff.stderr).toContain("diff the original inputs");
  });

  it("compares two saved summaries with their saved totals, each fold counted as the nodes it stands for", async () => {
    const listing = readFileSync(org("tidewater-files.paths"), "utf8");
    // The same file name, so the two roots are named alike; a file removed deep in a folded folder.
    const later = join(mkdtempSync(join(dir, "fewer-")), "tidewater-files.paths");
    const lines = listing.trimEnd().split("\n");
    const gone = lines.findLastIndex((l) => /\/.+\/.+\//.test(l) && !l.endsWith("/"));
    writeFileSync(later, `${lines.filter((_, k) => k !== gone).join("\n")}\n`);
    const a = await saved([...FILES, "--budget", "12"]);
    const b = await saved([later, "--budget", "12"]);
    expect(b.doc.totals.nodes).toBe(a.doc.totals.nodes - 1);
    const diff = await cli(["diff", a.file, b.file, "--budget", "200", "--format", "json"]);
    expect(diff.code, diff.stderr).toBe(0);
    const doc = JSON.parse(diff.stdout);
    expect(validateDiff(doc), JSON.stringify(validateDiff.errors)).toBe(true);
    expect(doc.totals.old).toEqual(a.doc.totals);
    expect(doc.totals.new).toEqual(b.doc.totals);
    // The lines count NEW's nodes and the removed ones: the removed count is in nodes too.
    expect(doc.totals.nodes).toBe(doc.totals.new.nodes + doc.changes.removed);
    expect(doc.notes.map((n: { code: string }) => n.code)).toEqual(["SAVED_VIEW", "SAVED_VIEW"]);
    addsUp(doc.root);
  });

  it("compares two roots espalier named after their inputs as one root, as it compares the inputs (files named apart)", async () => {
    // Field test: the saved summaries of two days' listings of one folder (find DIR -printf '%s\t%P\n',
    // whose first line, an empty path, is the folder) said "1 renamed" and --fail-on-change exited 1,
    // where the listings themselves compare with nothing changed. So did a table's with several rows
    // without a parent, a fact table's rollup and a YAML document read as values. Invented inputs of
    // the fictional Tidewater monorepo and Quillfeather's cost export, named by day.
    const day = mkdtempSync(join(dir, "days-"));
    const listing = "4096\t\n4096\tservices\n812\tservices/ledger.ts\n4096\tdocs\n96\tdocs/tides.md\n";
    const table = "id,parent,name\n1,,ledger\n2,,tides\n3,1,brine\n";
    const facts = readFileSync(org("quillfeather-cost-export.csv"), "utf8");
    const pairs: [string, string, string, string[]][] = [
      ["listing-mon.tsv", "listing-tue.tsv", listing, []],
      ["teams-mon.csv", "teams-tue.csv", table, []],
      ["deploy-mon.yaml", "deploy-tue.yaml", "ledger:\n  replicas: 3\ntides:\n  replicas: 1\n", []],
      ["costs-mon.csv", "costs-tue.csv", facts, ["--levels", "account,service", "--size-field", "cost"]],
      // A document whose top node has no name, an array of top-level nodes, a list of relative paths
      // and a YAML document without a root name: each root named after its file, as the inputs are.
      ["tides-mon.json", "tides-tue.json", '{"children":[{"name":"ledger","size":3},{"name":"tides"}]}', []],
      ["stations-mon.json", "stations-tue.json", '[{"name":"gull-rock","size":3},{"name":"kelp-point"}]', []],
      ["paths-mon.txt", "paths-tue.txt", "services/ledger.ts\nservices/tides.ts\ndocs/a.md\n", []],
      ["crew-mon.yaml", "crew-tue.yaml", "children:\n  - name: ledger\n  - name: tides\n", []],
    ];
    for (const [mon, tue, text, how] of pairs) {
      for (const name of [mon, tue]) writeFileSync(join(day, name), text);
      const plain = await cli([
        "diff",
        join(day, mon),
        join(day, tue),
        ...how,
        "--fail-on-change",
        "--format",
        "json",
      ]);
      expect(plain.code, plain.stderr).toBe(0);
      expect(JSON.parse(plain.stdout).changes.renamed).toBe(0);
      const a = await saved([join(day, mon), ...how, "--budget", "3"]);
      const b = await saved([join(day, tue), ...how, "--budget", "3"]);
      expect(a.doc.root.name).toBe(mon);
      expect(b.doc.root.name).toBe(tue);
      // Two saves, and a save against the other day's input either way round (a fact table's options
      // do not apply to a saved summary: two saves only).
      const mixed =
        how.length === 0 ? [[a.file, join(day, tue)] as const, [join(day, mon), b.file] as const] : [];
      for (const [old, now] of [[a.file, b.file] as const, ...mixed]) {
        const diff = await cli(["diff", old, now, "--fail-on-change", "--format", "json"]);
        expect(diff.code, `${old} ${now}: ${diff.stdout}`).toBe(0);
        const doc = JSON.parse(diff.stdout);
        expect(validateDiff(doc), JSON.stringify(validateDiff.errors)).toBe(true);
        expect(doc.changes).toMatchObject({ added: 0, removed: 0, renamed: 0, edited: 0 });
        expect(doc.root.change).toBeNull();
      }
    }
    // A root of the input's own (the org chart's head) is no such root: renamed, it is a change.
    const org1 = join(day, "org-mon.csv");
    const org2 = join(day, "org-tue.csv");
    writeFileSync(org1, "id,parent,name\nQ1,,Ines Harrow\nQ2,Q1,Oda Brine\n");
    writeFileSync(org2, "id,parent,name\nQ1,,Tove Lind\nQ2,Q1,Oda Brine\n");
    const a = await saved([org1]);
    const b = await saved([org2]);
    const diff = await cli(["diff", a.file, b.file, "--fail-on-change", "--format", "json"]);
    expect(diff.code, diff.stderr).toBe(1);
    expect(JSON.parse(diff.stdout).changes).toMatchObject({ renamed: 1 });
  });

  it("says a fold changed when what it hid did: edited by its folded field, its size net", async () => {
    const listing = readFileSync(org("tidewater-files.paths"), "utf8");
    // The same file name, so the two roots are named alike.
    const later = join(mkdtempSync(join(dir, "later-")), "tidewater-files.paths");
    writeFileSync(later, `${listing.trimEnd()}\n100\t./data/tide-tables/gull-rock/spring-tides.csv\n`);
    const a = await saved([...FILES, "--budget", "10"]);
    const b = await saved([later, "--budget", "10"]);
    expect(b.doc.totals).toEqual({ nodes: a.doc.totals.nodes + 1, size: a.doc.totals.size + 100 });
    const diff = await cli(["diff", a.file, b.file, "--budget", "200", "--format", "json"]);
    expect(diff.code, diff.stderr).toBe(0);
    const doc = JSON.parse(diff.stdout);
    expect(validateDiff(doc), JSON.stringify(validateDiff.errors)).toBe(true);
    expect(doc.totals.delta).toBe(100);
    expect(doc.changes).toMatchObject({ added: 0, removed: 0, edited: 1 });
    const edited = [...walk(doc.root)].filter((n) => (n as { change?: string }).change === "edited");
    expect(edited.map((n) => n.name)).toEqual([FOLD_NAME]);
    expect((edited[0] as unknown as { edits: { field: string }[] }).edits.map((e) => e.field)).toEqual([
      "folded",
    ]);
  });
});
