import { readFile } from "node:fs/promises";
import { describe, expect, it } from "vitest";
import { commandOptions, optionGroups } from "../../src/cli/options.js";
import { flagsByKey } from "../../src/cli/parse-command-line.js";
import { SVG_PX_PER_COLUMN } from "../../src/render/icicle-svg.js";
import { LEGEND_LINES, legendLines } from "../../src/render/marks.js";
import { cli } from "../helpers/cli.js";

const ORG = "fixtures/quillfeather-org.csv";
const FILES = "fixtures/tidewater-files.paths";

describe("espalier <input> (summary)", () => {
  it("summarises a path list from standard input within the budget", async () => {
    const stdin = "10\ta/x\n20\ta/y\n5\tb/z\n";
    // Three sizes two folders down say no unit (UNIT_NOT_SAID on standard error): --units bytes says it.
    const r = await cli(["-", "--focus", "a/x", "--budget", "4", "--units", "bytes"], { stdin });
    expect(r.code).toBe(0);
    expect(r.stderr).toBe("");
    expect(r.stdout.trimEnd().split("\n")).toHaveLength(4);
    expect(r.stdout).toContain("* x");
  });

  it("exits 2 with one line naming the code when a focus matches nothing, and prints nothing on stdout", async () => {
    const r = await cli(["-", "--focus", "a/q"], { stdin: "a/x\na/y\n" });
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr.trimEnd().split("\n")).toHaveLength(1);
    expect(r.stderr).toContain("[FOCUS_NO_MATCH]");
  });

  it("exits 2 with BUDGET_TOO_SMALL naming the smallest budget that works", async () => {
    const r = await cli(["-", "--focus", "x/b/c/d", "--budget", "3", "--no-chains"], {
      stdin: "x/b/c/d\ny\n",
    });
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("[BUDGET_TOO_SMALL]");
    expect(r.stderr).toContain("is 6"); // the header, and one line for each of 5 nodes
  });

  it("BUDGET_TOO_SMALL without a focus names the lines before the tree and the root, not focus paths", async () => {
    // Field defect: --legend at 40 columns took the budget, and the error blamed focus paths never given.
    const stdin = "a/x\na/y\nb/z\n";
    const r = await cli(["-", "--budget", "20", "--legend"], { stdin, env: { COLUMNS: "40" } });
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("[BUDGET_TOO_SMALL]");
    expect(r.stderr).not.toContain("focus");
    const legend = legendLines("summary", 40).length;
    expect(r.stderr).toContain(`--legend takes ${legend} of those ${1 + legend} lines at 40 columns`);
    // The budget it names works, and one less does not: at 40 columns the header says `32 of 32 lines`
    // on a second line, which the first fit (one header line, the legend and the root: 31) did not know.
    const smallest = Number(/smallest budget that works is (\d+)/.exec(r.stderr)![1]);
    expect(smallest).toBe(1 + legend + 1 + 1);
    const env = { COLUMNS: "40" };
    expect((await cli(["-", "--budget", String(smallest), "--legend"], { stdin, env })).code).toBe(0);
    expect((await cli(["-", "--budget", String(smallest - 1), "--legend"], { stdin, env })).code).toBe(2);
    const focused = await cli(["-", "--budget", "2", "--focus", "a/x", "--no-chains"], { stdin });
    expect(focused.stderr).toContain("focus paths");
  });

  it("exits 2 for a bad option value, with a usage error and no output", async () => {
    const r = await cli(["-", "--budget", "zero"], { stdin: "a\n" });
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toContain("[USAGE]");
  });

  it("reads foci from a file given with --focus-from", async () => {
    const r = await cli([FILES, "--focus-from", "-", "--budget", "30"], {
      stdin: "services/ledger\n",
    });
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/\* ledger/);
  });

  it("prints the summary JSON with --format json", async () => {
    const r = await cli(["-", "--format", "json", "--budget", "10"], { stdin: "1\ta\n2\tb\n" });
    const doc = JSON.parse(r.stdout);
    expect(doc.totals).toEqual({ nodes: 3, size: 3 });
    expect(doc.root.children.map((c: { name: string }) => c.name)).toEqual(["a", "b"]);
  });

  it("accepts every printed path back as a focus", async () => {
    const first = await cli([FILES, "--format", "json", "--budget", "60"]);
    const doc = JSON.parse(first.stdout);
    const paths: string[] = [];
    const walk = (n: { path: string; children: unknown[] }) => {
      paths.push(n.path);
      for (const c of n.children) walk(c as typeof n);
    };
    walk(doc.root);
    for (const p of paths.slice(1, 20)) {
      const again = await cli([FILES, "--focus", p, "--budget", "60", "--format", "json"]);
      expect(again.code, again.stderr).toBe(0);
      expect(JSON.parse(again.stdout).foci).toEqual([p]);
    }
  });

  it("labels people by record fields and can replace names by keyed pseudonyms", async () => {
    const byTitle = await cli([
      ORG,
      "--parent-field",
      "manager",
      "--label",
      "{title} ({team})",
      "--budget",
      "8",
    ]);
    expect(byTitle.code, byTitle.stderr).toBe(0);
    const anon = await cli(
      [ORG, "--parent-field", "manager", "--pseudonymize", "--budget", "8", "--format", "json"],
      {
        env: { ESPALIER_PSEUDONYM_KEY: "test-secret" },
      },
    );
    expect(anon.code, anon.stderr).toBe(0);
    const doc = JSON.parse(anon.stdout);
    expect(doc.root.name).toMatch(/^anon-[0-9a-f]{12}$/);
    // Row ids point at people as names do: pseudonymised too, in the JSON and in a label's {id}.
    const printed = JSON.stringify(doc);
    expect(doc.root.id).toMatch(/^anon-[0-9a-f]{12}$/);
    for (const id of ["Q0001", "Q0002", "Q1036"]) expect(printed).not.toContain(id);
    const byIdLabel = await cli(
      [
        ORG,
        "--parent-field",
        "manager",
        "--pseudonymize",
        "--label",
        "{id}",
        "--focus",
        "Q0002",
        "--budget",
        "9",
      ],
      { env: { ESPALIER_PSEUDONYM_KEY: "test-secret" } },
    );
    expect(byIdLabel.code, byIdLabel.stderr).toBe(0);
    expect(byIdLabel.stdout).not.toMatch(/Q\d{4}/);
    const focusLine = byIdLabel.stdout.split("\n").find((line) => line.trimStart().startsWith("* "))!;
    const printedId = focusLine.match(/anon-[0-9a-f]{12}/)![0];
    // The printed pseudonymous id reads back as a focus with the same secret.
    const again = await cli(
      [
        ORG,
        "--parent-field",
        "manager",
        "--pseudonymize",
        "--label",
        "{id}",
        "--focus",
        printedId,
        "--budget",
        "9",
      ],
      { env: { ESPALIER_PSEUDONYM_KEY: "test-secret" } },
    );
    expect(again.code, again.stderr).toBe(0);
    expect(again.stdout).toBe(byIdLabel.stdout);
    const noKey = await cli([ORG, "--parent-field", "manager", "--pseudonymize"]);
    expect(noKey.code).toBe(2);
  });

  it("colours only when asked or on a terminal, and never with NO_COLOR", async () => {
    const stdin = "a/x\n";
    expect((await cli(["-"], { stdin })).stdout).not.toContain("\u001b[");
    expect((await cli(["-", "--color", "always"], { stdin })).stdout).toContain("\u001b[");
    expect((await cli(["-"], { stdin, tty: { rows: 30 } })).stdout).toContain("\u001b[");
    expect((await cli(["-"], { stdin, tty: { rows: 30 }, env: { NO_COLOR: "1" } })).stdout).not.toContain(
      "\u001b[",
    );
  });

  it("colours a pipe under FORCE_COLOR (as CI runners set it), not under FORCE_COLOR=0, and never with NO_COLOR too", async () => {
    // FORCE_COLOR: common practice, no source (CI runners set it so a log shows colours).
    const stdin = "a/x\n";
    const sgr = "\u001b[";
    expect((await cli(["-"], { stdin, env: { FORCE_COLOR: "1" } })).stdout).toContain(sgr);
    expect((await cli(["-"], { stdin, env: { FORCE_COLOR: "1", TERM: "dumb" } })).stdout).toContain(sgr);
    expect((await cli(["-"], { stdin, env: { FORCE_COLOR: "0" } })).stdout).not.toContain(sgr);
    expect(
      (await cli(["-"], { stdin, tty: { rows: 30 }, env: { FORCE_COLOR: "false" } })).stdout,
    ).not.toContain(sgr);
    expect((await cli(["-"], { stdin, env: { FORCE_COLOR: "1", NO_COLOR: "1" } })).stdout).not.toContain(sgr);
    expect((await cli(["-", "--color", "never"], { stdin, env: { FORCE_COLOR: "1" } })).stdout).not.toContain(
      sgr,
    );
  });

  it("defaults the budget to the terminal height less one, else 40", async () => {
    const stdin = Array.from({ length: 100 }, (_, i) => `d/f${i}`).join("\n");
    expect((await cli(["-"], { stdin })).stdout.trimEnd().split("\n")).toHaveLength(40);
    expect(
      (await cli(["-", "--color", "never"], { stdin, tty: { rows: 12 } })).stdout.trimEnd().split("\n"),
    ).toHaveLength(11);
  });

  it("says on the header when the budget is the default for output that is no terminal (a CI log)", async () => {
    const stdin = Array.from({ length: 100 }, (_, i) => `d/f${i}`).join("\n");
    const why = "40 of 40 lines (default budget: not a terminal)";
    expect((await cli(["-"], { stdin })).stdout.split("\n")[0]).toMatch(
      /; 40 of 40 lines \(default budget: not a terminal\)$/,
    );
    expect((await cli(["-", "--format", "markdown"], { stdin })).stdout.split("\n")[0]).toContain(why);
    expect((await cli(["-", "--budget", "40"], { stdin })).stdout.split("\n")[0]).toMatch(
      /; 40 of 40 lines$/,
    );
    const terminal = await cli(["-", "--color", "never"], { stdin, tty: { rows: 12 } });
    expect(terminal.stdout.split("\n")[0]).toMatch(/; 11 of 11 lines$/);
  });

  it.each([["--help"], ["diff", "-h"], ["explore", "--help"]])(
    "prints help (%s): every option the command takes, in docs/cli.md's groups, and nothing on stderr",
    async (...argv) => {
      const r = await cli(argv);
      expect(r).toMatchObject({ code: 0, stderr: "" });
      // The groups are docs/cli.md's sections, in its order (src/cli/options.ts optionGroups).
      const headings = r.stdout.split("\n").filter((line) => /^[A-Z][a-z ]+: /.test(line));
      const groups = headings.map((h) => h.slice(0, h.indexOf(":")));
      expect(groups).toEqual(optionGroups.filter((g) => groups.includes(g)));
      const command = argv[0] === "diff" || argv[0] === "explore" ? argv[0] : "summary";
      for (const key of Object.keys(commandOptions[command]))
        expect(r.stdout).toContain(`  ${flagsByKey.get(key)!.long}`);
      // The examples run in tests/cli/help-examples.test.ts.
    },
  );

  it("prints the version of package.json", async () => {
    const { version } = JSON.parse(await readFile(new URL("../../package.json", import.meta.url), "utf8"));
    const r = await cli(["--version"]);
    expect(r).toEqual({ code: 0, stdout: `espalier ${version}\n`, stderr: "" });
  });
});

