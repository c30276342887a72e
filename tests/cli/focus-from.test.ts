import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Real shapes: a listing printed by GNU find (`-printf '%s\t%P\n'`, find(1)) and focus lists printed by
// git (`git diff --name-only`, with and without `-z`, git-diff(1)) of a repository this test makes.
// One changed file has a `~` in its name; one was deleted, so its line matches no node.
let dir = "";
let listing = "";
let changed = "";
let changedNul = "";
const at = (name: string) => join(dir, name);

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "espalier-focus-from-"));
  const repo = at("repo");
  const files: Record<string, string> = {
    "ledger/src/main.ts": "export const a = 1;\n",
    "ledger/lib/jsr305-0.1~+svn49.jar": "jar bytes\n",
    "ledger/README.md": "ledger\n",
    "riptide/src/gone.ts": "export const b = 2;\n",
    "riptide/src/kept.ts": "export const c = 3;\n",
  };
  for (const [path, text] of Object.entries(files)) {
    mkdirSync(join(repo, path, ".."), { recursive: true });
    writeFileSync(join(repo, path), text);
  }
  const git = (...args: string[]) =>
    execFileSync(
      "git",
      ["-c", "user.name=Quillfeather CI", "-c", "user.email=ci@quillfeather.invalid", ...args],
      {
        cwd: repo,
        encoding: "utf8",
      },
    );
  git("init", "-q");
  git("add", ".");
  git("commit", "-q", "-m", "start");
  writeFileSync(join(repo, "ledger/src/main.ts"), "export const a = 10;\n");
  writeFileSync(join(repo, "ledger/lib/jsr305-0.1~+svn49.jar"), "new jar bytes\n");
  rmSync(join(repo, "riptide/src/gone.ts"));
  changed = git("diff", "--name-only");
  changedNul = git("diff", "--name-only", "-z");
  listing = execFileSync("find", [".", "-type", "f", "-not", "-path", "./.git/*", "-printf", "%s\\t%P\\n"], {
    cwd: repo,
    encoding: "utf8",
  });
  writeFileSync(at("files.paths"), listing);
  writeFileSync(at("changed.txt"), changed);
  writeFileSync(at("changed-z.txt"), changedNul);
});

