import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import Ajv2020 from "ajv/dist/2020.js";
import { Parser } from "commonmark";
import { describe, expect, it } from "vitest";
import { loadTree } from "../../src/load/index.js";
import { renderSvg } from "../../src/render/icicle-svg.js";
import { renderJson } from "../../src/render/summary-json.js";
import { renderMarkdown } from "../../src/render/summary-markdown.js";
import { renderText } from "../../src/render/summary-text.js";
import { prepare, summarize } from "../../src/summarize.js";
import { cli } from "../helpers/cli.js";
import { opts } from "../load/helpers.js";
import { checkText } from "../screens/read-screen.mjs";

const EDGES = new URL("../../fixtures/tidewater-deps.edges", import.meta.url).pathname;
const PACKAGES = new URL("../../fixtures/tidewater-packages.csv", import.meta.url).pathname;

// Invented packages of the fictional tidewater monorepo: tern-fmt is shared by two parents; a cycle
// closes at brine -> kelp-log.
const graph = loadTree(
  "ledger kelp-log\nledger tern-fmt\nkelp-log tern-fmt\nkelp-log brine\nbrine kelp-log\n",
  opts({ format: "edges" }),
);

function run(foci: string[], budget: number, chains = true, key?: string) {
  const result = summarize(prepare(graph), { foci, budget, importance: "depth", chains, pseudonymKey: key });
  return {
    result,
    text: renderText(result.view, { units: "plain", sizes: false, chains }),
    json: renderJson(result.view, {
      budget,
      lines: result.selection.lines,
      foci: result.fociPaths,
      labels: false,
    }),
    markdown: renderMarkdown(result.view, { units: "plain", sizes: false, chains }),
    svg: renderSvg(result.view, { units: "plain", sizes: false }),
  };
}

describe("renderText / renderJson / renderMarkdown / renderSvg on a graph", () => {
  it("gives a reference its own line with the & mark and where the full entry is, never joined to a chain", () => {
    const { text, result } = run([], 20);
    expect(text).toBe(
      [
        ". ledger  4 nodes",
        "  . kelp-log  3 nodes",
        "    . tern-fmt",
        "    . brine",
        "      & kelp-log  cycle, full entry above at kelp-log",
        "  & tern-fmt  full entry at kelp-log/tern-fmt",
        "",
      ].join("\n"),
    );
    // brine's only child is a reference: it keeps a line of its own, as the fit counted it.
    expect(result.selection.lines).toBe(text.trimEnd().split("\n").length);
  });

  it("writes references in JSON that validates against the published schema", () => {
    // Validated with Ajv 8.20.0, a general-purpose JSON Schema (draft 2020-12) validator from the registry.
    const schema = JSON.parse(
      readFileSync(new URL("../../docs/summary.schema.json", import.meta.url), "utf8"),
    );
    const validate = new Ajv2020.default({ allErrors: true }).compile(schema);
    const { json } = run(["tern-fmt"], 20);
    const doc = JSON.parse(json);
    expect(validate(doc), JSON.stringify(validate.errors)).toBe(true);
    const ref = doc.root.children[1];
    expect(ref).toMatchObject({
      name: "tern-fmt",
      nodes: 0,
      size: 0,
      reference: { path: "kelp-log/tern-fmt", cycle: false },
    });
    const focus = doc.root.children[0].children[0];
    expect(focus).toMatchObject({ focus: true, parents: { count: 2, hidden: 0 } });
  });

  it("folds references with a count of their own, and says how many parents of a focus did not fit", () => {
    const { text } = run(["tern-fmt"], 3, false);
    // ledger, kelp-log, tern-fmt are forced; the reference under ledger and brine are folded.
    expect(text).toBe(
      [
        ": ledger  4 nodes  (hidden: 1 child, 0 nodes, 1 reference)",
        "  : kelp-log  3 nodes  (hidden: 1 child, 1 node, 1 reference)",
        "    * tern-fmt  2 parents, 1 not shown",
        "",
      ].join("\n"),
    );
  });

  it("renders a reference in Markdown as literal text (CommonMark 0.31 parser from the registry)", () => {
    const { markdown } = run([], 20);
    const line = markdown.split("\n").find((l) => l.includes("tern-fmt") && l.includes("full entry"))!;
    expect(line).toBe("  - & ` tern-fmt ` · *full entry at kelp-log/tern-fmt*");
    // Parsed by the commonmark package (0.31.2): the & stays text, the name a code span, the where-note emphasis.
    const doc = new Parser().parse(line.trim());
    const text: string[] = [];
    const walker = doc.walker();
    for (let e = walker.next(); e; e = walker.next())
      if (e.entering && (e.node.type === "text" || e.node.type === "code")) text.push(e.node.literal ?? "");
    expect(text.join("")).toBe("& tern-fmt · full entry at kelp-log/tern-fmt");
  });

  it("draws a reference in SVG as a dashed block whose tooltip says where the full entry is", () => {
    const { svg } = run([], 20);
    expect(svg).toContain('stroke-dasharray="2 2"');
    expect(svg).toContain("reference, counted at its full entry at kelp-log/tern-fmt");
    expect(svg).toContain("reference: a node whose full entry (and count) is elsewhere");
  });
});

