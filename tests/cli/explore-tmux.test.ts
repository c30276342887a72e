import { execFileSync, spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { displayWidth } from "../../src/render/display-width.js";
import { BIN } from "../helpers/bin.js";

// End to end: the real program in a real pseudo-terminal, driven by tmux (send-keys, capture-pane,
// resize-window). tmux is installed by .ci/run (Debian package tmux) when missing.
const SOCKET = `espalier-e2e-${process.pid}`;
const dir = mkdtempSync(join(tmpdir(), "espalier-tmux-"));
// The program runs in `dir`, where fixtures/ is the demo data and no .espalier.yaml of the directory
// the tests were started from can change what it shows.
symlinkSync(new URL("../../fixtures", import.meta.url).pathname, join(dir, "fixtures"));
const tmux = (...args: string[]) => execFileSync("tmux", ["-L", SOCKET, ...args], { encoding: "utf8" });

if (spawnSync("tmux", ["-V"]).status !== 0)
  throw new Error("these tests need tmux: apt-get install -y tmux (as .ci/run does)");

afterAll(() => {
  spawnSync("tmux", ["-L", SOCKET, "kill-server"]);
});

let sessions = 0;

/**
 * Starts `espalier explore ARGS` in a new tmux session of `cols` x `rows` under sh, which records the
 * terminal settings before and after, and the exit status. Returns the session's name and files.
 */
function start(args: string[], cols = 80, rows = 24, env: Record<string, string> = {}) {
  const name = `s${++sessions}`;
  const files = {
    before: join(dir, `${name}.before`),
    after: join(dir, `${name}.after`),
    status: join(dir, `${name}.status`),
  };
  const quoted = args.map((a) => `'${a.replace(/'/g, "'\\''")}'`).join(" ");
  const exports = Object.entries({ NO_COLOR: "1", ...env })
    .map(([k, v]) => `${k}='${v}'`)
    .join(" ");
  const script =
    `cd ${dir}; stty -a > ${files.before}; ${exports} node ${BIN} explore ${quoted}; ` +
    `echo $? > ${files.status}.tmp; stty -a > ${files.after}; mv ${files.status}.tmp ${files.status}; sleep 600`;
  writeFileSync(join(dir, `${name}.sh`), script);
  tmux(
    "new-session",
    "-d",
    "-s",
    name,
    "-x",
    String(cols),
    "-y",
    String(rows),
    `sh ${join(dir, `${name}.sh`)}`,
  );
  return { name, files };
}

const screen = (name: string) => tmux("capture-pane", "-p", "-t", name).replace(/\n+$/, "").split("\n");
const flag = (name: string, format: string) => tmux("display-message", "-p", "-t", name, format).trim();

/** Waits until the screen satisfies `ok` (the machine may be slow); returns its rows. */
async function until(name: string, ok: (rows: string[]) => boolean, what: string): Promise<string[]> {
  const deadline = Date.now() + 30_000;
  for (;;) {
    const rows = screen(name);
    if (ok(rows)) return rows;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}; screen:\n${rows.join("\n")}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

async function exited(files: { status: string }): Promise<number> {
  const deadline = Date.now() + 30_000;
  while (!existsSync(files.status)) {
    if (Date.now() > deadline) throw new Error("the program did not exit");
    await new Promise((r) => setTimeout(r, 100));
  }
  return Number(readFileSync(files.status, "utf8").trim());
}

const cursorRow = (rows: string[]) => rows.find((r) => r.startsWith("@"));
const status = (rows: string[]) => rows[rows.length - 1];

describe("espalier explore in a terminal (tmux)", () => {
  it("shows the fitted view, follows keys and a resize, and q restores the terminal exactly", async () => {
    const { name, files } = start(["fixtures/tidewater-files.paths", "--focus", "services/ledger/src"]);
    let rows = await until(name, (r) => status(r).startsWith("services/ledger/src"), "the first screen");
    // The alternate screen is on, the cursor hidden (xterm DECSET 1049, DECTCEM off).
    expect(flag(name, "#{alternate_on}")).toBe("1");
    expect(flag(name, "#{cursor_flag}")).toBe("0");
    expect(rows.length).toBe(24);
    expect(cursorRow(rows)).toMatch(/^@ +\* src {2}84 nodes, 527\.6 KiB$/);
    // No colour with NO_COLOR: tmux sees no SGR other than the default (capture-pane -e shows them).
    expect(tmux("capture-pane", "-p", "-e", "-t", name)).not.toMatch(/\u001b\[[0-9;]*[1-9][0-9;]*m/);

    tmux("send-keys", "-t", name, "Down");
    rows = await until(name, (r) => status(r).startsWith("services/ledger/src/backoff.ts"), "Down");
    expect(cursorRow(rows)).toMatch(/^@ +\* backoff\.ts {2}348 B$/);

    tmux("send-keys", "-t", name, "Left", "Left");
    rows = await until(name, (r) => /^services\/ledger +/.test(status(r)), "Left twice");
    expect(cursorRow(rows)).toMatch(/^@ +\* ledger {2}147 nodes/);

    // Resize to 40 x 15: the view re-fits, every row within 40 columns.
    tmux("resize-window", "-t", name, "-x", "40", "-y", "15");
    rows = await until(
      name,
      (r) =>
        r.length === 15 &&
        r.every((row) => displayWidth(row) <= 40) &&
        /ledger +2 foci · depth · h: keys$/.test(status(r)) &&
        cursorRow(r) !== undefined,
      "the resize",
    );
    expect(cursorRow(rows)).toMatch(/^@ +\* ledger/);

    // Search as you type: the view follows the first match.
    tmux("send-keys", "-t", name, "/");
    tmux("send-keys", "-t", name, "-l", "mooring");
    rows = await until(name, (r) => status(r).startsWith("/mooring"), "the search");
    // At 40 columns the screen prints counts only and the name gives way (`mooring-…`), as --width 38 does.
    expect(cursorRow(rows)).toMatch(/\* mooring-/);
    tmux("send-keys", "-t", name, "Enter", "q");
    expect(await exited(files)).toBe(0);
    // Restored: main screen, cursor shown, terminal settings (raw mode off) exactly as before.
    expect(flag(name, "#{alternate_on}")).toBe("0");
    expect(flag(name, "#{cursor_flag}")).toBe("1");
    // (the first line of stty -a gives the size, which the resize changed)
    const settings = (file: string) => readFileSync(file, "utf8").split("\n").slice(1).join("\n");
    expect(settings(files.after)).toBe(settings(files.before));
    // Nothing printed: the main screen is as the shell left it.
    expect(tmux("capture-pane", "-p", "-J", "-t", name).trim()).toBe("");
  });

  it("p prints the command line that reproduces the view, after restoring the terminal", async () => {
    const { name, files } = start(
      ["fixtures/quillfeather-org.csv", "--parent-field", "manager", "--focus", "Q2417"],
      60,
      20,
    );
    await until(name, (r) => status(r).includes("1 focus"), "the first screen");
    tmux("send-keys", "-t", name, "Left", "p");
    expect(await exited(files)).toBe(0);
    // Printed on the main screen once the view is gone (-J joins the rows a long line wrapped onto).
    const printed = tmux("capture-pane", "-p", "-J", "-t", name).trim();
    expect(printed).toMatch(
      /^espalier fixtures\/quillfeather-org\.csv --parent-field manager --focus .* --budget 19$/,
    );
    expect(readFileSync(files.after, "utf8")).toBe(readFileSync(files.before, "utf8"));
  });

  it("restores the terminal on SIGINT and ends with the signal", async () => {
    const { name, files } = start(["fixtures/tidewater-deps.json"]);
    await until(name, (r) => status(r).includes("h: keys"), "the first screen");
    // The program is the child of this pane's shell (so no other run's process can be picked).
    const shell = flag(name, "#{pane_pid}");
    const pid = spawnSync("pgrep", ["-P", shell, "-f", `${BIN} explore`], { encoding: "utf8" })
      .stdout.trim()
      .split("\n")[0];
    expect(pid).toMatch(/^[0-9]+$/);
    process.kill(Number(pid), "SIGINT");
    // sh reports death by SIGINT as 128 + 2.
    expect(await exited(files)).toBe(130);
    expect(flag(name, "#{alternate_on}")).toBe("0");
    expect(flag(name, "#{cursor_flag}")).toBe("1");
    expect(readFileSync(files.after, "utf8")).toBe(readFileSync(files.before, "utf8"));
  });

  it("with --pseudonymize, an input error names no person (names as pseudonyms, values hidden)", async () => {
    // Invented people of Quillfeather Instruments; the negative size is the fault (BAD_SIZE).
    const file = join(dir, "org.json");
    writeFileSync(file, '{"name":"Talia Brenbek","children":[{"name":"Marit Okonkwo","size":-3}]}');
    const { name, files } = start([file, "--pseudonymize"], 200, 10, { ESPALIER_PSEUDONYM_KEY: "k" });
    expect(await exited(files)).toBe(2);
    const printed = tmux("capture-pane", "-p", "-J", "-t", name);
    expect(printed).toMatch(/\[BAD_SIZE\]/);
    expect(printed).not.toMatch(/Talia|Marit/);
  });

  it("refuses cleanly when standard output is not a terminal", () => {
    const out = spawnSync("node", [BIN, "explore", "fixtures/tidewater-deps.json"], {
      encoding: "utf8",
      cwd: dir,
    });
    expect(out.status).toBe(2);
    expect(out.stdout).toBe("");
    expect(out.stderr).toMatch(/\[USAGE\]\n$/);
  });
});
