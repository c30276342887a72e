import { readdirSync, readFileSync, writeFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Every example output in README.md and docs/ is the tool's own output on the invented demo data in
// fixtures/: a block marked `<!-- example: ARGS -->` holds exactly what `espalier ARGS` prints.
// `npm run examples` rewrites the blocks from the current code (UPDATE_EXAMPLES=1).
// Every page that ships: a marked block in a page left off a hand-kept list would never be checked.
const FILES = [
  "README.md",
  ...readdirSync("docs")
    .filter((name) => name.endsWith(".md"))
    .sort()
    .map((name) => `docs/${name}`),
];
const MARKER = /^<!-- example: (.+) -->$/;

/** Splits a command line as a POSIX shell would for the simple cases the docs use: words, '…' quotes. */
function words(line: string): string[] {
  const out: string[] = [];
  for (const m of line.matchAll(/'([^']*)'|(\S+)/g)) out.push(m[1] ?? m[2]);
  return out;
}

interface Example {
  file: string;
  args: string;
  /** Line index of the opening fence; the block's text lies between it and `end`. */
  start: number;
  end: number;
}

function examples(file: string, lines: string[]): Example[] {
  const found: Example[] = [];
  for (let k = 0; k < lines.length; k++) {
    const m = MARKER.exec(lines[k]);
    if (!m) continue;
    expect(lines[k + 1], `${file}:${k + 2} opens the example's block`).toMatch(/^```/);
    let end = k + 2;
    while (end < lines.length && lines[end] !== "```") end++;
    found.push({ file, args: m[1], start: k + 1, end });
  }
  return found;
}

describe("the examples in README.md and docs/", () => {
  const all = FILES.flatMap((file) => examples(file, readFileSync(file, "utf8").split("\n")));

  it("are there: at least the README's, each diff example's and the printed SQL's", () => {
    expect(all.filter((e) => e.file === "README.md").length).toBeGreaterThanOrEqual(1);
    expect(all.filter((e) => e.file === "docs/diff.md").length).toBeGreaterThanOrEqual(3);
    expect(all.filter((e) => e.file === "docs/scale.md").length).toBeGreaterThanOrEqual(1);
  });

  it("include a marked block wherever a page shows what an `espalier` command prints", () => {
    // A fenced block right after a block that holds one espalier command line (not piped, not
    // redirected, on the demo data or none) is that command's output: it must be marked, or it drifts.
    let checked = 0;
    for (const file of FILES) {
      const lines = readFileSync(file, "utf8").split("\n");
      for (let k = 0; k < lines.length; k++) {
        if (!/^```/.test(lines[k])) continue;
        let close = k + 1;
        while (close < lines.length && lines[close] !== "```") close++;
        const opening = k;
        k = close;
        if (!/^```(sh)?$/.test(lines[opening])) continue;
        // The block's one command, its `\` continuations joined.
        const text = lines
          .slice(opening + 1, close)
          .join("\n")
          .replace(/\\\n\s*/g, "");
        const command = /^(?:node bin\/espalier\.js|espalier) (?!explore )([^\n]*)$/.exec(text);
        if (!command || /[|>]/.test(command[1])) continue;
        const files = command[1].split(/\s+/).filter((w) => /\.[a-z]+$/.test(w) && !w.startsWith("-"));
        if (!files.every((f) => f.startsWith("fixtures/"))) continue;
        let next = close + 1;
        while (next < lines.length && (lines[next] === "" || MARKER.test(lines[next]))) next++;
        if (!/^```/.test(lines[next] ?? "")) continue;
        checked++;
        expect(lines[next - 1], `${file}:${next + 1}: the output of \`${text}\``).toMatch(MARKER);
      }
    }
    expect(checked, "the README's three and docs/scale.md's").toBeGreaterThanOrEqual(4);
  });

  it("in docs/cli.md's example column run on the demo data: exit 0, nothing on standard error", async () => {
    // Examples on files the reader brings (response.json, teams.csv) or that write one (-o) are left
    // to the reader; every other one is run as written.
    const cells = [...readFileSync("docs/cli.md", "utf8").matchAll(/\| `espalier ([^`|]*)` \|$/gm)].map(
      (m) => m[1],
    );
    let ran = 0;
    for (const line of cells) {
      const args = words(line);
      const files = args.filter((w) => /\.[a-z]+$/.test(w) && !w.startsWith("-"));
      if (args.includes("-o") || !files.every((f) => f.startsWith("fixtures/"))) continue;
      const r = await cli(args);
      expect(r.stderr, `espalier ${line}`).toBe("");
      expect(r.code, `espalier ${line}`).toBe(0);
      ran++;
    }
    expect(ran, "the examples on the demo data").toBeGreaterThanOrEqual(15);
  });

  for (const file of FILES) {
    it(`in ${file} are what espalier prints for them`, async () => {
      const lines = readFileSync(file, "utf8").split("\n");
      const found = examples(file, lines);
      // Rewrite from the bottom, so that earlier blocks keep their line numbers.
      for (const example of [...found].reverse()) {
        const r = await cli(words(example.args));
        expect(r.stderr, example.args).toBe("");
        const printed = r.stdout.replace(/\n$/, "").split("\n");
        if (process.env.UPDATE_EXAMPLES === "1")
          lines.splice(example.start + 1, example.end - example.start - 1, ...printed);
        else
          expect(
            lines.slice(example.start + 1, example.end).join("\n"),
            `${file}: espalier ${example.args}`,
          ).toBe(printed.join("\n"));
      }
      if (process.env.UPDATE_EXAMPLES === "1") writeFileSync(file, lines.join("\n"));
    });
  }
});