describe("espalier --focus-from with git's list of changed files", () => {
  it("the inputs are as the tools printed them (the test's own premise)", () => {
    expect(changed.split("\n").filter(Boolean).sort()).toEqual([
      "ledger/lib/jsr305-0.1~+svn49.jar",
      "ledger/src/main.ts",
      "riptide/src/gone.ts",
    ]);
    expect(changedNul).toContain("\0");
    expect(listing).not.toContain("gone.ts");
  });

  it("an empty list (git diff of no change, or a failed command before the pipe) adds no focus and says so on stderr", async () => {
    // What `git diff --name-only` prints for no change: nothing.
    const r = await cli([at("files.paths"), "--focus-from", "-"], { stdin: "" });
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^summary: .*; no focus; /);
    expect(r.stderr).toMatch(/^espalier: warning: <stdin>: the focus list holds no path, .*\n$/);
    // A --focus beside it is the focus; the list still says it added none.
    const beside = await cli([at("files.paths"), "--focus", "ledger", "--focus-from", "-"], { stdin: "\n" });
    expect(beside.stdout).toMatch(/^summary: .*; focus ledger; /);
    expect(beside.stderr).toContain("the focus list holds no path");
    // A list with a path says nothing.
    const one = await cli([at("files.paths"), "--focus-from", "-"], { stdin: "ledger/src/main.ts\n" });
    expect(one.stderr).toBe("");
  });

  it("fails by default when a line matches nothing (a deleted file): FOCUS_NO_MATCH, exit 2", async () => {
    const r = await cli([at("files.paths"), "--focus-from", at("changed.txt")]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toContain("[FOCUS_NO_MATCH]");
  });

  it("with --unmatched-foci skip, summarises the rest and lists the unmatched on stderr and in JSON", async () => {
    const args = [at("files.paths"), "--focus-from", at("changed.txt"), "--unmatched-foci", "skip"];
    const text = await cli(args);
    expect(text.code).toBe(0);
    expect(text.stderr).toContain('"riptide/src/gone.ts"');
    expect(text.stderr).toContain("warning");
    expect(text.stdout).toMatch(/\* .*main\.ts/);
    const json = await cli([...args, "--format", "json"]);
    const doc = JSON.parse(json.stdout);
    expect(doc.unmatchedFoci).toEqual(["riptide/src/gone.ts"]);
    // The `~` name is a literal name; printed, it is escaped (RFC 6901 §3: "~" -> "~0").
    expect([...doc.foci].sort()).toEqual(["ledger/lib/jsr305-0.1~0+svn49.jar", "ledger/src/main.ts"]);
  });

  it("with --unmatched-foci skip, the header line counts the skipped foci (one line, in the budget)", async () => {
    const args = [at("files.paths"), "--focus-from", at("changed.txt"), "--unmatched-foci", "skip"];
    for (const format of ["text", "markdown"]) {
      const r = await cli([...args, "--format", format, "--budget", "6"]);
      expect(r.code, r.stderr).toBe(0);
      const lines = r.stdout
        .trimEnd()
        .split("\n")
        .filter((line) => line !== "");
      // Markdown ends the header with a hard line break (a backslash) when the key line follows it.
      expect(lines[0], format).toMatch(/; 1 focus skipped \(no match\); \d+ of 6 lines\\?$/);
      expect(lines.length, format).toBeLessThanOrEqual(6);
      // Counted, never named: the typed path is not echoed on standard output.
      expect(r.stdout, format).not.toContain("gone");
    }
    const svg = await cli([...args, "--format", "svg"]);
    expect(svg.stdout).toContain("1 focus skipped (no match)");
    const all = await cli([
      at("files.paths"),
      "--focus",
      "nope/a",
      "--focus",
      "nope/b",
      "--unmatched-foci",
      "skip",
    ]);
    expect(all.stdout.split("\n")[0]).toContain("; no focus; 2 foci skipped (no match);");
    const none = await cli([
      at("files.paths"),
      "--focus-from",
      at("changed.txt"),
      "--unmatched-foci",
      "skip",
      "--bare",
    ]);
    expect(none.stdout).not.toContain("skipped");
  });

  it("under --pseudonymize, the header counts the skipped foci and names none", async () => {
    const r = await cli(
      [at("files.paths"), "--focus-from", at("changed.txt"), "--unmatched-foci", "skip", "--pseudonymize"],
      { env: { ESPALIER_PSEUDONYM_KEY: "test-secret" } },
    );
    expect(r.stdout.split("\n")[0]).toContain("1 focus skipped (no match)");
    expect(r.stdout).not.toContain("gone");
    expect(r.stdout).not.toContain("riptide");
  });

  it("reads a NUL-separated list (git diff --name-only -z) the same way", async () => {
    const r = await cli([
      at("files.paths"),
      "--focus-from",
      at("changed-z.txt"),
      "--unmatched-foci",
      "skip",
      "--format",
      "json",
    ]);
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.unmatchedFoci).toEqual(["riptide/src/gone.ts"]);
    expect(doc.foci.length).toBe(2);
  });

  it("refuses a list in UTF-16 without its byte order mark (USAGE), and reads one with its mark", async () => {
    // Field defect: such a list (little-endian, CRLF) read as a NUL-separated list of letters; under
    // --unmatched-foci skip the run went on with 32 foci skipped and the root's "/" as its one focus, exit 0.
    // UTF-16 encodings and the byte order mark as in Unicode 15, section 3.10 (from memory).
    const text = changed.replace(/\n/g, "\r\n");
    const little = Buffer.from(text, "utf16le");
    const big = Buffer.from(little).swap16();
    for (const [name, bytes] of [
      ["le.txt", little],
      ["be.txt", big],
    ] as const) {
      writeFileSync(at(name), bytes);
      const r = await cli([at("files.paths"), "--focus-from", at(name), "--unmatched-foci", "skip"]);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe("");
      expect(r.stderr).toMatch(/UTF-16 .*\[USAGE\]\n$/);
    }
    writeFileSync(at("marked.txt"), Buffer.concat([Buffer.from([0xff, 0xfe]), little]));
    const marked = await cli([
      at("files.paths"),
      "--focus-from",
      at("marked.txt"),
      "--unmatched-foci",
      "skip",
      "--format",
      "json",
    ]);
    expect(marked.code, marked.stderr).toBe(0);
    expect(JSON.parse(marked.stdout).unmatchedFoci).toEqual(["riptide/src/gone.ts"]);
    // a NUL-separated list of a few one-letter names is no UTF-16: no line break stands beside its NULs
    writeFileSync(at("letters.txt"), "a\0b\0c\0");
    const letters = await cli([
      at("files.paths"),
      "--focus-from",
      at("letters.txt"),
      "--unmatched-foci",
      "skip",
    ]);
    expect(letters.code, letters.stderr).toBe(0);
    expect(letters.stderr).toMatch(/3 foci match no node/);
  });

  it("refuses standard input named twice, as - or /dev/stdin: for the input and the list, or both versions", async () => {
    // Field defect: the list took standard input's bytes and the input was then said to be empty, as if
    // the command before the pipe had failed (INPUT_EMPTY); a diff of - and /dev/stdin said the same.
    for (const [input, list] of [
      ["-", "/dev/stdin"],
      ["/dev/stdin", "-"],
      ["-", "/dev/fd/0"],
    ]) {
      const r = await cli([input, "--focus-from", list], { stdin: listing });
      expect(r.code).toBe(2);
      expect(r.stdout).toBe("");
      expect(r.stderr).toMatch(/standard input cannot hold both .*\[USAGE\]\n$/);
    }
    const diff = await cli(["diff", "-", "/dev/stdin"], { stdin: listing });
    expect(diff.code).toBe(2);
    expect(diff.stderr).toMatch(/only one of the two versions .*\[USAGE\]\n$/);
  });

  it("reads the list from standard input", async () => {
    const r = await cli(
      [at("files.paths"), "--focus-from", "-", "--unmatched-foci", "skip", "--format", "json"],
      {
        stdin: changed,
      },
    );
    expect(JSON.parse(r.stdout).unmatchedFoci).toEqual(["riptide/src/gone.ts"]);
  });

  it("under --pseudonymize, names no unmatched path on stderr or in JSON", async () => {
    const r = await cli(
      [
        at("files.paths"),
        "--focus-from",
        at("changed.txt"),
        "--unmatched-foci",
        "skip",
        "--format",
        "json",
        "--pseudonymize",
      ],
      { env: { ESPALIER_PSEUDONYM_KEY: "test-secret" } },
    );
    expect(r.code).toBe(0);
    expect(r.stderr).not.toContain("gone");
    expect(r.stdout).not.toContain("gone");
    expect(JSON.parse(r.stdout).unmatchedFoci[0]).toMatch(
      /^anon-[0-9a-f]{12}\/anon-[0-9a-f]{12}\/anon-[0-9a-f]{12}$/,
    );
  });

  it("applies to a diff: the unmatched line is listed in the diff JSON", async () => {
    writeFileSync(at("old.paths"), listing.replace(/^\d+\tledger\/src\/main\.ts$/m, "3\tledger/src/main.ts"));
    const r = await cli([
      "diff",
      at("old.paths"),
      at("files.paths"),
      "--focus-from",
      at("changed.txt"),
      "--unmatched-foci",
      "skip",
      "--format",
      "json",
    ]);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).unmatchedFoci).toEqual(["riptide/src/gone.ts"]);
    const text = await cli([
      "diff",
      at("old.paths"),
      at("files.paths"),
      "--focus-from",
      at("changed.txt"),
      "--unmatched-foci",
      "skip",
    ]);
    expect(text.stdout.split("\n")[0]).toMatch(
      /^diff by path: .*; 1 focus skipped \(no match\); \d+ of \d+ lines \(default budget: not a terminal\)$/,
    );
    const strict = await cli(["diff", at("old.paths"), at("files.paths"), "--focus-from", at("changed.txt")]);
    expect(strict.code).toBe(2);
    expect(strict.stderr).toContain("[FOCUS_NO_MATCH]");
  });

  it("keeps --focus globs as they were, and never reads a --focus-from line as a glob", async () => {
    writeFileSync(at("glob.txt"), "ledger/src/*.ts\n");
    const listed = await cli([at("files.paths"), "--focus-from", at("glob.txt")]);
    expect(listed.code).toBe(2);
    const flag = await cli([at("files.paths"), "--focus", "ledger/src/*.ts", "--format", "json"]);
    expect(JSON.parse(flag.stdout).foci).toEqual(["ledger/src/main.ts"]);
  });
});
