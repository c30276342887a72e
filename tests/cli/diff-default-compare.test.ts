import { describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

const head = (stdout: string) => stdout.split("\n")[0];

// Shaped as `npm ls --all --json` prints a dependency tree (name and version at the top, packages
// keyed by name under `dependencies`, each with `version`, `resolved` and `overridden`; common
// practice, no source). Packages are of the invented tidewater monorepo.
function listing(kelpVersion: string): string {
  return JSON.stringify({
    name: "tidewater",
    version: "1.4.0",
    dependencies: {
      "kelp-log": {
        version: kelpVersion,
        resolved: "https://registry.example/kelp-log.tgz",
        overridden: false,
        dependencies: { "brine-util": { version: "0.3.1", overridden: false } },
      },
      "tide-clock": { version: "2.0.0", overridden: false },
    },
  });
}

// Shaped as a lock file: records keyed by install path under `packages`, `""` the project itself.
function lock(kelpVersion: string): string {
  return JSON.stringify({
    name: "tidewater",
    lockfileVersion: 3,
    packages: {
      "": { name: "tidewater", version: "1.4.0" },
      "node_modules/kelp-log": { version: kelpVersion },
      "node_modules/tide-clock": { version: "2.0.0" },
    },
  });
}

describe("espalier diff compares `version` by default, where both versions' records have it", () => {
  it("sees a version bump in a dependency listing: an edit, and exit 1 with --fail-on-change", async () => {
    const files = { "old.json": listing("3.1.0"), "new.json": listing("3.2.0") };
    const r = await cli(["diff", "old.json", "new.json", "--fail-on-change"], { files });
    expect(r.code).toBe(1);
    expect(head(r.stdout)).toContain(
      "0 added, 0 removed, 0 moved, 0 renamed, 1 edited (compared: version), 0 resized",
    );
    expect(r.stdout).toContain("[edited version 3.1.0 -> 3.2.0] kelp-log");
    const same = await cli(["diff", "old.json", "old.json", "--fail-on-change"], { files });
    expect(same.code).toBe(0);
  });

  it("sees it in a lock file keyed by path, and in a table with a version column", async () => {
    const lockFiles = { "old.json": lock("3.1.0"), "new.json": lock("3.1.1") };
    const l = await cli(["diff", "old.json", "new.json", "--fail-on-change"], { files: lockFiles });
    expect(l.code).toBe(1);
    expect(l.stdout).toContain("[edited version 3.1.0 -> 3.1.1] kelp-log");
    const table = (v: string) => `id,parent,version\ntidewater,,1.4.0\nkelp-log,tidewater,${v}\n`;
    const csv = { "old.csv": table("3.1.0"), "new.csv": table("4.0.0") };
    const t = await cli(["diff", "old.csv", "new.csv", "--fail-on-change"], { files: csv });
    expect(t.code).toBe(1);
    expect(head(t.stdout)).toContain("1 edited");
  });

  it("compares the records' other fields when they have no version, and fails on a changed one", async () => {
    const table = "id,parent,team\nq1,,ops\nq2,q1,ledger\n";
    const r = await cli(["diff", "old.csv", "new.csv", "--fail-on-change"], {
      files: { "old.csv": table, "new.csv": table },
    });
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    // The header says which fields were compared, so a reader knows a changed team would be seen.
    expect(head(r.stdout)).toContain("0 edited (compared: team)");
    // A changed team moves no node and changes no size: the compared field alone makes it a change.
    const moved = await cli(["diff", "old.csv", "new.csv", "--fail-on-change"], {
      files: { "old.csv": table, "new.csv": table.replace("q2,q1,ledger", "q2,q1,treasury") },
    });
    expect(moved.code).toBe(1);
    expect(head(moved.stdout)).toContain("1 edited (compared: team)");
    expect(moved.stdout).toContain("[edited team ledger -> treasury] q2");
    const ids = await cli(["diff", "old.csv", "new.csv", "--fail-on-change"], {
      files: { "old.csv": "id,parent\nq1,\nq2,q1\n", "new.csv": "id,parent\nq1,\nq2,q1\n" },
    });
    // Records with no field beside their links: nothing to compare, and the header says so.
    expect(head(ids.stdout)).toContain("0 edited (no field compared)");
    const paths = await cli(["diff", "a.paths", "b.paths", "--fail-on-change"], {
      files: { "a.paths": "quill/a\n", "b.paths": "quill/a\n" },
    });
    expect(paths.code).toBe(0);
    // A path list holds no record fields: nothing to say of compared ones.
    expect(head(paths.stdout)).toContain(" 0 edited, ");
  });

  it("--compare-field replaces the default: then only the named fields count", async () => {
    const files = { "old.json": listing("3.1.0"), "new.json": listing("3.2.0") };
    const r = await cli(["diff", "old.json", "new.json", "--fail-on-change", "--compare-field", "resolved"], {
      files,
    });
    expect(head(r.stdout)).toContain("0 edited (compared: resolved)");
    expect(r.code).toBe(0);
    const json = await cli(["diff", "old.json", "new.json", "--format", "json"], { files });
    expect(JSON.parse(json.stdout).compared).toEqual(["version"]);
  });

  it("a summary keeps no version field and still refuses a label field no record has", async () => {
    const r = await cli(["-", "--input-format", "json", "--label", "{team}"], { stdin: listing("3.1.0") });
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("FIELD_MISSING");
  });
});
