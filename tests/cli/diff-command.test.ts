import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

const ORG = "fixtures/quillfeather-org.csv";
let dir = "";
const at = (name: string) => join(dir, name);

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "espalier-diff-"));
  writeFileSync(at("old.paths"), "10\ttidewater/a/x\n20\ttidewater/a/y\n5\ttidewater/b/z\n");
  writeFileSync(at("new.paths"), "10\ttidewater/a/x\n26\ttidewater/a/y\n5\ttidewater/b/z\n7\ttidewater/c\n");
  // The org chart with one person moved to another manager (ids keep their rows).
  const rows = readFileSync(ORG, "utf8").split("\n");
  const moved = rows.map((row) =>
    row.startsWith("Q2417,") ? row.replace(/^Q2417,[^,]*,/, "Q2417,Q0412,") : row,
  );
  writeFileSync(at("org-next.csv"), moved.join("\n"));
  writeFileSync(at("broken.json"), '{"name": "tidewater", "children": [');
  // Dependency listings in the shape of `npm ls --all --json` (npm-ls(1)), invented packages; one
  // version moves back from 3.0.1 to 3.0.0.
  const deps = (kelp: string) =>
    JSON.stringify({
      name: "tidewater",
      version: "0.0.0",
      dependencies: {
        "coral-args": { version: "1.2.0", dependencies: { "kelp-log": { version: kelp } } },
        brine: { version: "0.4.2" },
      },
    });
  writeFileSync(at("deps-before.json"), deps("3.0.1"));
  writeFileSync(at("deps-after.json"), deps("3.0.0"));
});