describe("espalier --input-format edges (command line)", () => {
  it("says what a fold of references only hides, at every width and small budget (summary and diff)", async () => {
    // Field test: `(0 hidden)` on an SBOM's packages whose dependencies are all shown elsewhere, at 40
    // columns. Invented packages of the fictional harbor repo: quay-api's two dependencies have their
    // full entries under ledger, so quay-api's fold holds 0 nodes and 2 references.
    const old =
      "harbor ledger\nharbor quay-api\nledger brine-util\nledger tern-fmt\nquay-api brine-util\nquay-api tern-fmt\n";
    const now = `${old}ledger kelp-log\n`;
    const files = { "old.edges": old, "new.edges": now };
    let seen = 0;
    for (const width of [30, 32, 40, 50, 60, 80])
      for (const budget of [6, 7, 8, 9, 10]) {
        const runs = [
          await cli(
            ["old.edges", "--input-format", "edges", "--width", `${width}`, "--budget", `${budget}`],
            {
              files,
            },
          ),
          await cli(
            [
              "diff",
              "old.edges",
              "new.edges",
              "--input-format",
              "edges",
              "--width",
              `${width}`,
              "--budget",
              `${budget}`,
            ],
            { files },
          ),
        ];
        for (const [k, out] of runs.entries()) {
          // A narrow diff's header takes more lines than the smallest budgets hold: refused, as said.
          if (out.code === 2 && out.stderr.includes("[BUDGET_TOO_SMALL]")) continue;
          expect(out.code, out.stderr).toBe(0);
          // Every line's count checkable: a fold of references only goes rather than leave a line
          // without a count beside a bare `(hidden)` (field test: the SBOM at 30 columns).
          const kind = k === 0 ? "summary" : "diff";
          expect(checkText(out.stdout, { budget, width, kind, graph: true }), out.stdout).toEqual([]);
          for (const line of out.stdout.split("\n")) {
            // A count of 0 hidden nodes always says the references it hides.
            if (/\(0 hidden|hidden: 0 nodes/.test(line)) {
              expect(line).toMatch(/0 (hidden|nodes), [12] references?/);
              seen++;
            }
          }
        }
      }
    expect(seen).toBeGreaterThan(0);
  });

  it("reads a TSV edge table from standard input by its parent and child columns (streamed)", async () => {
    const tsv = "parent\tchild\tid\nhq\tlab\tx\nhq\tops\tx\nlab\trig\tx\nops\trig\tx\n";
    const out = await cli(["-", "--input-format", "edges", "--format", "json"], { stdin: tsv });
    expect(out.code, out.stderr).toBe(0);
    const doc = JSON.parse(out.stdout);
    expect(doc.totals.nodes).toBe(4);
    expect(doc.root.children.map((c: { name: string }) => c.name)).toEqual(["lab", "ops"]);
    expect(doc.root.children[1].children[0]).toMatchObject({ name: "rig", reference: { path: "lab/rig" } });
  });

  it("reads node records from a second table and counts each package once", async () => {
    const out = await cli([
      EDGES,
      "--input-format",
      "edges",
      "--nodes",
      PACKAGES,
      "--budget",
      "5",
      "--format",
      "json",
    ]);
    expect(out.code, out.stderr).toBe(0);
    const doc = JSON.parse(out.stdout);
    // The records table lists every package once: the graph's node count and total size are its own.
    const rows = readFileSync(PACKAGES, "utf8").trim().split("\n").slice(1);
    expect(doc.totals.nodes).toBe(rows.length);
    expect(doc.totals.size).toBe(rows.reduce((s, r) => s + Number(r.split(",")[2]), 0));
  });

  it("diff reads --nodes once for both versions, or twice (OLD's, then NEW's)", async () => {
    // One table for both: the records are the same, so only edges can change; none did.
    const same = await cli([
      "diff",
      EDGES,
      EDGES,
      "--input-format",
      "edges",
      "--nodes",
      PACKAGES,
      "--format",
      "json",
    ]);
    expect(same.code, same.stderr).toBe(0);
    const rows = readFileSync(PACKAGES, "utf8").trim().split("\n").slice(1);
    const total = rows.reduce((s, r) => s + Number(r.split(",")[2]), 0);
    const doc = JSON.parse(same.stdout);
    expect(doc.totals.old).toMatchObject({ nodes: rows.length, size: total });
    expect(doc.totals.new).toMatchObject({ nodes: rows.length, size: total });
    // Two tables: NEW's records give ledger-core another version and size: one edited node (its size
    // change shown on the same line), the net change the size difference (51,000 - 40,922).
    const newer = readFileSync(PACKAGES, "utf8").replace(
      "@tidewater/ledger-core,0.7.5,40922",
      "@tidewater/ledger-core,0.8.0,51000",
    );
    const files = { "new-packages.csv": newer };
    const args = [
      "diff",
      EDGES,
      EDGES,
      "--input-format",
      "edges",
      "--nodes",
      PACKAGES,
      "--nodes",
      "new-packages.csv",
    ];
    const two = await cli([...args, "--compare-field", "version", "--format", "json", "--fail-on-change"], {
      files,
    });
    expect(two.code, two.stderr).toBe(1);
    const changed = JSON.parse(two.stdout);
    expect(changed.totals.delta).toBe(51000 - 40922);
    expect(changed.changes.edited).toBe(1);
    // Given in the other order, the versions' records swap: the change reverses.
    const back = await cli(
      [
        "diff",
        EDGES,
        EDGES,
        "--input-format",
        "edges",
        "--nodes",
        "new-packages.csv",
        "--nodes",
        PACKAGES,
        "--format",
        "json",
      ],
      { files },
    );
    expect(JSON.parse(back.stdout).totals.delta).toBe(40922 - 51000);
  });

  it("refuses --nodes three times, twice for one input, and in a config file (usage errors)", async () => {
    const three = await cli([
      "diff",
      EDGES,
      EDGES,
      "--input-format",
      "edges",
      "--nodes",
      PACKAGES,
      "--nodes",
      PACKAGES,
      "--nodes",
      PACKAGES,
    ]);
    expect(three.code).toBe(2);
    expect(three.stderr).toContain("[USAGE]");
    const twice = await cli([EDGES, "--input-format", "edges", "--nodes", PACKAGES, "--nodes", PACKAGES]);
    expect(twice.code).toBe(2);
    expect(twice.stderr).toContain("comparing two versions");
    const config = await cli([EDGES, "--input-format", "edges"], {
      files: { ".espalier.yaml": `nodes: ${PACKAGES}\n` },
    });
    expect(config.code).toBe(2);
    expect(config.stderr).toContain("[USAGE]");
  });

  it("never lets --output overwrite a --nodes table", async () => {
    const dir = mkdtempSync(join(tmpdir(), "espalier-nodes-output-"));
    const records = join(dir, "p.csv");
    writeFileSync(records, readFileSync(PACKAGES, "utf8"));
    const r = await cli([EDGES, "--input-format", "edges", "--nodes", records, "--output", records]);
    expect(r.code).toBe(2);
    expect(readFileSync(records, "utf8")).toBe(readFileSync(PACKAGES, "utf8"));
  });

  it("keeps --pseudonymize: no name or id, also in reference paths, reaches the output", async () => {
    const env = { env: { ESPALIER_PSEUDONYM_KEY: "graph-secret" } };
    const args = [
      EDGES,
      "--input-format",
      "edges",
      "--focus",
      "mooring-log",
      "--budget",
      "14",
      "--pseudonymize",
    ];
    for (const format of ["text", "json", "markdown", "svg"]) {
      const out = await cli([...args, "--format", format], env);
      expect(out.code, out.stderr).toBe(0);
      for (const name of ["mooring-log", "ledger-core", "tidewater", "harbor-api", "coral-log"])
        expect(out.stdout).not.toContain(name);
    }
    const json = JSON.parse((await cli([...args, "--format", "json"], env)).stdout);
    const refs: string[] = [];
    const walk = (n: { reference?: { path: string }; children: unknown[] }) => {
      if (n.reference) refs.push(n.reference.path);
      for (const c of n.children) walk(c as typeof n);
    };
    walk(json.root);
    expect(refs.length).toBeGreaterThan(0);
    for (const path of refs) for (const seg of path.split("/")) expect(seg).toMatch(/^anon-[0-9a-f]{12}$/);
    // A printed reference path reads back as a focus with the same secret: it names the full entry.
    const back = await cli(
      [
        EDGES,
        "--input-format",
        "edges",
        "--focus",
        refs[0],
        "--pseudonymize",
        "--format",
        "json",
        "--budget",
        "40",
      ],
      env,
    );
    expect(back.code, back.stderr).toBe(0);
    expect(JSON.parse(back.stdout).foci).toEqual([refs[0]]);
  });
});
