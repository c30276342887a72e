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
    // `resolved` is compared too (every field the records hold); npm's `overridden` is not (it marks a
    // full entry from a deduped one, see the test further down).
    expect(head(r.stdout)).toContain(
      "0 added, 0 removed, 0 moved, 0 renamed, 1 edited (compared: version, resolved), 0 resized",
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
    expect(JSON.parse(json.stdout).compared).toEqual(["version", "resolved"]);
  });

  it("compares the records' other fields beside their version: a changed image tag is an edit", async () => {
    // A list of services as a deployment file names them (common practice, no source), invented names.
    const services = (tag: string, replicas: number) =>
      `services:\n  - name: ledger\n    version: "1.4"\n    image: registry.example/ledger:1.4\n    replicas: 2\n` +
      `  - name: tern\n    version: "2.0"\n    image: registry.example/tern:${tag}\n    replicas: ${replicas}\n`;
    const files = { "old.yaml": services("2.0", 1), "new.yaml": services("2.1", 3) };
    const r = await cli(["diff", "old.yaml", "new.yaml", "--fail-on-change"], { files });
    expect(r.code).toBe(1);
    expect(head(r.stdout)).toContain("1 edited (compared: version, image, replicas)");
    expect(r.stdout).toContain(
      "[edited image registry.example/tern:2.0 -> registry.example/tern:2.1, replicas 1 -> 3] tern",
    );
    const same = await cli(["diff", "old.yaml", "old.yaml", "--fail-on-change"], { files });
    expect(same.code).toBe(0);
  });

  it("compares a record's nested value as its JSON text, in rows and in a lock file", async () => {
    // JSON rows whose records hold an object: compared as text, not refused (it was SHAPE, exit 2).
    const rows = (team: string) =>
      JSON.stringify([
        { id: "1", parent: "", name: "harbor", meta: { floor: 2 } },
        { id: "2", parent: "1", name: "ledger", team, meta: { floor: 3 } },
      ]);
    const r = await cli(["diff", "old.json", "new.json", "--fail-on-change"], {
      files: { "old.json": rows("core"), "new.json": rows("edge") },
    });
    expect(r.stderr).toBe("");
    expect(r.code).toBe(1);
    expect(r.stdout).toContain("[edited team core -> edge] ledger");
    // A lock file's records hold objects (engines, dependencies) and flags (dev) beside the version.
    const locked = (dev: boolean, node: string) =>
      JSON.stringify({
        name: "tidewater",
        lockfileVersion: 3,
        packages: {
          "": { name: "tidewater", version: "1.4.0" },
          "node_modules/kelp-log": { version: "3.1.0", dev, engines: { node } },
          "node_modules/tide-clock": { version: "2.0.0", license: "MIT" },
        },
      });
    const l = await cli(["diff", "old.json", "new.json", "--fail-on-change"], {
      files: { "old.json": locked(true, ">=18"), "new.json": locked(false, ">=22") },
    });
    expect(l.code).toBe(1);
    expect(l.stdout).toContain(
      '[edited dev true -> false, engines {"node":">=18"} -> {"node":">=22"}] kelp-log',
    );
    const json = await cli(["diff", "old.json", "new.json", "--format", "json"], {
      files: { "old.json": locked(true, ">=18"), "new.json": locked(true, ">=18") },
    });
    expect(JSON.parse(json.stdout).compared).toEqual(["version", "dev", "engines", "license"]);
  });

  it("names four compared fields at most on the header, and counts the rest", async () => {
    const table =
      "id,parent,team,site,desk,badge,shift\nq1,,ops,north,a,1,day\nq2,q1,ledger,south,b,2,night\n";
    const r = await cli(["diff", "old.csv", "new.csv"], { files: { "old.csv": table, "new.csv": table } });
    expect(head(r.stdout)).toContain("0 edited (compared: team, site, desk and 2 other fields)");
    const json = await cli(["diff", "old.csv", "new.csv", "--format", "json"], {
      files: { "old.csv": table, "new.csv": table },
    });
    expect(JSON.parse(json.stdout).compared).toEqual(["team", "site", "desk", "badge", "shift"]);
  });

  it("does not compare npm's `overridden`: a deduped entry paired with a full one is no edit", async () => {
    // npm ls --all --json writes `overridden` on full entries only (npm 11, lib/commands/ls.js, read
    // there): a package installed at the top after a direct dependency on it was added has its full
    // entry move there, and its old place becomes a deduped entry, `{"version": ...}`.
    const entry = (deps: object) => ({ version: "3.1.0", overridden: false, dependencies: deps });
    const before = JSON.stringify({
      name: "tidewater",
      version: "1.4.0",
      dependencies: {
        "kelp-log": { version: "1.0.0", overridden: false, dependencies: { "brine-util": entry({}) } },
      },
    });
    const after = JSON.stringify({
      name: "tidewater",
      version: "1.4.0",
      dependencies: {
        "brine-util": entry({}),
        "kelp-log": {
          version: "1.0.0",
          overridden: false,
          dependencies: { "brine-util": { version: "3.1.0" } },
        },
      },
    });
    const r = await cli(["diff", "old.json", "new.json", "--format", "json"], {
      files: { "old.json": before, "new.json": after },
    });
    const diff = JSON.parse(r.stdout);
    expect(diff.compared).toEqual(["version"]);
    expect(diff.changes.edited).toBe(0);
  });

  it("a summary keeps no version field and still refuses a label field no record has", async () => {
    const r = await cli(["-", "--input-format", "json", "--label", "{team}"], { stdin: listing("3.1.0") });
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("FIELD_MISSING");
  });
});