describe("espalier diff OLD NEW", () => {
  // Statuses as POSIX defines them for cmp and diff (POSIX.1-2017, XCU cmp and diff, EXIT STATUS):
  // 0 no differences, 1 differences found, >1 an error occurred.
  it("exits 1 with --fail-on-change when the versions differ, and prints the diff", async () => {
    // One folder's few entries say no unit (UNIT_NOT_SAID); --units bytes says they are bytes.
    const r = await cli(["diff", at("old.paths"), at("new.paths"), "--fail-on-change", "--units", "bytes"]);
    expect(r.code).toBe(1); // POSIX diff: 1 = differences were found
    expect(r.stderr).toBe("");
    expect(r.stdout.split("\n")[0]).toMatch(
      /^diff by path: 1 added, 0 removed, 0 moved, 0 renamed, 0 edited, 1 resized;/,
    );
    expect(r.stdout).toContain("[resized +6 B] y");
    expect(r.stdout).toContain("[added +7 B] c");
  });

  it("exits 0 with --fail-on-change when the versions are the same (diff(T, T) reports nothing)", async () => {
    const r = await cli(["diff", at("old.paths"), at("old.paths"), "--fail-on-change"]);
    expect(r.code).toBe(0); // POSIX diff: 0 = no differences were found
    expect(r.stdout.split("\n")[0]).toMatch(
      /^diff by path: 0 added, 0 removed, 0 moved, 0 renamed, 0 edited, 0 resized;/,
    );
    expect(r.stdout).not.toContain("[");
  });

  it("takes no other name for --fail-on-change: --exit-code is an unknown option (USAGE)", async () => {
    const r = await cli(["diff", at("old.paths"), at("new.paths"), "--exit-code"]);
    expect(r.code).toBe(2); // POSIX diff: >1 = an error occurred
    expect(r.stderr).toMatch(/^espalier: .*\[USAGE\]\n$/);
    // Field test: the message pointed at espalier --help, which lists the summary's options, not diff's
    // (--fail-on-change is in espalier diff --help).
    expect(r.stderr).toContain("(espalier diff --help lists them)");
    expect(r.stdout).toBe("");
  });

  it("given one file, names NEW as the one missing and the file as OLD (USAGE)", async () => {
    // Field test: the message said "missing OLD and NEW (got 1)", as if neither had been given.
    const r = await cli(["diff", at("old.paths")]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toMatch(/^espalier: missing NEW: .*\[USAGE\]\n$/);
    expect(r.stderr).toContain(`${JSON.stringify(at("old.paths"))} is read as OLD`);
    const none = await cli(["diff"]);
    expect(none.code).toBe(2);
    expect(none.stderr).toMatch(/^espalier: missing OLD and NEW: .*\[USAGE\]\n$/);
  });

  it("exits 0 without --fail-on-change even when the versions differ", async () => {
    const r = await cli(["diff", at("old.paths"), at("new.paths")]);
    expect(r.code).toBe(0);
  });

  it("says an empty file name is one (a script's unset variable), for a summary and either version", async () => {
    for (const args of [[""], ["diff", "", at("old.paths")], ["diff", at("old.paths"), ""]]) {
      const r = await cli(args);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe("");
      expect(r.stderr).toContain('cannot read an empty file name ("")');
      expect(r.stderr).toContain("[IO]");
    }
  });

  it("exits 2 on an input error either way, with one line on stderr and nothing on stdout", async () => {
    for (const extra of [[], ["--fail-on-change"]]) {
      const missing = await cli(["diff", at("old.paths"), at("nope.paths"), ...extra]);
      expect(missing.code).toBe(2);
      expect(missing.stdout).toBe("");
      expect(missing.stderr).toContain("[IO]");
      const broken = await cli(["diff", at("broken.json"), at("old.paths"), ...extra]);
      expect(broken.code).toBe(2);
      expect(broken.stdout).toBe("");
      expect(broken.stderr).toContain("[PARSE_JSON]");
      expect(broken.stderr).toContain("broken.json");
    }
  });

  it("exits 2 on usage errors: both versions on standard input, a missing operand, a bad budget", async () => {
    const both = await cli(["diff", "-", "-", "--fail-on-change"], { stdin: "a\n" });
    expect(both.code).toBe(2);
    expect(both.stderr).toContain("[USAGE]");
    expect((await cli(["diff", at("old.paths")])).code).toBe(2);
    const budget = await cli(["diff", at("old.paths"), at("new.paths"), "--budget", "0"]);
    expect(budget.code).toBe(2);
    expect(budget.stderr).toContain("[USAGE]");
  });

  it("reads either version from standard input", async () => {
    const stdin = readFileSync(at("new.paths"), "utf8");
    const asNew = await cli(["diff", at("old.paths"), "-", "--fail-on-change"], { stdin });
    const asOld = await cli(["diff", "-", at("old.paths"), "--fail-on-change"], { stdin });
    expect(asNew.code).toBe(1);
    expect(asNew.stdout).toContain("1 added, 0 removed");
    expect(asOld.stdout).toContain("0 added, 1 removed");
  });

  it("takes the summary's options after the subcommand: budget, format, field names", async () => {
    const r = await cli(["diff", at("old.paths"), at("new.paths"), "--budget", "3"]);
    expect(r.stdout.trimEnd().split("\n")).toHaveLength(3);
    const json = JSON.parse(
      (await cli(["diff", at("old.paths"), at("new.paths"), "--format", "json"])).stdout,
    );
    expect(json.changes).toEqual({ added: 1, removed: 0, moved: 0, renamed: 0, edited: 0, resized: 1 });
    const tight = await cli(["diff", at("old.paths"), at("new.paths"), "--budget", "1"]);
    expect(tight.code).toBe(2);
    expect(tight.stderr).toContain("[BUDGET_TOO_SMALL]");
  });

  it("matches an org chart's rows by id and reports a change of manager as one move", async () => {
    const r = await cli(
      [
        "diff",
        ORG,
        at("org-next.csv"),
        "--parent-field",
        "manager",
        "--size-field",
        "cost",
        "--budget",
        "20",
      ],
      {},
    );
    expect(r.code).toBe(0);
    expect(r.stdout.split("\n")[0]).toMatch(
      /^diff by id: 0 added, 0 removed, 1 moved, 0 renamed, 0 edited \(compared: title, team\), 0 resized;/,
    );
    expect(r.stdout).toMatch(/: (.* \/ )?\[moved from [^\]]+\] Marit Okonkwo-Lund/);
    expect(r.stdout.trimEnd().split("\n").length).toBeLessThanOrEqual(20);
  });

  it("prints keyed pseudonyms instead of names with --pseudonymize", async () => {
    const args = ["diff", ORG, at("org-next.csv"), "--parent-field", "manager", "--pseudonymize"];
    const r = await cli(args, { env: { ESPALIER_PSEUDONYM_KEY: "test-secret" } });
    expect(r.code).toBe(0);
    expect(r.stdout).not.toContain("Marit");
    expect(r.stdout).toMatch(/\[moved from [^\]]*anon-[0-9a-f]{12}\] anon-[0-9a-f]{12}/);
  });

  it("keeps lines within --width and accepts a removed node's path as a focus", async () => {
    const r = await cli(["diff", at("new.paths"), at("old.paths"), "--width", "40", "--focus", "c"]);
    expect(r.code).toBe(0);
    for (const line of r.stdout.trimEnd().split("\n")) expect(line.length).toBeLessThanOrEqual(40);
    expect(r.stdout).toContain("* [removed -7 B] c");
  });

  it("--compare-field version: a version moved 3.0.1 -> 3.0.0 is a change, so --fail-on-change exits 1", async () => {
    const args = ["diff", at("deps-before.json"), at("deps-after.json"), "--fail-on-change"];
    // `version` is compared by default too; naming another field replaces the default.
    const without = await cli(args);
    expect(without.code).toBe(1);
    const other = await cli([...args, "--compare-field", "name"]);
    expect(other.code).toBe(0);
    const r = await cli([...args, "--compare-field", "version"]);
    expect(r.code).toBe(1);
    expect(r.stdout.split("\n")[0]).toContain("1 edited");
    expect(r.stdout).toContain("[edited version 3.0.1 -> 3.0.0] kelp-log");
    const json = JSON.parse((await cli([...args, "--compare-field", "version", "--format", "json"])).stdout);
    expect(json.changes.edited).toBe(1);
    const kelp = json.root.children[0].children[0];
    expect(kelp.edits).toEqual([{ field: "version", old: "3.0.1", new: "3.0.0" }]);
    const md = await cli([...args, "--compare-field", "version", "--format", "markdown"]);
    expect(md.stdout).toContain("edited version 3.0.1 -> 3.0.0");
    const svg = await cli([...args, "--compare-field", "version", "--format", "svg"]);
    expect(svg.stdout).toContain("edited version 3.0.1 -&gt; 3.0.0");
    // Given before the word diff, the option applies all the same.
    const before = await cli(["--compare-field", "version", ...args]);
    expect(before.code).toBe(1);
  });

  it("--compare-field with a field no record has is FIELD_MISSING (exit 2), never an empty comparison", async () => {
    const r = await cli(["diff", at("old.paths"), at("new.paths"), "--compare-field", "version"]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toContain("[FIELD_MISSING]");
    const json = await cli([
      "diff",
      at("deps-before.json"),
      at("deps-after.json"),
      "--compare-field",
      "licence",
    ]);
    expect(json.code).toBe(2);
    expect(json.stderr).toContain("[FIELD_MISSING]");
  });

  it("--compare-field under --pseudonymize prints no value", async () => {
    const args = ["diff", at("deps-before.json"), at("deps-after.json"), "--compare-field", "version"];
    const r = await cli([...args, "--pseudonymize"], { env: { ESPALIER_PSEUDONYM_KEY: "test-secret" } });
    expect(r.code).toBe(0);
    expect(r.stdout).not.toContain("3.0.1");
    expect(r.stdout).not.toContain("kelp-log");
    expect(r.stdout).toMatch(/\[edited version anon-[0-9a-f]{12} -> anon-[0-9a-f]{12}\]/);
  });

  it("leaves the summary as the default command", async () => {
    const r = await cli([at("old.paths"), "--budget", "3"]);
    expect(r.code).toBe(0);
    expect(r.stdout.trimEnd().split("\n")).toHaveLength(3);
    expect(r.stdout).not.toContain("matched by");
  });
});
