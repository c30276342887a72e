import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: `npm ls --all --json` (npm 11.19.1, run on this machine in a checkout without its
// node_modules) lists each dependency it did not find as a node object `{"required": "...",
// "missing": true, "problems": ["missing: ..."]}` beside the installed ones. espalier counted them as
// plain nodes with nothing said ("yaml 22 nodes" where 21 of them were not installed). Packages
// below are invented; the shape is the one observed.
const listing = `{
  "version": "0.4.0",
  "name": "tidewater",
  "problems": ["missing: kelp-log@3.0.1, required by tidewater@0.4.0"],
  "dependencies": {
    "coral-args": {
      "version": "1.2.0",
      "dependencies": {
        "brine": { "required": "0.4.2", "missing": true, "problems": ["missing: brine@0.4.2, required by coral-args@1.2.0"] }
      }
    },
    "kelp-log": { "required": "3.0.1", "missing": true, "problems": ["missing: kelp-log@3.0.1, required by tidewater@0.4.0"] },
    "salt-fmt": { "version": "2.0.0", "missing": false }
  }
}
`;

/** Node objects with "missing": true, by JSON.parse's reading (ECMA-262): the reference count. */
const missingIn = (node: { missing?: unknown; dependencies?: Record<string, object> }): number =>
  (node.missing === true ? 1 : 0) +
  Object.values(node.dependencies ?? {}).reduce<number>((sum, child) => sum + missingIn(child), 0);

describe("node objects that say they are missing (npm ls --all --json)", () => {
  it("are counted as nodes, and a MISSING_ENTRIES note says how many and where the first is", async () => {
    const result = await cli(["-", "--format", "json"], { stdin: listing });
    expect(result.code).toBe(0);
    const summary = JSON.parse(result.stdout);
    // tidewater, coral-args, brine, kelp-log, salt-fmt.
    expect(summary.totals.nodes).toBe(5);
    expect(missingIn(JSON.parse(listing))).toBe(2);
    expect(summary.input.notes).toEqual([
      expect.objectContaining({
        code: "MISSING_ENTRIES",
        line: 9,
        message: expect.stringMatching(/^2 node objects hold "missing": true, .*coral-args\/brine"/),
      }),
    ]);
    expect(result.stderr).toMatch(
      /^espalier: note: <stdin>:9: 2 node objects hold "missing": true, .*\[MISSING_ENTRIES\]\n$/,
    );
    // Text: the note on standard error, and the label it names marks them on their lines.
    const marked = await cli(["-", "--label", "{name} {missing}"], { stdin: listing });
    expect(marked.stdout).toMatch(/kelp-log true/);
    expect(marked.stderr).toContain("[MISSING_ENTRIES]");
  });

  it("says nothing when no node object holds missing: true", async () => {
    const none = listing.replaceAll('"missing": true', '"missing": false');
    const result = await cli(["-", "--format", "json"], { stdin: none });
    expect(result.stderr).toBe("");
    expect(JSON.parse(result.stdout).input.notes).toBeUndefined();
  });

  it("names no package under --pseudonymize", async () => {
    const pseudonymized = await cli(["-", "--pseudonymize"], {
      stdin: listing,
      env: { ESPALIER_PSEUDONYM_KEY: "k" },
    });
    expect(pseudonymized.code).toBe(0);
    expect(pseudonymized.stderr).toContain("[MISSING_ENTRIES]");
    expect(pseudonymized.stderr).not.toMatch(/brine|coral/);
  });

  it("says it for a YAML listing of the same shape", async () => {
    const yaml = [
      "name: tidewater",
      "dependencies:",
      "  kelp-log:",
      "    required: 3.0.1",
      "    missing: true",
      "  salt-fmt:",
      "    version: 2.0.0",
      "",
    ].join("\n");
    const result = await cli(["-", "--input-format", "yaml", "--format", "json"], { stdin: yaml });
    expect(result.code).toBe(0);
    expect(JSON.parse(result.stdout).input.notes).toEqual([
      expect.objectContaining({
        code: "MISSING_ENTRIES",
        message: expect.stringMatching(/^1 node object holds/),
      }),
    ]);
  });
});
