import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cli } from "../helpers/cli.js";
import { writeFiles } from "../helpers/file-tree.js";

/** Whether `cmd args…` runs on this machine. */
function runs(cmd: string, args: string[]): boolean {
  try {
    execFileSync(cmd, args, { stdio: "ignore" });
    return true;
  } catch {
    return false;
  }
}

const hasGit = runs("git", ["--version"]);
const hasZip = runs("zip", ["-v"]) && runs("unzip", ["-v"]);
const hasZipinfo = runs("zipinfo", ["-v"]);

// Field tests: listings of commands that are neither path lists nor YAML, saved to a file named as a
// path list (.txt) or piped in. Each was read as a path list, exit 0: `git log -1 --name-only` and
// `git show --stat` (the commit's hash, author and message as paths), `zipinfo` (each line a path,
// mode, size and date in the names), `getent passwd` and `/etc/group` (every account one path split at
// its home's "/"s, names printed); piped in, `unzip -l` failed as YAML with the parser's words only.
let base = "";
beforeAll(() => {
  base = mkdtempSync(join(tmpdir(), "espalier-known-"));
  // An invented harbour's files: 12 + 3,000 + 310 bytes.
  writeFiles(join(base, "harbour"), {
    "berths/north.csv": 12,
    "ledger/q1 2026.json": 3000,
    "README.md": 310,
  });
});
afterAll(() => {
  rmSync(base, { recursive: true, force: true });
});

function run(cmd: string, args: string[], cwd = base): string {
  return execFileSync(cmd, args, { cwd, encoding: "utf8" });
}

/** The CLI on `text` saved as `name` (a path list's extension), and piped in. */
async function both(name: string, text: string) {
  writeFileSync(join(base, name), text);
  return [await cli([join(base, name)]), await cli(["-"], { stdin: text })];
}

describe("listings of known commands", () => {
  it.skipIf(!hasGit)(
    "git log and git show are PARSE_PATHS at line 2; the way named counts changes",
    async () => {
      const repo = join(base, "harbour");
      const git = (...args: string[]) =>
        run("git", ["-c", "user.name=Quay Bot", "-c", "user.email=quay@harbour.invalid", ...args], repo);
      git("init", "-q");
      git("add", "berths", "README.md");
      git("commit", "-qm", "berths");
      writeFileSync(join(repo, "berths", "north.csv"), "pier,depth\n");
      git("add", ".");
      git("commit", "-qm", "ledger");
      for (const args of [
        ["log", "-1", "--name-only"],
        ["log", "--stat"],
        ["show", "--stat"],
      ]) {
        for (const r of await both("commits.txt", git(...args))) {
          expect(r.code, args.join(" ")).toBe(2);
          expect(r.stdout).toBe("");
          expect(r.stderr).toMatch(/:2:1: the input starts as git log .*\[PARSE_PATHS\]\n$/);
        }
      }
      const told = (await cli(["-"], { stdin: git("log", "--name-only") })).stderr;
      const way = /: (git log --name-only --format= \| .*) \| espalier - --units plain/.exec(told)?.[1];
      expect(way).toBeDefined();
      const sizes = run("sh", ["-c", way!], repo);
      const doc = JSON.parse(
        (await cli(["-", "--units", "plain", "--format", "json"], { stdin: sizes })).stdout,
      );
      // Source: git's own count of changed paths over the commits, one line each (blank lines left out).
      const changes = git("log", "--name-only", "--format=")
        .split("\n")
        .filter((line) => line !== "").length;
      expect(doc.totals.size).toBe(changes);
      expect(doc.totals.size).toBe(4);
    },
  );

  it.skipIf(!hasZip)(
    "unzip -l and zipinfo are PARSE_PATHS at line 2; the awk named reads the sizes",
    async () => {
      // A folder of its own: the git test makes harbour a repository.
      writeFiles(join(base, "pier"), {
        "berths/north.csv": 12,
        "ledger/q1 2026.json": 3000,
        "README.md": 310,
      });
      run("zip", ["-qr", "pier.zip", "pier"]);
      const listings = [run("unzip", ["-l", "pier.zip"])];
      if (hasZipinfo) listings.push(run("zipinfo", ["pier.zip"]));
      for (const listing of listings)
        for (const r of await both("archive.txt", listing)) {
          expect(r.code).toBe(2);
          expect(r.stderr).toMatch(/:2:1: the input starts as unzip -l and zipinfo .*\[PARSE_PATHS\]\n$/);
        }
      const told = (await cli(["-"], { stdin: listings[0] })).stderr;
      const awk = /\| awk '(.*)' \| espalier -/.exec(told)?.[1];
      expect(awk).toBeDefined();
      const paths = execFileSync("awk", [awk!], { input: listings[0], encoding: "utf8" });
      const doc = JSON.parse((await cli(["-", "--format", "json"], { stdin: paths })).stdout);
      // Source: the total unzip -l prints on its last line, and the sizes written.
      const total = Number(listings[0].trim().split("\n").at(-1)!.trim().split(/ +/)[0]);
      expect(doc.totals.size).toBe(total);
      expect(total).toBe(12 + 3000 + 310);
    },
  );

  it("colon-separated accounts and groups are PARSE_PATHS quoting none of them", async () => {
    // passwd(5) and group(5) records of invented accounts.
    const passwd = [
      "quay:x:1001:1001:Quay Bot:/srv/harbour/quay:/bin/sh",
      "tide:x:1002:1002::/srv/harbour/tide:/usr/sbin/nologin",
      "",
    ].join("\n");
    const group = ["harbour:x:1001:quay,tide", "ledger:x:1003:", "tide:x:1002:", ""].join("\n");
    for (const text of [passwd, group])
      for (const r of await both("accounts.txt", text)) {
        expect(r.code).toBe(2);
        expect(r.stdout).toBe("");
        expect(r.stderr).toMatch(/:1:1: every line is \d fields separated by colons.*\[PARSE_PATHS\]\n$/);
        for (const name of ["quay", "tide", "harbour", "ledger", "Quay Bot"])
          expect(r.stderr).not.toContain(name);
      }
    // Paths with colons, not records: read.
    const paths = await cli(["-", "--bare"], { stdin: "berths/pier:1:2\nberths/pier:1:3\n" });
    expect(paths.code).toBe(0);
  });

  it.skipIf(!existsSync("/etc/group"))("the machine's own /etc/group is PARSE_PATHS", async () => {
    const r = await cli(["-"], { stdin: readFileSync("/etc/group") });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/separated by colons.*\[PARSE_PATHS\]\n$/);
  });
});

