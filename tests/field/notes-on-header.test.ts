import { describe, expect, it } from "vitest";
import { diffSchema } from "../../src/render/diff-schema.js";
import { displayWidth } from "../../src/render/display-width.js";
import { cli } from "../helpers/cli.js";

// Field tests: a CI job that keeps only standard output (a log of stdout, a pull-request comment made
// from it) lost every reading note, which espalier printed on standard error alone: `summary: 5 nodes`
// over a listing two of whose entries npm says are not installed, with nothing on the screen to say so.
// The listing's shape is `npm ls --all --json`'s (npm 11.19.1, observed on this machine in a checkout
// without its node_modules); the packages are invented.
const listing = `{
  "version": "0.4.0",
  "name": "tidewater",
  "dependencies": {
    "coral-args": {
      "version": "1.2.0",
      "dependencies": {
        "brine": { "required": "0.4.2", "missing": true }
      }
    },
    "kelp-log": { "required": "3.0.1", "missing": true },
    "salt-fmt": { "version": "2.0.0" }
  }
}
`;
const installed = listing.replace(/"missing": true/g, '"version": "1.0.0"');

/** Node objects with "missing": true, by JSON.parse's reading (ECMA-262): the count the header must say. */
const missingIn = (node: { missing?: unknown; dependencies?: Record<string, object> }): number =>
  (node.missing === true ? 1 : 0) +
  Object.values(node.dependencies ?? {}).reduce<number>((sum, child) => sum + missingIn(child), 0);

