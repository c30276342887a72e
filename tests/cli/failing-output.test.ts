import { spawn } from "node:child_process";
import { existsSync, watch } from "node:fs";
import { lstat, mkdtemp, readdir, readlink, symlink, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { basename, join } from "node:path";
import { describe, expect, it } from "vitest";
import { closedAtStart, TERMINAL_INPUT_HINT } from "../../src/cli/std-streams.js";
import { temporaryName } from "../../src/cli/write-output.js";
import { BIN, runBin } from "../helpers/bin.js";

// Failing outputs, through the launcher as users run it. /dev/full is the Linux device whose every write
// fails with ENOSPC (common practice, no source: it stands in for a full disk).
const LIST = "10\tquill/a\n20\tquill/b\n5\tquill/c/d\n";

async function tempDir(): Promise<string> {
  return mkdtemp(join(tmpdir(), "espalier-failing-"));
}

/** Runs `sh -c SCRIPT` (for redirections node cannot set up: a closed descriptor, /dev/full). */
function shell(
  script: string,
  cwd: string,
): Promise<{ code: number | null; stdout: string; stderr: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn("sh", ["-c", script], { cwd, env: { PATH: process.env.PATH ?? "" } });
    let stdout = "";
    let stderr = "";
    child.stdout.setEncoding("utf8").on("data", (s: string) => {
      stdout += s;
    });
    child.stderr.setEncoding("utf8").on("data", (s: string) => {
      stderr += s;
    });
    child.on("error", reject);
    child.on("close", (code) => resolve({ code, stdout, stderr }));
  });
}

const node = JSON.stringify(process.execPath);
const bin = JSON.stringify(BIN);

function oneIoLine(stderr: string): void {
  expect(stderr).toMatch(/^espalier: [^\n]*\[IO\]\n$/);
  expect(stderr).not.toMatch(/\n\s+at /);
}

describe("espalier when standard output or standard error fails", () => {
  it("standard output on a full disk (> /dev/full): status 2 and one IO line, summary, diff and help", async () => {
    const dir = await tempDir();
    await writeFile(join(dir, "a.paths"), LIST);
    await writeFile(join(dir, "b.paths"), `${LIST}7\tquill/e\n`);
    for (const args of [
      "a.paths",
      "a.paths --format json",
      "diff a.paths b.paths --fail-on-change",
      "--help",
    ]) {
      const r = await shell(`${node} ${bin} ${args} > /dev/full`, dir);
      // Never 1, which diff --fail-on-change uses for "the versions differ".
      expect(r.code, args).toBe(2);
      oneIoLine(r.stderr);
    }
  });

  it("standard output closed before espalier starts (>&-): status 2 and one IO line; -o still works", async () => {
    const dir = await tempDir();
    await writeFile(join(dir, "a.paths"), LIST);
    const r = await shell(`exec ${node} ${bin} a.paths >&-`, dir);
    expect(r.code).toBe(2);
    oneIoLine(r.stderr);
    const o = await shell(`exec ${node} ${bin} a.paths -o out.txt >&-`, dir);
    expect(o.code, o.stderr).toBe(0);
    expect(existsSync(join(dir, "out.txt"))).toBe(true);
    // A redirection to /dev/null is a choice, not a failure.
    const n = await shell(`exec ${node} ${bin} a.paths > /dev/null`, dir);
    expect(n.code, n.stderr).toBe(0);
    expect(n.stderr).toBe("");
  });

  it("standard error failing too: status 2, whatever fails", async () => {
    const dir = await tempDir();
    await writeFile(join(dir, "a.paths"), LIST);
    for (const script of [
      `${node} ${bin} a.paths > /dev/full 2> /dev/full`,
      `${node} ${bin} missing.paths 2> /dev/full`,
      `exec ${node} ${bin} missing.paths 2>&-`,
      `exec ${node} ${bin} a.paths >&- 2>&-`,
    ]) {
      const r = await shell(script, dir);
      expect(r.code, script).toBe(2);
    }
  });

  it("a reader that closes the pipe early (as | head does) ends espalier quietly with status 0", async () => {
    const dir = await tempDir();
    const lines = Array.from({ length: 100_000 }, (_, i) => `quill/d${i % 100}/f${i}`).join("\n");
    await writeFile(join(dir, "big.paths"), lines);
    const child = spawn(process.execPath, [BIN, "big.paths", "--budget", "100000", "--no-chains"], {
      cwd: dir,
    });
    let stderr = "";
    child.stderr.setEncoding("utf8").on("data", (s: string) => {
      stderr += s;
    });
    child.stdout.once("data", () => child.stdout.destroy());
    const code = await new Promise<number | null>((resolve) => child.on("close", (c) => resolve(c)));
    expect(code).toBe(0);
    expect(stderr).toBe("");
  });

  it("diff --fail-on-change whose reader closes the pipe early still ends with status 1 (pipefail sees it)", async () => {
    const dir = await tempDir();
    const lines = Array.from({ length: 100_000 }, (_, i) => `quill/d${i % 100}/f${i}`);
    await writeFile(join(dir, "old.paths"), lines.join("\n"));
    await writeFile(join(dir, "new.paths"), lines.filter((_, i) => i % 7 !== 0).join("\n"));
    const args = [
      BIN,
      "diff",
      "old.paths",
      "new.paths",
      "--budget",
      "100000",
      "--no-chains",
      "--fail-on-change",
    ];
    const child = spawn(process.execPath, args, { cwd: dir });
    let stderr = "";
    child.stderr.setEncoding("utf8").on("data", (s: string) => {
      stderr += s;
    });
    child.stdout.once("data", () => child.stdout.destroy());
    const code = await new Promise<number | null>((resolve) => child.on("close", (c) => resolve(c)));
    expect(code).toBe(1);
    expect(stderr).toBe("");
  });

  it("closedAtStart(fd) is false for descriptors this test runner opened", () => {
    expect(closedAtStart(1)).toBe(false);
    expect(closedAtStart(2)).toBe(false);
  });
});

