import { execFileSync } from "node:child_process";
import { mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { afterAll, describe, expect, it } from "vitest";

const repo = resolve(import.meta.dirname, "../..");
const work = mkdtempSync(join(tmpdir(), "espalier-pack-"));
afterAll(() => rmSync(work, { recursive: true, force: true }));

describe("npm pack && npm install -g (the installable package)", () => {
  const prefix = join(work, "prefix");
  let tarball = "";

  it("packs only what is needed", () => {
    const out = execFileSync("npm", ["pack", "--json", "--pack-destination", work], {
      cwd: repo,
      encoding: "utf8",
    });
    const [info] = JSON.parse(out.slice(out.indexOf("[")));
    tarball = join(work, info.filename);
    const files: string[] = info.files.map((f: { path: string }) => f.path);
    expect(files).toContain("bin/espalier.js");
    expect(files).toContain("dist/index.js");
    expect(files).toContain("dist/index.d.ts");
    expect(files).toContain("README.md");
    expect(
      files.some((f) => f.startsWith("src/") || f.startsWith("tests/") || f.startsWith("fixtures/")),
    ).toBe(false);
    expect(files.some((f) => f.includes("node_modules"))).toBe(false);
  }, 120_000);

  it("installs into a clean prefix, after which espalier --help and a summary work", () => {
    execFileSync("npm", ["install", "-g", "--prefix", prefix, "--no-audit", "--no-fund", tarball], {
      cwd: work,
      encoding: "utf8",
    });
    const bin = join(prefix, "bin", "espalier");
    const help = execFileSync(bin, ["--help"], { encoding: "utf8" });
    expect(help).toMatch(/^On the demo data /m); // the help screen's own heading (src/cli/help.ts)
    // The header line counts against the budget: 1 header + root + a + x.
    const summary = execFileSync(bin, ["-", "--focus", "a/x", "--budget", "4"], {
      input: "1\ta/x\n2\ta/y\n3\tb\n",
      encoding: "utf8",
    });
    const lines = summary.trimEnd().split("\n");
    expect(lines).toHaveLength(4);
    // A budget under 6 lines has no line for the key: without a width it rides on the header's line.
    expect(lines[0]).toMatch(/^summary: 5 nodes, size 6 B; focus a\/x; 4 of 4 lines; key: '\*' a focus, /);
    expect(lines[3]).toBe("    * x  1 B");
  }, 180_000);

  it("serves the typed library API through import from 'espalier'", () => {
    const libRoot = join(prefix, "lib", "node_modules", "espalier");
    expect(readdirSync(join(libRoot, "dist"))).toContain("index.d.ts");
    const script = join(work, "use-api.mjs");
    writeFileSync(
      script,
      `import { defaultLoadOptions, loadTree, prepare, summarize, renderText } from ${JSON.stringify(join(libRoot, "dist", "index.js"))};
const tree = loadTree("10\\ta/x\\n20\\ta/y\\n5\\tb/z\\n", { ...defaultLoadOptions, format: "paths" });
const loaded = prepare(tree);
for (const focus of ["a/x", "b/z"]) {
  const r = summarize(loaded, { foci: [focus], budget: 4, importance: "depth" });
  process.stdout.write(renderText(r.view, { units: "bytes", sizes: tree.hasSizes }));
}
`,
    );
    const out = execFileSync(process.execPath, [script], { encoding: "utf8" });
    expect(out).toContain("* x");
    expect(out).toContain("* z");
    // Resolution by package name, as a dependent project would import it.
    const byName = execFileSync(
      process.execPath,
      ["--input-type=module", "-e", "import('espalier').then((m) => console.log(typeof m.summarize))"],
      {
        cwd: libRoot,
        encoding: "utf8",
      },
    );
    expect(byName.trim()).toBe("function");
  }, 60_000);
});