const hasPip = runs("python3", ["-m", "pip", "--version"]);
const hasDpkg = runs("dpkg", ["-s", "dpkg"]);

describe("package records of fields", () => {
  it.skipIf(!hasPip)(
    "python3 -m pip show is PARSE_PATHS at line 2; the way named reads what requires what",
    async () => {
      // One record was read as a path list, exit 0: "Location: " a folder, its path split at "/".
      const shown = run("python3", ["-m", "pip", "show", "pip"]);
      expect(shown.split("\n")[0]).toBe("Name: pip");
      const [file, piped] = await both("pip-show.txt", shown);
      expect(file.code).toBe(2);
      expect(file.stdout).toBe("");
      expect(file.stderr).toMatch(/:2:1: the input starts as pip show, .*\[PARSE_PATHS\]\n$/);
      // Piped in, it is YAML (YAML 1.2: a mapping of plain scalars), read as values, and the header says so.
      expect(piped.code).toBe(0);
      expect(piped.stdout.split("\n")[0]).toContain("every value a node");
      // The way the message names, run as it says: an edge a line from each record's Requires.
      const way =
        /For what requires what, list one edge a line: pip show PKG\.\.\. \| (awk .*) \| espalier - --input-format edges;/.exec(
          file.stderr,
        )?.[1];
      expect(way).toBeDefined();
      const records = [
        "Name: quay-cli",
        "Version: 2.0.1",
        "Requires: tide-log, brine",
        "Required-by: ",
        "---",
        "Name: tide-log",
        "Version: 0.3.0",
        "Requires: brine",
        "Required-by: quay-cli",
        "",
      ].join("\n");
      const edges = execFileSync("sh", ["-c", way!], { input: records, encoding: "utf8" });
      expect(edges).toBe("quay-cli\ttide-log\nquay-cli\tbrine\ntide-log\tbrine\n");
      const r = await cli(["-", "--input-format", "edges", "--format", "json"], { stdin: edges });
      expect(r.code, r.stderr).toBe(0);
      // Three packages; brine, required twice, is counted once.
      expect(JSON.parse(r.stdout).totals.nodes).toBe(3);
    },
  );

  it.skipIf(!hasDpkg)("dpkg -s and the dpkg status file are PARSE_PATHS at line 2", async () => {
    // deb-control(5) fields: Package: first, then Status: (or Essential:) a line.
    // Saved as a path list's file, and the status file piped in (as YAML its Package: keys repeat).
    writeFileSync(join(base, "dpkg-s.txt"), run("dpkg", ["-s", "dpkg"]));
    for (const r of [
      await cli([join(base, "dpkg-s.txt")]),
      await cli(["-"], { stdin: readFileSync("/var/lib/dpkg/status", "utf8") }),
    ]) {
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/:2:1: the input starts as pip show, dpkg -s .*\[PARSE_PATHS\]\n$/);
    }
  });
});
