import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field test: `npm ls --all --json` shape (invented tidewater packages). Its "dependencies" is an object
// of package records by name, each with its own "dependencies": the value of a children field, not a
// node. `--start-at /dependencies --children-field dependencies` said "no node has the children field
// "dependencies"", which every package below has: the message was untrue and named no way out.
const listing = {
  name: "tidewater",
  version: "1.0.0",
  dependencies: {
    "tide-core": { version: "1.2.0", dependencies: { salt: { version: "2.0.0" } } },
    "harbor-ui": {
      version: "3.0.0",
      dependencies: { brine: { version: "1.1.0" }, salt: { version: "2.0.0" } },
    },
  },
};
const text = JSON.stringify(listing, null, 2);

/** Nodes as JSON.parse reads the listing: the root and every package under "dependencies". */
const packages = (node: { dependencies?: Record<string, object> }): number =>
  1 + Object.values(node.dependencies ?? {}).reduce<number>((sum, child) => sum + packages(child), 0);

describe("--start-at to a children field's map of nodes by name", () => {
  it("is FIELD_MISSING saying the objects under it hold the field, at the first one's line, and how to read it", async () => {
    const result = await cli(["-", "--start-at", "/dependencies", "--children-field", "dependencies"], {
      stdin: text,
    });
    expect(result.stdout).toBe("");
    expect(result.code).toBe(2);
    // "tide-core" is the first package; JSON.stringify with 2 spaces puts its "dependencies" on line 7.
    expect(result.stderr).toMatch(
      /^espalier: <stdin>:7: the top-level object has no children field "dependencies", but the objects under it do \(that of "tide-core" on line 7\): .*leave out --start-at .*\[FIELD_MISSING\]\n$/,
    );
    // Following it: the whole listing, read with children under dependencies, one node per package.
    const whole = await cli(["-", "--children-field", "dependencies", "--format", "json"], { stdin: text });
    expect(whole.code).toBe(0);
    expect(JSON.parse(whole.stdout).totals.nodes).toBe(packages(listing));
  });

  it("names the pointer one level up when the map sits deeper, and names no package under --pseudonymize", async () => {
    const wrapped = JSON.stringify({ report: listing });
    const result = await cli(
      ["-", "--start-at", "/report/dependencies", "--children-field", "dependencies"],
      {
        stdin: wrapped,
      },
    );
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/--start-at "\/report", or read every value .*\[FIELD_MISSING\]\n$/);
    const up = await cli(
      ["-", "--start-at", "/report", "--children-field", "dependencies", "--format", "json"],
      {
        stdin: wrapped,
      },
    );
    expect(JSON.parse(up.stdout).totals.nodes).toBe(packages(listing));
    const hidden = await cli(
      ["-", "--start-at", "/dependencies", "--children-field", "dependencies", "--pseudonymize"],
      { stdin: text, env: { ESPALIER_PSEUDONYM_KEY: "k" } },
    );
    expect(hidden.code).toBe(2);
    expect(hidden.stderr).not.toMatch(/tide-core/);
  });

  it("a top-level object that is one node with fields holding objects still gets the lone-root message", async () => {
    const config = JSON.stringify({ name: "quay", build: { steps: [1, 2] }, deploy: { region: "north" } });
    const result = await cli(["-", "--read-as", "nodes"], { stdin: config });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(
      /no node has the children field "children", so the input would be one node/,
    );
  });
});
