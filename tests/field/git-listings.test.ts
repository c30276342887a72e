import { execFileSync } from "node:child_process";
import { mkdirSync, mkdtempSync, rmSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";

// Field tests: git's listings of a commit (git 2.39 here). `git ls-tree -r -l HEAD` and `git ls-files
// -s` put fields before the tab; the BAD_SIZE said "keep only the size before the separator", which for
// ls-files -s is its stage (0), no size: done as told, every file would read as 0 bytes, exit 0.
// Now each names its listing and the command that lists sizes and paths, checked here against the
// files' sizes on disk (git keeps a file's bytes as they are, without filters).
const hasGit = (() => {
  try {
    return /^git version/.test(execFileSync("git", ["--version"], { encoding: "utf8" }));
  } catch {
    return false;
  }
})();

const files: Record<string, string> = {
  "README.md": "# tidewater\n",
  "src/ledger.ts": "export const ledger = 1;\n".repeat(40),
  "src/sails/plan.ts": "export const plan = 2;\n".repeat(7),
  "docs/guide.md": "guide\n".repeat(300),
};
let repo = "";
const git = (args: string[]) =>
  execFileSync("git", args, {
    cwd: repo,
    encoding: "utf8",
    env: {
      ...process.env,
      GIT_AUTHOR_NAME: "Tidewater CI",
      GIT_AUTHOR_EMAIL: "ci@tidewater.invalid",
      GIT_COMMITTER_NAME: "Tidewater CI",
      GIT_COMMITTER_EMAIL: "ci@tidewater.invalid",
      GIT_CONFIG_NOSYSTEM: "1",
      HOME: repo,
    },
  });

beforeAll(() => {
  if (!hasGit) return;
  repo = mkdtempSync(join(tmpdir(), "espalier-git-"));
  for (const [path, text] of Object.entries(files)) {
    mkdirSync(join(repo, path, ".."), { recursive: true });
    writeFileSync(join(repo, path), text);
  }
  git(["init", "-q"]);
  git(["add", "."]);
  git(["commit", "-q", "-m", "fixture"]);
});

afterAll(() => {
  if (repo) rmSync(repo, { recursive: true, force: true });
});

describe.skipIf(!hasGit)("git listings of a commit", () => {
  it("git ls-tree -r -l: BAD_SIZE at line 1 naming the listing and git ls-tree --format", async () => {
    const result = await cli(["-"], { stdin: git(["ls-tree", "-r", "-l", "HEAD"]) });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe("");
    expect(result.stderr).toMatch(
      /^espalier: <stdin>:1:1: .*it is a `git ls-tree -l` line \(mode, type, hash and size\): list sizes and paths with git ls-tree -r --format='%\(objectsize\)%x09%\(path\)' HEAD \[BAD_SIZE\]\n$/,
    );
  });

  it("git ls-files -s: BAD_SIZE saying its number is a stage, no size", async () => {
    const result = await cli(["-"], { stdin: git(["ls-files", "-s"]) });
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(
      /it is a `git ls-files -s` line \(mode, hash and stage, which is no size\)/,
    );
    expect(result.stderr).not.toContain("keep only the size");
  });

  it("the listing the messages name reads with every file's size on disk", async () => {
    const listing = git(["ls-tree", "-r", "--format=%(objectsize)%x09%(path)", "HEAD"]);
    const result = await cli(["-", "--format", "json"], { stdin: listing });
    expect(result.code).toBe(0);
    const doc = JSON.parse(result.stdout);
    const onDisk = Object.keys(files).reduce((sum, path) => sum + statSync(join(repo, path)).size, 0);
    expect(doc.totals.size).toBe(onDisk);
    expect(doc.totals.nodes).toBe(Object.keys(files).length + 4); // src, src/sails, docs and the root
  });
});

describe.skipIf(!hasGit)("git diff --stat and --numstat of a change", () => {
  // Read as a path list, git diff --stat's lines (`src/ledger.ts | 12 ++--`) were paths whose names held
  // the counts and bars, exit 0. The check for the way out is git diff --shortstat's own totals.
  const change = () => {
    writeFileSync(join(repo, "src/ledger.ts"), "export const ledger = 1;\n".repeat(30) + "// tide\n");
    writeFileSync(join(repo, "docs/guide.md"), "guide\n".repeat(310));
  };

  it("git diff --stat is PARSE_PATHS at line 1 naming git diff --numstat", async () => {
    change();
    const result = await cli(["-"], { stdin: git(["diff", "--stat"]) });
    expect(result.code).toBe(2);
    expect(result.stdout).toBe("");
    expect(result.stderr).toMatch(/^espalier: <stdin>:1:1: .*git diff --numstat .*\[PARSE_PATHS\]\n$/);
  });

  it("git diff --numstat alone names its awk; through it, the root's size is --shortstat's lines changed", async () => {
    change();
    const numstat = git(["diff", "--numstat"]);
    const told = await cli(["-"], { stdin: numstat });
    expect(told.code).toBe(2);
    expect(told.stderr).toMatch(
      /for git diff --numstat .*--units plain reads the lines changed as sizes \[PARSE_PATHS\]\n$/,
    );
    const paths = execFileSync("awk", ["-F\t", '{print $1 + $2 "\t" $3}'], {
      input: numstat,
      encoding: "utf8",
    });
    const doc = JSON.parse(
      (await cli(["-", "--units", "plain", "--format", "json"], { stdin: paths })).stdout,
    );
    const short = git(["diff", "--shortstat"]);
    const counted = [...short.matchAll(/([0-9]+) (?:insertion|deletion)/g)].reduce(
      (n, m) => n + Number(m[1]),
      0,
    );
    expect(doc.totals.size).toBe(counted);
    expect(counted).toBeGreaterThan(0);
  });
});

describe.skipIf(!hasGit)("git's quoted paths (core.quotepath, on by default)", () => {
  // git ls-files writes a path holding a byte other than printable ASCII, a '"' or a '\' as a C string
  // ("docs/\346\275\256.md"): read as written, `"docs` was a folder apart from `docs` and every such name
  // held its escapes, exit 0. The check is git's own unquoted listing, ended by NUL (-z).
  let quotedRepo = "";
  const inRepo = (args: string[]) => execFileSync("git", args, { cwd: quotedRepo, encoding: "utf8" });
  beforeAll(() => {
    quotedRepo = mkdtempSync(join(tmpdir(), "espalier-git-quoted-"));
    mkdirSync(join(quotedRepo, "docs"));
    for (const [name, text] of [
      ["docs/tide.md", "tide\n"],
      ["docs/潮.md", "shio\n"],
      ['docs/quay "north".md', "quay\n"],
      ["docs/back\\slash.md", "slash\n"],
      ["docs/tab\there.md", "tab\n"],
    ])
      writeFileSync(join(quotedRepo, name), text);
    inRepo(["init", "-q"]);
    inRepo(["add", "."]);
    execFileSync(
      "git",
      [
        "-c",
        "user.name=Tidewater CI",
        "-c",
        "user.email=ci@tidewater.invalid",
        "commit",
        "-q",
        "-m",
        "quoted",
      ],
      {
        cwd: quotedRepo,
      },
    );
  });
  afterAll(() => {
    if (quotedRepo) rmSync(quotedRepo, { recursive: true, force: true });
  });

  it.each([
    ["git ls-files", ["ls-files"]],
    ["git ls-tree --format with sizes", ["ls-tree", "-r", "--format=%(objectsize)%x09%(path)", "HEAD"]],
  ])("%s reads as the same listing ended by NUL (-z) does", async (_, args) => {
    const quoted = inRepo(args);
    expect(quoted).toContain('"docs/\\346\\275\\256.md"');
    const read = await cli(["-", "--format", "json"], { stdin: quoted });
    const zArgs = [...args.slice(0, 1), "-z", ...args.slice(1)];
    const plain = await cli(["-", "--nul-separated", "--format", "json"], { stdin: inRepo(zArgs) });
    expect(read.code).toBe(0);
    const [a, b] = [JSON.parse(read.stdout), JSON.parse(plain.stdout)];
    expect(a.totals).toEqual(b.totals);
    expect(a.root.children.map((c: { name: string }) => c.name)).toEqual(
      b.root.children.map((c: { name: string }) => c.name),
    );
    // docs and its five files, the root named docs (the one top folder).
    expect(a.totals.nodes).toBe(6);
  });
});