describe("espalier <input> --format markdown|svg", () => {
  it("prints a Markdown list and an SVG picture of the same selection", async () => {
    const stdin = "10\ta/x\n20\ta/y\n5\tb/z\n";
    const md = await cli(["-", "--format", "markdown", "--budget", "4", "--bare"], { stdin });
    expect(md.code).toBe(0);
    expect(md.stdout.trimEnd().split("\n")).toHaveLength(4);
    expect(md.stdout.startsWith("- ")).toBe(true);
    const svg = await cli(["-", "--format", "svg", "--budget", "4"], { stdin });
    expect(svg.code).toBe(0);
    expect(svg.stdout.startsWith("<svg")).toBe(true);
    expect(svg.stdout.trimEnd().endsWith("</svg>")).toBe(true);
  });
});

describe("espalier <input> --legend, --help and --width", () => {
  const stdin = "10\ta/x\n20\ta/y\n5\tb/z\n";

  it("prints the legend under the header, counted by the budget, and the same lines in --help", async () => {
    const r = await cli(["-", "--legend", "--budget", "5"], { stdin });
    expect(r.code).toBe(0);
    const lines = r.stdout.trimEnd().split("\n");
    expect(lines.length).toBeLessThanOrEqual(5);
    expect(lines.slice(1, 1 + LEGEND_LINES.summary)).toEqual(legendLines("summary"));
    const diff = await cli(["diff", "--help"]);
    const summary = await cli(["--help"]);
    // --help wraps lines at its width: compare words.
    const words = (t: string) => t.split(/\s+/).join(" ");
    for (const line of legendLines("summary")) expect(words(summary.stdout)).toContain(words(line));
    for (const line of legendLines("diff")) expect(words(diff.stdout)).toContain(words(line));
  });

  it("wraps the legend to --width, whole, and the budget counts its wrapped lines", async () => {
    const files = Array.from({ length: 40 }, (_, k) => `${k + 1}\tdir${k % 7}/sub${k % 3}/f${k}.txt`).join(
      "\n",
    );
    for (const width of [48, 80, 120]) {
      const r = await cli(["-", "--legend", "--budget", "30", "--width", String(width)], { stdin: files });
      expect(r.code).toBe(0);
      const lines = r.stdout.trimEnd().split("\n");
      expect(lines.length).toBe(30);
      const legend = legendLines("summary", width);
      // The header wraps to the width too (its clauses), and the legend follows it.
      const at = lines.findIndex((line) => line.startsWith("marks: "));
      expect(at).toBeGreaterThanOrEqual(1);
      expect(lines.slice(at, at + legend.length)).toEqual(legend);
      expect(legend.length).toBeGreaterThan(LEGEND_LINES.summary);
      for (const line of lines) expect(line.length).toBeLessThanOrEqual(width);
    }
  });

  it("draws the SVG --width columns wide, SVG_PX_PER_COLUMN pixels each", async () => {
    for (const width of [40, 150]) {
      const r = await cli(["-", "--format", "svg", "--width", String(width)], { stdin });
      expect(r.code).toBe(0);
      expect(r.stdout).toContain(
        `<svg xmlns="http://www.w3.org/2000/svg" width="${width * SVG_PX_PER_COLUMN}" `,
      );
    }
  });
});
