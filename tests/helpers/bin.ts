import { type SpawnOptions, spawn } from "node:child_process";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

/** The launcher as users run it (dist/ is built by `npm test`'s pretest). */
export const BIN = new URL("../../bin/espalier.js", import.meta.url).pathname;

/**
 * Where a run without `cwd` runs: a folder of its own with nothing in it, so no `.espalier.yaml` of the
 * directory the tests were started from is read (give inputs as absolute paths, or a `cwd`).
 */
let emptyDir: string | undefined;
function noConfigDir(): string {
  emptyDir ??= mkdtempSync(join(tmpdir(), "espalier-bin-"));
  return emptyDir;
}

export interface BinResult {
  code: number | null;
  signal: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
}

/**
 * Runs `node bin/espalier.js ARGS` in a child process. `stdin` is its content (a pipe), or a stdio
 * setting for descriptor 0 ("ignore", a file descriptor); `stdout` likewise for descriptor 1, which is
 * captured unless replaced. `onSpawn` sees the child (to signal it).
 */
export function runBin(
  args: string[],
  options: {
    stdin?: string | Uint8Array | "ignore" | number;
    stdout?: "ignore" | number;
    env?: Record<string, string>;
    cwd?: string;
    onSpawn?: (child: import("node:child_process").ChildProcess) => void;
  } = {},
): Promise<BinResult> {
  const input = options.stdin;
  const stdio: SpawnOptions["stdio"] = [
    typeof input === "string" || input instanceof Uint8Array || input === undefined ? "pipe" : input,
    options.stdout ?? "pipe",
    "pipe",
  ];
  const child = spawn(process.execPath, [BIN, ...args], {
    stdio,
    cwd: options.cwd ?? noConfigDir(),
    env: { PATH: process.env.PATH ?? "", ...options.env },
  });
  options.onSpawn?.(child);
  let stdout = "";
  let stderr = "";
  child.stdout?.setEncoding("utf8").on("data", (s: string) => {
    stdout += s;
  });
  child.stderr?.setEncoding("utf8").on("data", (s: string) => {
    stderr += s;
  });
  if (child.stdin) {
    child.stdin.on("error", () => undefined);
    child.stdin.end(typeof input === "string" || input instanceof Uint8Array ? input : "");
  }
  return new Promise((resolve, reject) => {
    child.on("error", reject);
    child.on("close", (code, signal) => resolve({ code, signal, stdout, stderr }));
  });
}