describe("espalier -o FILE when the write is cut short", () => {
  it("temporary files are named .FILE.espalier-PID-RANDOM.tmp beside FILE", () => {
    const name = temporaryName("/srv/reports/summary.json", 4242);
    expect(name).toMatch(/^\/srv\/reports\/\.summary\.json\.espalier-4242-[0-9a-f]{8}\.tmp$/);
  });

  for (const signal of ["SIGTERM", "SIGINT", "SIGHUP"] as const) {
    it(`${signal} during the write removes the temporary file and leaves no FILE`, async () => {
      const dir = await tempDir();
      // A big output (tens of MB of JSON), so the write lasts long enough to be interrupted.
      const lines = Array.from(
        { length: 150_000 },
        (_, i) => `${i}\tquill/d${i % 300}/file-number-${i}.ts`,
      ).join("\n");
      await writeFile(join(dir, "big.paths"), lines);
      const out = join(dir, "summary.json");
      const seen: string[] = [];
      const child = spawn(
        process.execPath,
        [BIN, "big.paths", "--budget", "150400", "--format", "json", "-o", out],
        {
          cwd: dir,
          stdio: ["ignore", "pipe", "pipe"],
        },
      );
      const watcher = watch(dir, (_event, name) => {
        if (name?.endsWith(".tmp") && !seen.includes(name)) {
          seen.push(name);
          child.kill(signal);
        }
      });
      const exit = await new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) =>
        child.on("close", (code, sig) => resolve({ code, signal: sig })),
      );
      watcher.close();
      expect(seen.length, "the temporary file was seen").toBeGreaterThan(0);
      expect(seen[0]).toMatch(/^\.summary\.json\.espalier-\d+-[0-9a-f]{8}\.tmp$/);
      expect(exit.signal).toBe(signal);
      expect((await readdir(dir)).sort()).toEqual(["big.paths"]);
    });
  }

  it("onto a dangling symbolic link: IO, before any work, and neither the link nor its target changes", async () => {
    const dir = await tempDir();
    await writeFile(join(dir, "a.paths"), LIST);
    const link = join(dir, "latest.txt");
    await symlink(join(dir, "reports", "nowhere.txt"), link);
    const r = await runBin([join(dir, "a.paths"), "-o", link]);
    expect(r.code).toBe(2);
    oneIoLine(r.stderr);
    expect((await lstat(link)).isSymbolicLink()).toBe(true);
    expect(await readlink(link)).toBe(join(dir, "reports", "nowhere.txt"));
    expect((await readdir(dir)).sort()).toEqual(["a.paths", basename(link)]);
  });
});

describe("espalier - when standard input is a terminal", () => {
  // `script` (util-linux) runs the command on a pseudo-terminal; what is typed is fed through it.
  it("says on standard error how to end the input, then reads it", async () => {
    const r = await shell(
      `(printf 'quill/a\\nquill/b\\n'; sleep 1; printf '\\004') | script -qec "${process.execPath} ${BIN} - --color never" /dev/null`,
      tmpdir(),
    );
    expect(r.stdout.replaceAll("\r", "")).toContain(TERMINAL_INPUT_HINT);
    expect(r.stdout.replaceAll("\r", "")).toMatch(/^\S quill {2}3 nodes\n {2}\S a\n {2}\S b$/m);
  });

  it("says nothing when standard input is a pipe or a file", async () => {
    const r = await runBin(["-"], { stdin: "quill/a\n" });
    expect(r.code).toBe(0);
    expect(r.stderr).toBe("");
  });
});
