import { spawnSync } from "node:child_process";
import {
  chmodSync,
  cpSync,
  existsSync,
  mkdirSync,
  mkdtempSync,
  readFileSync,
  rmSync,
  writeFileSync,
} from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { BIN, runBin } from "../helpers/bin.js";

// Every example `--help` prints is run as printed, by a POSIX shell, from a folder holding a copy of
// the demo data (fixtures/) and nothing else (no config file), with `espalier` on the PATH being this
// build. An example's own text says which exit status it ends with ("status 1"); otherwise 0.
const dir = mkdtempSync(join(tmpdir(), "espalier-help-"));
cpSync(new URL("../../fixtures", import.meta.url).pathname, join(dir, "fixtures"), { recursive: true });
mkdirSync(join(dir, "bin"));
writeFileSync(join(dir, "bin", "espalier"), `#!/bin/sh\nexec "${process.execPath}" "${BIN}" "$@"\n`);
chmodSync(join(dir, "bin", "espalier"), 0o755);
const PATH = `${join(dir, "bin")}:${process.env.PATH ?? ""}`;

interface Printed {
  what: string;
  line: string;
}

/** The examples of one help screen: a line `  WHAT:` and below it `    $ LINE`. */
async function examplesOf(args: string[]): Promise<Printed[]> {
  const help = await runBin(args);
  expect(help.code).toBe(0);
  const lines = help.stdout.split("\n");
  const out: Printed[] = [];
  lines.forEach((line, i) => {
    const m = /^ {4}\$ (.+)$/.exec(line);
    if (m) out.push({ what: lines[i - 1].trim(), line: m[1] });
  });
  return out;
}

const expectedStatus = (what: string) => Number(/status (\d+)/.exec(what)?.[1] ?? 0);

describe("the examples printed by --help", () => {
  it.each([[["--help"]], [["diff", "--help"]]])(
    "%s: each runs as printed on the demo data and ends as its text says",
    async (args) => {
      const examples = await examplesOf(args);
      expect(examples.length).toBeGreaterThanOrEqual(3);
      for (const { what, line } of examples) {
        const r = spawnSync("sh", ["-c", line], { cwd: dir, env: { PATH }, encoding: "utf8" });
        expect({ line, status: r.status, stderr: r.stderr }).toEqual({
          line,
          status: expectedStatus(what),
          stderr: "",
        });
        expect(r.stdout.length, line).toBeGreaterThan(0);
      }
    },
    180_000,
  );

  it("explore --help: each opens the view in a terminal and leaves with q, status 0", async () => {
    // A real pseudo-terminal from tmux (installed by .ci/run, as for tests/cli/explore-tmux.test.ts).
    if (spawnSync("tmux", ["-V"]).status !== 0)
      throw new Error("this test needs tmux: apt-get install -y tmux");
    const socket = `espalier-help-${process.pid}`;
    const tmux = (...a: string[]) => spawnSync("tmux", ["-L", socket, ...a], { encoding: "utf8" });
    const examples = await examplesOf(["explore", "--help"]);
    expect(examples.length).toBeGreaterThanOrEqual(1);
    try {
      for (const [n, { line }] of examples.entries()) {
        const status = join(dir, `explore-${n}.status`);
        const script = join(dir, `explore-${n}.sh`);
        // The status is written under another name and renamed (POSIX rename is atomic), so the poll
        // below never reads the file between its creation and the write of the status.
        writeFileSync(
          script,
          `cd '${dir}'; PATH='${PATH}'; export PATH NO_COLOR=1; ${line}\necho $? > '${status}.part' && mv '${status}.part' '${status}'\nsleep 600\n`,
        );
        tmux("new-session", "-d", "-s", `e${n}`, "-x", "100", "-y", "30", `sh '${script}'`);
        // The view is up when its bottom row (the status row) is drawn below the tree.
        await until(
          () => tmux("capture-pane", "-p", "-t", `e${n}`).stdout.trim().split("\n").length >= 5,
          line,
        );
        tmux("send-keys", "-t", `e${n}`, "q");
        await until(() => existsSync(status), `${line} to end`);
        expect({ line, status: readFileSync(status, "utf8").trim() }).toEqual({ line, status: "0" });
      }
    } finally {
      tmux("kill-server");
    }
  }, 180_000);
});

async function until(ok: () => boolean, what: string): Promise<void> {
  const deadline = Date.now() + 60_000;
  while (!ok()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

afterAll(() => rmSync(dir, { recursive: true, force: true }));