describe("the header line says each reading note in a few words", () => {
  it("counts the entries marked missing on the first line of standard output", async () => {
    const result = await cli(["-", "--budget", "10"], { stdin: listing });
    expect(result.code).toBe(0);
    const count = missingIn(JSON.parse(listing));
    expect(count).toBe(2);
    expect(result.stdout.split("\n")[0]).toBe(
      `summary: 5 nodes; ${count} missing counted as nodes; children under dependencies; no focus; 6 of 10 lines`,
    );
    // The whole note is still on standard error.
    expect(result.stderr).toContain("[MISSING_ENTRIES]");
  });

  it("says nothing more when no entry is marked missing", async () => {
    const result = await cli(["-", "--budget", "10"], { stdin: installed });
    expect(result.stdout.split("\n")[0]).toBe(
      "summary: 5 nodes; children under dependencies; no focus; 6 of 10 lines",
    );
  });

  it("under --bare, leaves standard output the tree's lines and says the note on standard error", async () => {
    const result = await cli(["-", "--budget", "10", "--bare"], { stdin: listing });
    expect(result.code).toBe(0);
    expect(result.stdout).not.toContain("missing");
    expect(result.stdout.split("\n")[0]).toMatch(/^\. tidewater {2}5 nodes/);
    expect(result.stderr).toMatch(/^espalier: note: <stdin>:\d+: .*\[MISSING_ENTRIES\]\n$/);
    const json = await cli(["-", "--bare", "--format", "json"], { stdin: listing });
    expect(JSON.parse(json.stdout).input.notes).toEqual([
      expect.objectContaining({ code: "MISSING_ENTRIES" }),
    ]);
  });

  it("wraps the clause with the others within a narrow width, and the budget counts the lines", async () => {
    for (const width of [40, 50, 60]) {
      const result = await cli(["-", "--budget", "9", "--width", String(width)], { stdin: listing });
      expect(result.code).toBe(0);
      const lines = result.stdout.replace(/\n$/, "").split("\n");
      expect(lines.length).toBeLessThanOrEqual(9);
      for (const line of lines) expect(displayWidth(line)).toBeLessThanOrEqual(width);
      expect(lines.join(" ")).toMatch(/2 missing counted as nodes;/);
    }
  });

  it("is in Markdown's header too, and names no package under --pseudonymize", async () => {
    const markdown = await cli(["-", "--format", "markdown"], { stdin: listing });
    expect(markdown.stdout.split("\n")[0]).toContain("2 missing counted as nodes");
    const hidden = await cli(["-", "--pseudonymize"], {
      stdin: listing,
      env: { ESPALIER_PSEUDONYM_KEY: "k" },
    });
    expect(hidden.stdout.split("\n")[0]).toContain("; 2 missing counted as nodes;");
    expect(hidden.stdout + hidden.stderr).not.toMatch(/brine|kelp|coral/);
  });

  it("counts both versions in a diff, and the diff JSON lists the notes with their version", async () => {
    const files = { "old.json": installed, "new.json": listing };
    const text = await cli(["diff", "old.json", "new.json", "--budget", "10"], { files });
    expect(text.code).toBe(0);
    expect(text.stdout.split("\n")[0]).toMatch(/; 0 -> 2 missing counted as nodes; /);
    const json = await cli(["diff", "old.json", "new.json", "--format", "json"], { files });
    const doc = diffSchema.parse(JSON.parse(json.stdout));
    expect(doc.notes).toEqual([
      expect.objectContaining({ version: "NEW", code: "MISSING_ENTRIES", line: 8 }),
    ]);
    // Without notes the field is absent, as unmatchedFoci is.
    const same = await cli(["diff", "old.json", "old.json", "--format", "json"], { files });
    expect(JSON.parse(same.stdout).notes).toBeUndefined();
  });

  it("names the version of a note that is no count (OLD's sizes left out)", async () => {
    const files = { "old.tsv": "3\tharbor/a\n5\tharbor/b\n", "new.txt": "harbor/a\nharbor/b\nharbor/c\n" };
    const result = await cli(["diff", "old.tsv", "new.txt", "--budget", "10"], { files });
    expect(result.code).toBe(0);
    expect(result.stderr).toContain("[SIZES_LEFT_OUT]");
    expect(result.stdout.split("\n")[0]).toMatch(/; OLD: sizes left out; /);
  });

  it("says once, without a version's name, a note both versions say alike (a CycloneDX SBOM's two versions)", async () => {
    // A CycloneDX 1.5 SBOM (ECMA-424: bomFormat, specVersion, metadata.component, components, and
    // dependencies with ref and dependsOn) of an invented harbour's app; NEW bumps one component.
    const sbom = (ledger: string) =>
      JSON.stringify({
        bomFormat: "CycloneDX",
        specVersion: "1.5",
        metadata: { component: { "bom-ref": "app", name: "tidewater-app", version: "4.2.0" } },
        components: [
          { "bom-ref": "ledger", name: "ledger-core", version: ledger },
          { "bom-ref": "tern", name: "tern-fmt", version: "2.1.0" },
        ],
        dependencies: [
          { ref: "app", dependsOn: ["ledger"] },
          { ref: "ledger", dependsOn: ["tern"] },
        ],
      });
    const files = { "old.json": sbom("1.0.4"), "new.json": sbom("1.0.5") };
    const r = await cli(["diff", "old.json", "new.json", "--budget", "12"], { files });
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr.match(/\[SBOM_DEPENDENCIES\]/g)).toHaveLength(2);
    const head = r.stdout.split("\n")[0];
    // Before: `OLD: read as an SBOM's dependency graph; NEW: read as an SBOM's dependency graph`.
    expect(head).toContain("; read as an SBOM's dependency graph; ");
    expect(head).not.toMatch(/(OLD|NEW): read as an SBOM/);
    // The JSON keeps each version's note.
    const json = await cli(["diff", "old.json", "new.json", "--format", "json"], { files });
    expect(JSON.parse(json.stdout).notes.map((n: { version: string }) => n.version)).toEqual(["OLD", "NEW"]);
  });

  it("gives in the JSON each note's count and line, the numbers the header says", async () => {
    // A script reads `input.notes` (a diff's `notes`): before, a note's count was on the header only.
    const repeated = '{"name": "r", "children": {"a": {"size": 1}, "a": {"size": 2}, "b": {}, "b": {}}}';
    const yaml = "base: &b {cpu: 1}\nweb: *b\nweb2: *b\n";
    for (const [stdin, format, code] of [
      [listing, "json", "MISSING_ENTRIES"],
      [repeated, "json", "REPEATED_KEY"],
      [yaml, "yaml", "ALIASES_AS_TEXT"],
    ] as const) {
      const text = await cli(["-", "--input-format", format], { stdin });
      const said = Number(/; (\d+) (missing|repeated key|YAML alias)/.exec(text.stdout.split("\n")[0])?.[1]);
      const lineSaid = Number(/^espalier: note: <stdin>:(\d+):/.exec(text.stderr)?.[1]);
      const json = await cli(["-", "--input-format", format, "--format", "json"], { stdin });
      const [note] = JSON.parse(json.stdout).input.notes;
      expect(note).toMatchObject({ code, count: said, line: lineSaid });
      expect(said).toBeGreaterThan(0);
    }
    const files = { "old.json": installed, "new.json": listing };
    const diff = await cli(["diff", "old.json", "new.json", "--format", "json"], { files });
    expect(diffSchema.parse(JSON.parse(diff.stdout)).notes).toEqual([
      expect.objectContaining({
        version: "NEW",
        code: "MISSING_ENTRIES",
        count: missingIn(JSON.parse(listing)),
      }),
    ]);
  });

  it("counts repeated keys and YAML aliases read as text", async () => {
    // RFC 8259 section 4: names SHOULD be unique; JSON.parse keeps the last (ECMA-262 JSON.parse).
    const repeated = '{"name": "r", "children": {"a": {"size": 1}, "a": {"size": 2}, "b": {}, "b": {}}}';
    const keys = await cli(["-", "--input-format", "json"], { stdin: repeated });
    expect(keys.stderr).toContain("[REPEATED_KEY]");
    expect(keys.stdout.split("\n")[0]).toMatch(/; 2 repeated keys, the last read; /);
    // YAML 1.2.2 section 3.2.2.2: an alias stands for the node its anchor names.
    const yaml = "base: &b {cpu: 1}\nweb: *b\n";
    const aliases = await cli(["-", "--input-format", "yaml"], { stdin: yaml });
    expect(aliases.stderr).toContain("[ALIASES_AS_TEXT]");
    expect(aliases.stdout.split("\n")[0]).toMatch(/; 1 YAML alias read as text; /);
  });
});
