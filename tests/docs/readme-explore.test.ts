import { execFileSync, spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { BIN } from "../helpers/bin.js";

// The README's `espalier explore` screen is what the program shows: its command line, the key typed
// (`# then Left, …`) and the terminal's size (`a 76 x 18 terminal`) are read from the README, the real
// program runs in tmux (as tests/cli/explore-tmux.test.ts does) and the screen must match row for row.
const SOCKET = `espalier-readme-${process.pid}`;
const dir = mkdtempSync(join(tmpdir(), "espalier-readme-"));
symlinkSync(new URL("../../fixtures", import.meta.url).pathname, join(dir, "fixtures"));
const tmux = (...args: string[]) => execFileSync("tmux", ["-L", SOCKET, ...args], { encoding: "utf8" });

afterAll(() => {
  spawnSync("tmux", ["-L", SOCKET, "kill-server"]);
});

interface ReadmeScreen {
  args: string[];
  key: string;
  cols: number;
  rows: number;
  screen: string[];
}

/** The README's explore example: the command block, the screen block after it, the size in the prose. */
function readmeScreen(): ReadmeScreen {
  const lines = readFileSync("README.md", "utf8").split("\n");
  const at = lines.findIndex((line) => line.startsWith("node bin/espalier.js explore "));
  expect(at, "README.md shows an explore command").toBeGreaterThan(0);
  let end = at;
  while (lines[end].endsWith("\\")) end++;
  const command = lines
    .slice(at, end + 1)
    .join("\n")
    .replace(/\\\n\s*/g, "");
  const [line, comment = ""] = command.split(/\s+#\s*/);
  const key = /^then (\w+)/.exec(comment)?.[1];
  expect(key, "the comment names the key typed").toBeDefined();
  const open = lines.indexOf("```", end + 2);
  const close = lines.indexOf("```", open + 1);
  const size = /a (\d+) x (\d+) terminal/.exec(lines.slice(close, close + 4).join(" "));
  expect(size, "the prose after the screen gives the terminal's size").not.toBeNull();
  const words = spawnSync("bash", ["-c", `printf '%s\\0' ${line}`], { encoding: "utf8" }).stdout.split("\0");
  return {
    args: words.slice(3, -1),
    key: key ?? "",
    cols: Number(size?.[1]),
    rows: Number(size?.[2]),
    screen: lines.slice(open + 1, close),
  };
}

describe("README.md's explore screen", () => {
  it("is what espalier explore shows after the key typed, in a terminal of the size given", async () => {
    if (spawnSync("tmux", ["-V"]).status !== 0)
      throw new Error("this test needs tmux: apt-get install -y tmux (as .ci/run does)");
    const readme = readmeScreen();
    expect(readme.screen.length).toBe(readme.rows);
    const quoted = readme.args.map((a) => `'${a.replace(/'/g, "'\\''")}'`).join(" ");
    writeFileSync(join(dir, "run.sh"), `cd ${dir}; NO_COLOR=1 node ${BIN} explore ${quoted}; sleep 600`);
    tmux(
      "new-session",
      "-d",
      "-s",
      "r",
      "-x",
      String(readme.cols),
      "-y",
      String(readme.rows),
      `sh ${dir}/run.sh`,
    );
    const screen = () => tmux("capture-pane", "-p", "-t", "r").replace(/\n+$/, "").split("\n");
    const settle = async (ok: (rows: string[]) => boolean) => {
      const deadline = Date.now() + 30_000;
      let rows = screen();
      while (!ok(rows) && Date.now() < deadline) {
        await new Promise((r) => setTimeout(r, 100));
        rows = screen();
      }
      return rows;
    };
    const first = await settle((rows) => rows.some((row) => row.startsWith("@")));
    tmux("send-keys", "-t", "r", readme.key);
    const shown = await settle((rows) => rows.join("\n") !== first.join("\n"));
    // The view may draw in steps: the screen it settles on within the deadline.
    const last = await settle((rows) => rows.join("\n") === readme.screen.join("\n"));
    expect(shown.length).toBeGreaterThan(0);
    expect(last).toEqual(readme.screen);
    tmux("send-keys", "-t", "r", "q");
  });
});
